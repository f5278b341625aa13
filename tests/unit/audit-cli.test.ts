/**
 * The audit command line's contract (audit-json.md): exit 0 with the JSON, 2 with one plain
 * sentence for input it refuses (no stack trace), the same reader as an upload.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resolveAuditSettings } from '../../src/lib/audit/settings-table';
import { proposedCutLine } from '../../src/lib/words';

/** What `npm run audit -- ...` runs: scripts/audit.mjs, which runs the prebuilt bundle. */
function audit(...args: string[]) {
  const result = spawnSync(process.execPath, ['scripts/audit.mjs', ...args], { encoding: 'utf8', timeout: 120_000 });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}

const STAMP = 'dist/cli/.paredown-cli-stamp.json';

/** Builds the bundle if stale (as the first `npm run audit` would), quietly; returns whether it built. */
function ensureBundle(): boolean {
  const script = "import('./scripts/lib/cli-bundle.mjs').then(async (m) => console.log(JSON.stringify(await m.ensureCliBundle({ quiet: true }))))";
  const result = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8', timeout: 120_000 });
  if (result.status !== 0) throw new Error(`building the command-line bundle failed: ${result.stderr}`);
  return (JSON.parse(result.stdout) as { built: boolean }).built;
}

beforeAll(() => {
  ensureBundle();
}, 120_000);

describe('the command-line bundle', () => {
  it('holds only what the audit needs and is rebuilt when an input changes', () => {
    const stamp = JSON.parse(readFileSync(STAMP, 'utf8')) as { inputs: Record<string, { hash: string; size: number; mtimeMs: number }> };
    const inputs = Object.keys(stamp.inputs);
    expect(inputs).toContain('src/cli/audit.ts');
    expect(inputs).toContain('src/lib/audit/run-audit.ts');
    // Nothing of the server, the database or the pages: the CLI loads the audit alone.
    expect(inputs.filter((path) => /^src\/(db|pages|components|lib\/server)\//.test(path) || /node_modules\/(better-sqlite3|astro|react|drizzle-orm)\//.test(path))).toEqual([]);
    expect(ensureBundle()).toBe(false);
    const entry = stamp.inputs['src/lib/stats/parallel-analysis.ts'];
    // Size and modification time as recorded: the file is not read again (its hash is not looked at).
    writeFileSync(STAMP, JSON.stringify({ ...stamp, inputs: { ...stamp.inputs, 'src/lib/stats/parallel-analysis.ts': { ...entry, hash: 'not-read' } } }));
    expect(ensureBundle()).toBe(false);
    // A touched input (another modification time) whose content is unchanged is hashed, and not rebuilt.
    writeFileSync(STAMP, JSON.stringify({ ...stamp, inputs: { ...stamp.inputs, 'src/lib/stats/parallel-analysis.ts': { ...entry, mtimeMs: entry.mtimeMs - 1000 } } }));
    expect(ensureBundle()).toBe(false);
    // A changed input (its time differs and its recorded hash no longer matches) makes the next run build again.
    writeFileSync(STAMP, JSON.stringify({ ...stamp, inputs: { ...stamp.inputs, 'src/lib/stats/parallel-analysis.ts': { ...entry, mtimeMs: entry.mtimeMs - 1000, hash: 'changed' } } }));
    expect(ensureBundle()).toBe(true);
    expect(ensureBundle()).toBe(false);
  }, 240_000);
});

/** The temporary folders this file made, removed when it ends. */
const folders: string[] = [];
afterAll(() => {
  for (const folder of folders) rmSync(folder, { recursive: true, force: true });
});

/** A new temporary folder, removed when the file's tests end. */
function temporaryFolder(prefix: string): string {
  const folder = mkdtempSync(join(tmpdir(), prefix));
  folders.push(folder);
  return folder;
}

/** A settings file in a temporary folder. */
function settingsFile(content: unknown): string {
  const path = join(temporaryFolder('paredown-cli-settings-'), 'settings.json');
  writeFileSync(path, JSON.stringify(content));
  return path;
}

const misspelt = settingsFile({ strongPairThresold: 0.3 });
const withFault = settingsFile({ testFault: 'crash' });

describe('npm run audit', () => {
  it('refuses a driver model on predictors that are not items, or are left out, in one sentence (exit 2)', () => {
    const unknown = audit('fixtures/demo/library-pilot-1.csv', '--codebook', 'fixtures/demo/library-codebook.csv', '--bootstrap', '0', '--outcome', 'overall_sat', '--predictors', 'coll_1,coll_99');
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/coll_99 is not an item of this wave: name the driver model's predictors by their item ids\./);
    expect(unknown.stderr).not.toMatch(/\bat .+\.ts:\d+/);
    // hours_7 is the demo's constant item (fixtures/demo/README.md), left out of the matrix.
    const constant = audit('fixtures/demo/library-pilot-1.csv', '--codebook', 'fixtures/demo/library-codebook.csv', '--bootstrap', '0', '--outcome', 'overall_sat', '--predictors', 'coll_1,hours_7');
    expect(constant.code).toBe(2);
    expect(constant.stderr).toMatch(/hours_7 cannot be a predictor/);
    const named = audit('fixtures/demo/library-pilot-1.csv', '--codebook', 'fixtures/demo/library-codebook.csv', '--bootstrap', '0', '--outcome', 'overall_sat', '--predictors', 'coll_2,coll_7,hours_1');
    expect(named.code).toBe(0);
    const json = JSON.parse(named.stdout);
    expect(json.settings.predictors).toEqual(['coll_2', 'coll_7', 'hours_1']);
    expect(json.outcomeModel.coefficients.map((c: { term: string }) => c.term)).toEqual(['(intercept)', 'coll_2', 'coll_7', 'hours_1']);
    // The proposed cut merges coll_7 into coll_2, so the refit keeps coll_2 and hours_1.
    expect(json.outcomeModel.afterCut.coefficients.map((c: { term: string }) => c.term)).toEqual(['(intercept)', 'coll_2', 'hours_1']);
  }, 240_000);

  it('audits the demo file end to end and writes the JSON', () => {
    const out = join(temporaryFolder('paredown-cli-'), 'audit.json');
    const result = audit('fixtures/demo/library-pilot-1.xlsx', '--bootstrap', '10', '--method', 'spearman', '--out', out);
    expect(result.stderr).toMatch(/Read 400 respondents/);
    expect(result.code).toBe(0);
    const json = JSON.parse(readFileSync(out, 'utf8'));
    expect(json.schema).toBe('paredown.audit/1');
    expect(json.settings.method).toBe('spearman');
    expect(json.recommendations.length).toBeGreaterThan(0);
    // The proposed cuts were said on standard error while the bootstrap ran, one line each, as
    // the JSON then makes them (src/lib/words/labels.ts, proposedCutLine).
    const said = result.stderr.split('\n');
    const heading = said.findIndex((line) => line.startsWith('Proposed cuts so far (stability still being checked on 10 resamples):'));
    expect(heading).toBeGreaterThanOrEqual(0);
    const lines = said.slice(heading + 1, heading + 1 + json.recommendations.length).map((line) => line.trim());
    expect(lines).toEqual(json.recommendations.map((r: { keep: string; actions: { item: string; action: string; into: string | null }[] }) => proposedCutLine(r.keep, r.actions)));
  });

  it.each([
    ['a file that does not exist', ['fixtures/waves/no-such-file.csv'], /Cannot read the data file/],
    ['an unknown method', ['fixtures/demo/library-pilot-1.csv', '--method', 'kendall'], /--method must be/],
    ['junk renamed .xlsx', ['fixtures/waves/junk-renamed.xlsx'], /./],
    ['a zip bomb', ['fixtures/waves/zip-bomb.xlsx'], /./],
    ['an empty file', ['fixtures/waves/empty.csv'], /empty/],
    ['an outcome that is not a column', ['fixtures/demo/library-pilot-1.csv', '--outcome', 'nope'], /not a column/],
    ['an option without its value', ['fixtures/demo/library-pilot-1.csv', '--seed', '--keep-all'], /--seed/],
    ['a bad bootstrap count', ['fixtures/demo/library-pilot-1.csv', '--bootstrap', 'lots'], /--bootstrap must be/],
    // The settings table refuses what the API refuses, with the same sentences (docs/decisions/006).
    ['a misspelt key in --settings', ['fixtures/demo/library-pilot-1.csv', '--settings', misspelt], /"strongPairThresold" is not an audit setting; did you mean "strongPairThreshold"\?$/m],
    ['a seed that is not whole', ['fixtures/demo/library-pilot-1.csv', '--seed', '1.5'], /--seed must be a whole number from -2147483648 to 2147483647, got 1\.5\./],
    ['a threshold out of range', ['fixtures/demo/library-pilot-1.csv', '--strong-pair-threshold', '0'], /--strong-pair-threshold must be a number above 0 and at most 1, got 0\./],
    ['a test fault', ['fixtures/demo/library-pilot-1.csv', '--settings', withFault], /testFault is only accepted by a test server/],
  ])('refuses %s with exit 2 and one sentence', (_name, args, pattern) => {
    const result = audit(...args);
    expect(result.code).toBe(2);
    expect(result.stdout).toBe('');
    expect(result.stderr).toMatch(pattern);
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
    expect(result.stderr).not.toMatch(/\n\s+at /);
  });

  it('echoes the settings of flags and --settings in the one stored shape, flags over the file', () => {
    const out = join(temporaryFolder('paredown-cli-'), 'audit.json');
    const file = settingsFile({ method: 'spearman', strongPairThreshold: 0.85, seed: 5 });
    const result = audit('fixtures/demo/library-pilot-1.csv', '--settings', file, '--seed=-7', '--locked', 'coll_2,events_3', '--bootstrap', '0', '--out', out);
    expect(result.code, result.stderr).toBe(0);
    const json = JSON.parse(readFileSync(out, 'utf8'));
    const expected = resolveAuditSettings({ method: 'spearman', strongPairThreshold: 0.85, seed: -7, locked: ['coll_2', 'events_3'], bootstrap: 0 });
    expect(Object.keys(json.settings)).toEqual(Object.keys(expected));
    expect(json.settings).toEqual(expected);
    expect(json.items.filter((item: { locked: boolean }) => item.locked).map((item: { id: string }) => item.id)).toEqual(['coll_2', 'events_3']);
  });
});
