/**
 * Loads fixtures/reference/engine-real-instruments.json (written by
 * scripts/reference/engine-real-instruments.R) as engine input: psych::bfi (reverse-keyed items
 * recoded 7 − x on its 1..6 range), lavaan::HolzingerSwineford1939 (continuous scores),
 * psychTools::epi extraversion (0/1, negatively keyed items 1 − x) and psychTools::sai state anxiety
 * (1..4, anxiety-absent items 5 − x). fixtures/reference/engine-msq.json (scripts/reference/engine-msq.R):
 * psychTools::msq, Thayer's energetic and tense arousal scales (0..3, negatively keyed items 3 − x).
 */
import { readFileSync } from 'node:fs';
import type { EngineItem } from '../../src/lib/engine/types';
import { itemMatrixFromColumns, type ItemMatrix } from '../../src/lib/stats/types';

export interface MiReference {
  scale?: string;
  call?: string;
  pair: [string, string];
  mi: number;
  epc: number;
  second: { pair: [string, string]; mi: number };
}

interface Instrument {
  items: string[];
  scale: string[];
  columns: Record<string, (number | null)[]>;
  largestResidualMi: MiReference | MiReference[];
  reverse?: string[];
  min?: number;
  max?: number;
  text?: string[];
}

export const realInstruments = JSON.parse(readFileSync(new URL('../../fixtures/reference/engine-real-instruments.json', import.meta.url), 'utf8')) as {
  generated: Record<string, string>;
  bfi: Instrument & { largestResidualMi: MiReference[] };
  holzinger: Instrument & { largestResidualMi: MiReference };
  epi: Instrument & { largestResidualMi: MiReference };
  sai: Instrument & { largestResidualMi: MiReference & { worrying: { mi: number; epc: number; rank: number } } };
};

/** One scale's modification indices in the msq fixture (lavaan, residual covariances between items). */
export interface ScaleMiReference {
  scale: string;
  call: string;
  critical001: number;
  largest: { pair: [string, string]; mi: number; sepc: number }[];
  sequential: { pair: [string, string]; mi: number; sepc: number }[];
}

export const msqInstrument = JSON.parse(readFileSync(new URL('../../fixtures/reference/engine-msq.json', import.meta.url), 'utf8')) as Omit<Instrument, 'largestResidualMi'> & {
  generated: Record<string, string>;
  scales: { EA: ScaleMiReference; TA: ScaleMiReference };
};

/** An instrument as the engine's input. */
export function instrumentInput(instrument: Omit<Instrument, 'largestResidualMi'>): { matrix: ItemMatrix; items: EngineItem[] } {
  const reverse = new Set(instrument.reverse ?? []);
  const columns = instrument.items.map((id) =>
    instrument.columns[id].map((value) => (value === null ? Number.NaN : reverse.has(id) ? (instrument.min as number) + (instrument.max as number) - value : value)),
  );
  const items: EngineItem[] = instrument.items.map((id, j) => ({
    id,
    scale: instrument.scale[j],
    text: instrument.text?.[j] ?? null,
    locked: false,
    min: instrument.min ?? null,
    max: instrument.max ?? null,
  }));
  return { matrix: itemMatrixFromColumns(columns), items };
}
