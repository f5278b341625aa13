/**
 * Turns a generated pilot wave (src/lib/synth) straight into the engine's input, for evaluation
 * runs, tests and benchmarks: missing codes and blanks become NaN, reverse-keyed items are
 * recoded `min + max − x` with the codebook's range. Uploaded waves go through src/lib/ingest
 * instead, which does the same recoding with the full column setup.
 */
import type { ItemMatrix } from '../stats/types';
import type { SyntheticWave } from '../synth/types';
import type { EngineItem } from '../engine/types';

/** The engine's input built from a synthetic wave. */
export interface SyntheticEngineInput {
  readonly matrix: ItemMatrix;
  readonly items: readonly EngineItem[];
}

/**
 * Recodes the item columns of a synthetic wave (every codebook row with a scale; the outcome,
 * id and duration columns are left out) in codebook order.
 * @param wave A wave from `generateWave`.
 * @param locked Item ids to mark locked (default none).
 * @throws {RangeError} when a codebook item has no column, a value outside the codebook's range
 *   that is not a missing code, or a locked id names no item.
 * @returns The recoded respondents × items matrix (NaN for missing) and the item metadata.
 * References: methods.md §1 (reverse-keying `x' = (min + max) − x`).
 */
export function engineInputFromSyntheticWave(wave: SyntheticWave, locked: readonly string[] = []): SyntheticEngineInput {
  const rows = wave.columns.length === 0 ? 0 : wave.columns[0].values.length;
  const itemRows = wave.codebook.filter((row) => row.scale !== '');
  const columnByName = new Map(wave.columns.map((column) => [column.name, column]));
  const data = new Float64Array(rows * itemRows.length);
  itemRows.forEach((row, j) => {
    const column = columnByName.get(row.item);
    if (column === undefined) throw new RangeError(`engineInputFromSyntheticWave: codebook item "${row.item}" has no column`);
    column.values.forEach((value, i) => {
      let recoded = Number.NaN;
      if (typeof value === 'number' && !row.missing.includes(value)) {
        if (value < row.min || value > row.max) throw new RangeError(`engineInputFromSyntheticWave: item "${row.item}" holds ${value} at row ${i}, outside ${row.min}..${row.max}`);
        recoded = row.reverse ? row.min + row.max - value : value;
      }
      data[j * rows + i] = recoded;
    });
  });
  const ids = new Set(itemRows.map((row) => row.item));
  for (const id of locked) if (!ids.has(id)) throw new RangeError(`engineInputFromSyntheticWave: locked id "${id}" names no item`);
  const items: EngineItem[] = itemRows.map((row) => ({
    id: row.item,
    scale: row.scale,
    text: row.text.length > 0 ? row.text : null,
    locked: locked.includes(row.item),
    min: row.min,
    max: row.max,
  }));
  return { matrix: { rows, columns: itemRows.length, data }, items };
}
