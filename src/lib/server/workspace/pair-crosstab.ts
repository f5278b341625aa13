/**
 * The crosstab of two items of an audited wave (contract: src/lib/api/overlap-map.ts): the
 * stored, recoded answers (reverse-keyed items already flipped) of the respondents the audit
 * used, counted by answer pair. Counts are aggregates, shown to every member; for a role that
 * may not read respondent rows, cells holding 1 to SMALL_CELL_LIMIT − 1 respondents are withheld
 * and so are the totals (from which one withheld cell per row could be recovered); a lone withheld
 * cell takes the next smallest with it, since the grand total would give it away.
 */
import { and, eq, inArray } from 'drizzle-orm';
import { audits, waveItems, waves } from '../../../db/schema';
import { SMALL_CELL_LIMIT, type Crosstab } from '../../api/overlap-map';
import { includedRows } from '../../ingest/build-wave';
import { decodeMatrix } from '../../ingest/matrix-blob';
import { auditSettingsHash, type ResolvedAuditSettings } from '../audit-jobs/audit-settings';
import { getDb } from '../db';
import { fail } from '../errors';

/**
 * Counts the answers of two items against each other.
 * @param auditId the (done) audit.
 * @param waveId its wave.
 * @param itemA first item id (rows of the table).
 * @param itemB second item id (columns).
 * @param suppressSmallCells withhold cells below SMALL_CELL_LIMIT (callers without `read:respondents`).
 * @throws HttpError 400 `same-item` / 404 `item-not-found` for items the wave does not have, 409 `wave-has-no-responses`.
 * @returns the crosstab.
 */
export function pairCrosstab(auditId: string, waveId: string, itemA: string, itemB: string, suppressSmallCells: boolean): Crosstab {
  if (itemA === itemB) throw fail.badRequest('Choose two different items: a and b name the same item.', 'same-item');
  const db = getDb();
  const wave = db.select({ matrix: waves.matrix, exclusions: waves.exclusions, rowCount: waves.rowCount }).from(waves).where(eq(waves.id, waveId)).get();
  if (!wave?.matrix) throw fail.conflict('The wave has no stored responses to count.', 'wave-has-no-responses');
  const rows = db.select().from(waveItems).where(and(eq(waveItems.waveId, waveId), inArray(waveItems.itemId, [itemA, itemB]))).all();
  const found = [itemA, itemB].map((id) => rows.find((row) => row.itemId === id));
  const missingIds = [itemA, itemB].filter((_, k) => !found[k]);
  if (missingIds.length > 0) throw fail.notFound(`${missingIds.join(' and ')} ${missingIds.length > 1 ? 'are not items' : 'is not an item'} of this audit's wave; use the item ids the map shows.`, 'item-not-found');
  const audit = db.select({ settings: audits.settings, settingsHash: audits.settingsHash }).from(audits).where(eq(audits.id, auditId)).get();
  const exclusionsChanged = audit ? auditSettingsHash(audit.settings as ResolvedAuditSettings, wave.exclusions) !== audit.settingsHash : false;

  const matrix = decodeMatrix(new Uint8Array(wave.matrix.buffer, wave.matrix.byteOffset, wave.matrix.byteLength));
  const included = includedRows({ respondents: matrix.rows, excluded: wave.exclusions });
  const columnOf = (k: number) => (found[k] as (typeof rows)[number]).position;
  const valuesA: number[] = [];
  const valuesB: number[] = [];
  let missingEither = 0;
  for (const row of included) {
    const a = matrix.data[columnOf(0) * matrix.rows + row];
    const b = matrix.data[columnOf(1) * matrix.rows + row];
    if (Number.isNaN(a) || Number.isNaN(b)) missingEither += 1;
    else {
      valuesA.push(a);
      valuesB.push(b);
    }
  }
  const levelsA = [...new Set(valuesA)].sort((x, y) => x - y);
  const levelsB = [...new Set(valuesB)].sort((x, y) => x - y);
  const counts = levelsA.map(() => levelsB.map(() => 0));
  const rowOf = new Map(levelsA.map((v, i) => [v, i]));
  const colOf = new Map(levelsB.map((v, j) => [v, j]));
  valuesA.forEach((a, k) => (counts[rowOf.get(a) as number][colOf.get(valuesB[k]) as number] += 1));
  const rowTotals = counts.map((row) => row.reduce((s, v) => s + v, 0));
  const columnTotals = levelsB.map((_, j) => counts.reduce((s, row) => s + row[j], 0));

  let suppressedCells = 0;
  const shown = counts.map((row) =>
    row.map((count) => {
      if (suppressSmallCells && count > 0 && count < SMALL_CELL_LIMIT) {
        suppressedCells += 1;
        return null;
      }
      return count;
    }),
  );
  // One withheld cell could be recovered from the grand total: withhold the next smallest as well.
  if (suppressedCells === 1) {
    let best = { i: -1, j: -1, count: Number.POSITIVE_INFINITY };
    shown.forEach((row, i) =>
      row.forEach((count, j) => {
        if (count !== null && count > 0 && count < best.count) best = { i, j, count };
      }),
    );
    if (best.i >= 0) {
      shown[best.i][best.j] = null;
      suppressedCells += 1;
    }
  }
  const describe = (k: number, levels: number[]) => {
    const item = found[k] as (typeof rows)[number];
    const labels = item.valueLabels ?? null;
    // Labels belong to the codes as asked; a reverse-keyed item's stored values are flipped (min + max − code).
    const labelOf = (value: number) => {
      if (!labels) return null;
      const code = item.reverse && item.min !== null && item.max !== null ? item.min + item.max - value : value;
      return labels[String(code)] ?? null;
    };
    return { id: item.itemId, text: item.text, reverse: item.reverse, values: levels, labels: levels.map(labelOf) };
  };
  return {
    auditId,
    items: [describe(0, levelsA), describe(1, levelsB)],
    counts: shown,
    rowTotals: suppressedCells > 0 ? null : rowTotals,
    columnTotals: suppressedCells > 0 ? null : columnTotals,
    respondents: included.length,
    answeredBoth: valuesA.length,
    missingEither,
    suppressedBelow: suppressSmallCells ? SMALL_CELL_LIMIT : null,
    suppressedCells,
    exclusionsChanged,
  };
}
