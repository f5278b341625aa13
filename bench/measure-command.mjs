// Runs a Node script in this process and, when it ends, writes this process's peak resident set
// size (kilobytes, process.resourceUsage().maxRSS, worker threads included) to a file. Used by
// bench/whole-audit.bench.ts to measure `node scripts/audit.mjs ...` without changing it.
// Usage: node bench/measure-command.mjs RSS_FILE SCRIPT [ARGS...]
import { writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const [rssFile, script, ...rest] = process.argv.slice(2);
process.argv = [process.argv[0], resolve(script), ...rest];
process.on('exit', () => writeFileSync(rssFile, String(process.resourceUsage().maxRSS)));
await import(pathToFileURL(resolve(script)).href);
