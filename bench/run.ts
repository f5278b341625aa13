/**
 * `npm run bench`: runs every bench/*.bench.ts in its own process (so each one's peak memory
 * is its own), streams what it prints, and ends with a summary of the machine-readable
 * `{"bench": ...}` lines each benchmark prints last. Figures, not assertions: benchmarks never
 * fail on time; they fail only if the benchmark itself crashes.
 */
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { cpus, totalmem } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const benchDir = fileURLToPath(new URL('.', import.meta.url));
const only = process.argv.slice(2);
const files = readdirSync(benchDir)
  .filter((name) => name.endsWith('.bench.ts'))
  .filter((name) => only.length === 0 || only.some((word) => name.includes(word)))
  .sort();

console.log(`Paredown benchmarks on ${cpus().length} cores, ${(totalmem() / 2 ** 30).toFixed(0)} GiB, Node ${process.version}`);
const summary: Record<string, unknown>[] = [];
let failed = 0;
for (const file of files) {
  console.log(`\n── ${file} ──`);
  const result = spawnSync(process.execPath, ['--import', 'tsx', join(benchDir, file)], {
    encoding: 'utf8',
    stdio: ['ignore', 'pipe', 'inherit'],
    maxBuffer: 64 * 1024 * 1024,
  });
  process.stdout.write(result.stdout ?? '');
  if (result.status !== 0) {
    failed++;
    console.log(`(${file} exited with ${result.status ?? result.signal})`);
  }
  for (const line of (result.stdout ?? '').split('\n')) {
    const text = line.trim();
    if (!text.startsWith('{"bench"')) continue;
    try {
      summary.push(JSON.parse(text) as Record<string, unknown>);
    } catch {
      // a line that only looks like a result is printed above anyway
    }
  }
}

console.log('\n── summary ──');
for (const entry of summary) console.log(JSON.stringify(entry));
if (failed > 0) process.exitCode = 1;
