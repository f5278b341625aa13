import { describe, expect, it } from 'vitest';
import { readTable, validateSetup, WaveRefusal, type WaveTable } from '../../src/lib/ingest';

const csv = 'id,email,Q1,Q2,secs\nR1,a@example.org,1,2,300\nR2,b@example.org,3,4,200\n';
const item = (id: string, min = 1, max = 5) => ({ id, min, max });

async function load(): Promise<WaveTable> {
  return readTable(new TextEncoder().encode(csv), 'w.csv');
}

function refusedWith(table: WaveTable, setup: unknown): WaveRefusal {
  try {
    validateSetup(table, setup);
  } catch (error) {
    if (error instanceof WaveRefusal) return error;
    throw error;
  }
  throw new Error('expected a refusal');
}

describe('validateSetup', () => {
  it('fills defaults for optional item fields and accepts extra keys from a proposal', async () => {
    const setup = validateSetup(await load(), {
      columns: [{ column: 'Q1', role: 'item', item: item('Q1'), reason: 'proposed', profile: {} }, { column: 'id', role: 'respondent-id' }],
    });
    expect(setup.columns[0]).toEqual({
      column: 'Q1', role: 'item', durationUnit: null,
      item: { id: 'Q1', scale: null, reverse: false, min: 1, max: 5, missingCodes: [], text: null, labels: [], missingLabels: [] },
    });
    expect(setup.columns[1].item).toBeNull();
  });

  it('refuses each kind of bad setup with 400 and its own code', async () => {
    const table = await load();
    const cases: [unknown, string][] = [
      [{ columns: 'all' }, 'invalid-setup'],
      [{ columns: [{ column: 'Q1', role: 'driver' }] }, 'invalid-setup'],
      [{ columns: [{ column: 'Q1', role: 'item', item: { id: 'Q1', min: 1, max: Infinity } }] }, 'invalid-setup'],
      [{ columns: [{ column: 'Q9', role: 'item', item: item('Q9') }] }, 'unknown-column'],
      [{ columns: [{ column: 'Q1', role: 'item', item: item('Q1') }, { column: 'Q1', role: 'ignore' }] }, 'duplicate-column-setup'],
      [{ columns: [{ column: 'id', role: 'respondent-id' }, { column: 'Q2', role: 'respondent-id' }, { column: 'Q1', role: 'item', item: item('Q1') }] }, 'two-respondent-ids'],
      [{ columns: [{ column: 'secs', role: 'duration' }, { column: 'Q2', role: 'duration' }, { column: 'Q1', role: 'item', item: item('Q1') }] }, 'two-duration-columns'],
      [{ columns: [{ column: 'Q1', role: 'item', item: null }] }, 'item-without-setup'],
      [{ columns: [{ column: 'Q1', role: 'item', item: item('Q1', 5, 5) }] }, 'invalid-range'],
      [{ columns: [{ column: 'Q1', role: 'item', item: item('X') }, { column: 'Q2', role: 'item', item: item('X') }] }, 'duplicate-item-id'],
      [{ columns: [{ column: 'Q1', role: 'outcome', item: null }] }, 'no-items'],
      [{ columns: [{ column: 'email', role: 'item', item: item('email') }] }, 'personal-data-as-item'],
      [{ columns: [{ column: 'email', role: 'respondent-id' }, { column: 'Q1', role: 'item', item: item('Q1') }] }, 'personal-data-as-id'],
    ];
    for (const [setup, code] of cases) {
      const refusal = refusedWith(table, setup);
      expect([refusal.status, refusal.code], code).toEqual([400, code]);
      expect(refusal.message).toMatch(/[.;]/);
    }
  });
});
