/**
 * The server's bounded wave readers (src/lib/server/waves/wave-readers.ts): with every reader busy
 * and the line full, an upload or a confirmation is refused at once with 503 `readers-busy` and
 * Retry-After (docs/decisions/018-workbook-worker.md), and the place comes back when the read ends.
 */
import { describe, expect, it } from 'vitest';
import { HttpError } from '../../src/lib/server/errors';
import { WaveReaders, READERS_BUSY_RETRY_SECONDS } from '../../src/lib/server/waves/wave-readers';

function csv(respondents: number): Uint8Array {
  const lines = ['respondent_id,Q1,Q2,Q3'];
  for (let i = 0; i < respondents; i++) lines.push(`R${i},${(i % 5) + 1},${((i * 3) % 5) + 1},${((i * 7) % 5) + 1}`);
  return new TextEncoder().encode(lines.join('\n'));
}

const files = (name: string, respondents: number) => ({ fileName: name, bytes: csv(respondents), codebookName: null, codebookBytes: null, sheet: null });

describe('WaveReaders', () => {
  it('refuses a read with 503 readers-busy and Retry-After while every reader is busy and the line is full', async () => {
    const readers = new WaveReaders(1, 1, {});
    const first = readers.readUpload(files('a.csv', 300));
    const second = readers.readUpload(files('b.csv', 40));
    expect(readers.state()).toMatchObject({ running: 1, waiting: 1 });
    expect(readers.hasRoom()).toBe(false);
    const refused = await readers.readUpload(files('c.csv', 40)).catch((error: unknown) => error);
    expect(refused).toBeInstanceOf(HttpError);
    expect([(refused as HttpError).status, (refused as HttpError).code]).toEqual([503, 'readers-busy']);
    expect((refused as HttpError).headers['Retry-After']).toBe(String(READERS_BUSY_RETRY_SECONDS));
    expect(() => readers.checkRoom()).toThrow(HttpError);
    const [a, b] = await Promise.all([first, second]);
    expect([a.proposal.respondents, b.proposal.respondents]).toEqual([300, 40]);
    expect(readers.hasRoom()).toBe(true);
    const c = await readers.readUpload(files('c.csv', 40));
    expect(c.source.fileName).toBe('c.csv');
  });
});
