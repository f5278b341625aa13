/**
 * Small helpers for the generator's own tests (not a module under test). The generator's tests
 * check properties of our own synthetic data, so the numbers they compute are compared with the
 * structure the generator was asked to plant, not with an outside reference.
 */
import type { SyntheticWave } from '../../src/lib/synth/types';

/** Pearson r over the rows where both values are numbers (textbook formula, two passes). */
export function pairwisePearson(a: readonly (number | null)[], b: readonly (number | null)[]): number {
  const xs: number[] = [];
  const ys: number[] = [];
  a.forEach((x, i) => {
    const y = b[i];
    if (x !== null && y !== null) {
      xs.push(x);
      ys.push(y);
    }
  });
  const meanX = xs.reduce((sum, v) => sum + v, 0) / xs.length;
  const meanY = ys.reduce((sum, v) => sum + v, 0) / ys.length;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  xs.forEach((x, i) => {
    sxy += (x - meanX) * (ys[i] - meanY);
    sxx += (x - meanX) ** 2;
    syy += (ys[i] - meanY) ** 2;
  });
  return sxy / Math.sqrt(sxx * syy);
}

/** The raw column of an item. */
export function rawColumn(wave: SyntheticWave, name: string): (number | string | null)[] {
  const column = wave.columns.find((candidate) => candidate.name === name);
  if (column === undefined) throw new Error(`no column ${name}`);
  return column.values;
}

/**
 * An item's values as methods.md §1 prepares them: missing codes and blanks to null, reverse-keyed
 * items recoded as min + max − x. With `reverse: false` the stored answers are kept as they are.
 */
export function preparedColumn(wave: SyntheticWave, name: string, options: { reverse: boolean }): (number | null)[] {
  const row = wave.codebook.find((candidate) => candidate.item === name);
  if (row === undefined) throw new Error(`no codebook row ${name}`);
  return rawColumn(wave, name).map((value) => {
    if (typeof value !== 'number' || row.missing.includes(value)) return null;
    return options.reverse && row.reverse ? row.min + row.max - value : value;
  });
}

/** All unordered pairs of a list, in list order. */
export function pairsOf(names: readonly string[]): [string, string][] {
  const pairs: [string, string][] = [];
  for (let a = 0; a < names.length; a++) for (let b = a + 1; b < names.length; b++) pairs.push([names[a], names[b]]);
  return pairs;
}
