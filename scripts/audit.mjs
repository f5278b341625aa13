// `npm run audit -- DATA [options]`: the command-line audit (src/cli/audit.ts, usage there and in
// the README), run from its prebuilt bundle in this same process; the bundle is built first when
// missing or stale (scripts/lib/cli-bundle.mjs). `--rebuild` as the first argument forces a build.
import { pathToFileURL } from 'node:url';
import { ensureCliBundle } from './lib/cli-bundle.mjs';

const force = process.argv[2] === '--rebuild';
if (force) process.argv.splice(2, 1);
const { file } = await ensureCliBundle({ force });
await import(pathToFileURL(file).href);
