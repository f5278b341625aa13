// Compares two audit JSON files (paredown.audit/1) value by value: every string, boolean, null and
// array length must be equal, and every number within a relative difference (default 1e-9) of the
// other, or within an absolute difference (--absolute, default 0) for numbers near zero; keys given with --ignore (dotted paths, e.g. parallelAnalysis.random95) are skipped.
// Prints the differences found and the largest relative difference among the numbers compared;
// exits 1 when anything differs beyond the tolerance.
// Usage: node scripts/compare-audit-json.mjs BEFORE.json AFTER.json [--tolerance 1e-9] [--absolute 0] [--ignore a.b,c]
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';

const { positionals, values } = parseArgs({ allowPositionals: true, options: { tolerance: { type: 'string' }, absolute: { type: 'string' }, ignore: { type: 'string' } } });
if (positionals.length !== 2) {
  console.error('usage: node scripts/compare-audit-json.mjs BEFORE.json AFTER.json [--tolerance 1e-9] [--ignore a.b,c]');
  process.exit(2);
}
const tolerance = Number(values.tolerance ?? 1e-9);
const absolute = Number(values.absolute ?? 0);
const ignored = new Set((values.ignore ?? '').split(',').filter(Boolean));
const [before, after] = positionals.map((file) => JSON.parse(readFileSync(file, 'utf8')));
const differences = [];
let largest = 0;
let numbers = 0;

function walk(a, b, path) {
  const key = path.replace(/\[\d+\]/g, '').replace(/^\./, '');
  if (ignored.has(key)) return;
  if (typeof a === 'number' && typeof b === 'number') {
    numbers++;
    const relative = a === b ? 0 : Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), 1e-300);
    largest = Math.max(largest, relative);
    if (relative > tolerance && Math.abs(a - b) > absolute) differences.push(`${path}: ${a} → ${b}`);
  } else if (Array.isArray(a) && Array.isArray(b)) {
    if (a.length !== b.length) differences.push(`${path}: length ${a.length} → ${b.length}`);
    for (let i = 0; i < Math.min(a.length, b.length); i++) walk(a[i], b[i], `${path}[${i}]`);
  } else if (a !== null && b !== null && typeof a === 'object' && typeof b === 'object') {
    for (const name of new Set([...Object.keys(a), ...Object.keys(b)])) {
      if (!(name in a) || !(name in b)) {
        if (!ignored.has(`${key ? `${key}.` : ''}${name}`)) differences.push(`${path}.${name}: only in ${name in a ? 'the first' : 'the second'}`);
      } else walk(a[name], b[name], `${path}.${name}`);
    }
  } else if (a !== b) {
    differences.push(`${path}: ${JSON.stringify(a)} → ${JSON.stringify(b)}`);
  }
}

walk(before, after, '');
for (const line of differences) console.log(line);
console.log(`${numbers} numbers compared; largest relative difference ${largest.toExponential(2)}; ${differences.length} difference(s) beyond ${tolerance} relative${absolute > 0 ? ` and ${absolute} absolute` : ''}${ignored.size ? ` (ignoring ${[...ignored].join(', ')})` : ''}`);
process.exit(differences.length > 0 ? 1 : 0);
