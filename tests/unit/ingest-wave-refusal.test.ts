import { describe, expect, it } from 'vitest';
import { DEFAULT_READ_LIMITS, isWaveRefusal, resolveReadLimits, WaveRefusal } from '../../src/lib/ingest';

describe('WaveRefusal', () => {
  it('carries status, kebab-case code and message, and serialises to the api.md error shape', () => {
    const refusal = new WaveRefusal(422, 'not-a-workbook', 'The file is not a workbook; save it again as XLSX.');
    expect(refusal).toBeInstanceOf(Error);
    expect(refusal.status).toBe(422);
    expect(refusal.code).toBe('not-a-workbook');
    // api.md: errors as { "error": { "code": "kebab-case", "message": "plain sentence" } }
    expect(JSON.parse(JSON.stringify(refusal))).toEqual({ error: { code: 'not-a-workbook', message: 'The file is not a workbook; save it again as XLSX.' } });
  });

  it('refuses a code that is not kebab-case and an empty message (programming errors)', () => {
    expect(() => new WaveRefusal(400, 'Bad_Code', 'x.')).toThrow(TypeError);
    expect(() => new WaveRefusal(400, 'bad-code', '  ')).toThrow(TypeError);
  });

  it('recognises refusals, also ones that crossed a module copy, and nothing else', () => {
    expect(isWaveRefusal(new WaveRefusal(413, 'file-too-large', 'Too large.'))).toBe(true);
    expect(isWaveRefusal({ name: 'WaveRefusal', status: 400, code: 'x', message: 'y' })).toBe(true);
    expect(isWaveRefusal({ name: 'WaveRefusal', status: 500, code: 'x', message: 'y' })).toBe(false);
    expect(isWaveRefusal(new Error('boom'))).toBe(false);
    expect(isWaveRefusal(null)).toBe(false);
  });
});

describe('resolveReadLimits', () => {
  it('fills defaults: 50 MB, 200,000 rows, 2,000 columns (issue 4)', () => {
    const limits = resolveReadLimits({ maxRows: 10 });
    expect(limits.maxRows).toBe(10);
    expect(limits.maxBytes).toBe(50_000_000);
    expect(limits.maxColumns).toBe(2_000);
    expect(DEFAULT_READ_LIMITS.maxRows).toBe(200_000);
  });

  it('rejects limits that are not positive integers', () => {
    expect(() => resolveReadLimits({ maxRows: 0 })).toThrow(/maxRows/);
    expect(() => resolveReadLimits({ maxBytes: 1.5 })).toThrow(RangeError);
  });
});
