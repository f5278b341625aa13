/**
 * The server's configuration (src/lib/server/config.ts): the workbook reader's limits and the
 * size of the audit pool are validated there with the other variables, and reach the reader
 * through serverReadLimits. Pure: no server, no files (AUTH_SECRET is given, so no secret file is
 * written beside the database path).
 */
import { availableParallelism } from 'node:os';
import { describe, expect, it } from 'vitest';
import { MAX_RESAMPLE_THREADS } from '../../src/lib/audit/resample-threads';
import { DEFAULT_READ_LIMITS } from '../../src/lib/ingest/read-limits';
import { parseConfig } from '../../src/lib/server/config';
import { serverReadLimits } from '../../src/lib/server/waves/read-wave-files';

const base = Object.freeze({ AUTH_SECRET: 'x'.repeat(40), DATABASE_PATH: '/nonexistent/paredown-config-test.sqlite' });

describe('parseConfig: workbook limits and audit workers', () => {
  it('defaults the workbook limits to the reader\'s own and the pool to the machine\'s cores', () => {
    const config = parseConfig({ ...base });
    expect(config.limits.workbookMemoryMb).toBe(DEFAULT_READ_LIMITS.maxWorkbookMemoryMb); // src/lib/ingest/read-limits.ts: 1,024 MB
    expect(config.limits.workbookSeconds).toBe(DEFAULT_READ_LIMITS.maxWorkbookSeconds); // src/lib/ingest/read-limits.ts: 60 s
    expect(config.limits.workbookMemoryMb).toBe(1024); // README configuration table
    expect(config.limits.workbookSeconds).toBe(60); // README configuration table
    expect(config.auditWorkers).toBe(Math.min(64, availableParallelism())); // docs/decisions/004: default os.availableParallelism()
    expect([config.limits.readers, config.limits.readerQueue]).toEqual([2, 16]); // README configuration table; docs/decisions/018
  });

  it('reads the variables when set, and treats empty ones as unset', () => {
    const config = parseConfig({ ...base, UPLOAD_MAX_WORKBOOK_MEMORY_MB: '256', UPLOAD_MAX_WORKBOOK_SECONDS: '15', AUDIT_WORKERS: '3' });
    expect([config.limits.workbookMemoryMb, config.limits.workbookSeconds, config.auditWorkers]).toEqual([256, 15, 3]);
    const empty = parseConfig({ ...base, UPLOAD_MAX_WORKBOOK_MEMORY_MB: '', UPLOAD_MAX_WORKBOOK_SECONDS: ' ', AUDIT_WORKERS: '' });
    expect([empty.limits.workbookMemoryMb, empty.limits.workbookSeconds]).toEqual([1024, 60]); // the defaults above
    expect(parseConfig({ ...base, AUDIT_WORKERS: '1' }).auditWorkers).toBe(1);
    expect(parseConfig({ ...base, AUDIT_WORKERS: '64' }).auditWorkers).toBe(64);
    const readers = parseConfig({ ...base, UPLOAD_READERS: '1', UPLOAD_READER_QUEUE: '0' }).limits;
    expect([readers.readers, readers.readerQueue]).toEqual([1, 0]);
  });

  it.each([
    ['UPLOAD_MAX_WORKBOOK_MEMORY_MB', '0'],
    ['UPLOAD_MAX_WORKBOOK_MEMORY_MB', 'lots'],
    ['UPLOAD_MAX_WORKBOOK_SECONDS', '-5'],
    ['UPLOAD_MAX_WORKBOOK_SECONDS', '1.5'],
    ['AUDIT_WORKERS', '0'],
    ['AUDIT_WORKERS', '65'],
    ['AUDIT_WORKERS', 'two'],
    ['UPLOAD_READERS', '0'],
    ['UPLOAD_READERS', '65'],
    ['UPLOAD_READER_QUEUE', '-1'],
    ['UPLOAD_READER_QUEUE', 'many'],
  ])('refuses %s=%s, naming the variable', (name, value) => {
    expect(() => parseConfig({ ...base, [name]: value })).toThrow(new RegExp(`^parseConfig: invalid configuration \\(.*${name}`));
  });
});

describe('parseConfig: fair audits (docs/decisions/016-fair-audits.md)', () => {
  it('defaults the time limit to 600 s and the per-team share to one thread fewer than the pool', () => {
    const config = parseConfig({ ...base, AUDIT_WORKERS: '4' });
    expect(config.auditMaxSeconds).toBe(600); // README configuration table
    expect(config.auditWorkersPerTeam).toBe(3); // docs/decisions/016: AUDIT_WORKERS - 1
    // One worker: the one team may use it (at least 1).
    expect(parseConfig({ ...base, AUDIT_WORKERS: '1' }).auditWorkersPerTeam).toBe(1);
  });

  it('reads the variables when set; a per-team share above the pool means the whole pool', () => {
    const config = parseConfig({ ...base, AUDIT_WORKERS: '4', AUDIT_WORKERS_PER_TEAM: '2', AUDIT_MAX_SECONDS: '30' });
    expect([config.auditWorkersPerTeam, config.auditMaxSeconds]).toEqual([2, 30]);
    expect(parseConfig({ ...base, AUDIT_WORKERS: '2', AUDIT_WORKERS_PER_TEAM: '8' }).auditWorkersPerTeam).toBe(2);
  });

  it.each([
    ['AUDIT_MAX_SECONDS', '0'],
    ['AUDIT_MAX_SECONDS', '86401'],
    ['AUDIT_MAX_SECONDS', '2.5'],
    ['AUDIT_WORKERS_PER_TEAM', '0'],
    ['AUDIT_WORKERS_PER_TEAM', 'all'],
  ])('refuses %s=%s, naming the variable', (name, value) => {
    expect(() => parseConfig({ ...base, [name]: value })).toThrow(new RegExp(`^parseConfig: invalid configuration \\(.*${name}`));
  });
});

describe('parseConfig: requests per turn (docs/decisions/025-reader-latency.md)', () => {
  it('defaults to 4 and reads the variable when set', () => {
    expect(parseConfig(base).requestsPerTurn).toBe(4); // README configuration table
    expect(parseConfig({ ...base, REQUESTS_PER_TURN: '8' }).requestsPerTurn).toBe(8);
  });

  it.each([['0'], ['1001'], ['2.5'], ['many']])('refuses REQUESTS_PER_TURN=%s, naming the variable (a bad value would stop every page)', (value) => {
    expect(() => parseConfig({ ...base, REQUESTS_PER_TURN: value })).toThrow(/^parseConfig: invalid configuration \(.*REQUESTS_PER_TURN/);
  });
});

describe('parseConfig: resample threads (docs/decisions/021, addendum)', () => {
  it('defaults to the machine\'s cores up to MAX_RESAMPLE_THREADS and reads the variable when set', () => {
    expect(parseConfig(base).resampleThreads).toBe(Math.min(MAX_RESAMPLE_THREADS, availableParallelism())); // README configuration table
    expect(parseConfig({ ...base, RESAMPLE_THREADS: '0' }).resampleThreads).toBe(0);
    expect(parseConfig({ ...base, RESAMPLE_THREADS: '1' }).resampleThreads).toBe(1);
  });

  it.each([['-1'], [String(MAX_RESAMPLE_THREADS + 1)], ['1.5'], ['all']])('refuses RESAMPLE_THREADS=%s, naming the variable', (value) => {
    expect(() => parseConfig({ ...base, RESAMPLE_THREADS: value })).toThrow(/^parseConfig: invalid configuration \(.*RESAMPLE_THREADS/);
  });
});

describe('serverReadLimits', () => {
  it('passes every configured upload limit to the reader', () => {
    const config = parseConfig({
      ...base,
      UPLOAD_MAX_BYTES: '1000',
      UPLOAD_MAX_ROWS: '20',
      UPLOAD_MAX_COLUMNS: '30',
      UPLOAD_MAX_WORKBOOK_MEMORY_MB: '128',
      UPLOAD_MAX_WORKBOOK_SECONDS: '7',
    });
    expect(serverReadLimits(config)).toEqual({ maxBytes: 1000, maxRows: 20, maxColumns: 30, maxWorkbookMemoryMb: 128, maxWorkbookSeconds: 7 });
  });
});
