/**
 * The audit command line's contract (audit-json.md): exit 0 with the JSON, 2 with one plain
 * sentence for input it refuses (no stack trace), the same reader as an upload.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

function audit(...args: string[]) {
  const result = spawnSync(process.execPath, ['--import', 'tsx', 'src/cli/audit.ts', ...args], { encoding: 'utf8', timeout: 120_000 });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}

describe('npm run audit', () => {
  it('audits the demo file end to end and writes the JSON', () => {
    const out = join(mkdtempSync(join(tmpdir(), 'paredown-cli-')), 'audit.json');
    const result = audit('fixtures/demo/library-pilot-1.xlsx', '--bootstrap', '10', '--method', 'spearman', '--out', out);
    expect(result.stderr).toMatch(/Read 400 respondents/);
    expect(result.code).toBe(0);
    const json = JSON.parse(readFileSync(out, 'utf8'));
    expect(json.schema).toBe('paredown.audit/1');
    expect(json.settings.method).toBe('spearman');
    expect(json.recommendations.length).toBeGreaterThan(0);
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
  ])('refuses %s with exit 2 and one sentence', (_name, args, pattern) => {
    const result = audit(...args);
    expect(result.code).toBe(2);
    expect(result.stdout).toBe('');
    expect(result.stderr).toMatch(pattern);
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
    expect(result.stderr).not.toMatch(/\n\s+at /);
  });
});
