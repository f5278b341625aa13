// `npm run serve`: serve the built application (dist/) on HOST:PORT, 127.0.0.1:4321 by default.
// The server opens and migrates the database itself; `npm start` also seeds and builds first.
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { root } from './lib/prepare.mjs';

process.chdir(root);
process.env.ASTRO_TELEMETRY_DISABLED = '1';
process.env.HOST ||= '127.0.0.1';
process.env.PORT ||= '4321';
const entry = join(root, 'dist', 'server', 'entry.mjs');
if (!existsSync(entry)) {
  console.error('No build found: run `npm start` (it builds) or `npm run build` first.');
  process.exit(1);
}
console.log(`\u25b8 Paredown on http://${process.env.HOST}:${process.env.PORT} (Ctrl-C stops it)`);
await import(pathToFileURL(entry).href);
