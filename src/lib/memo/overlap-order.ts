/**
 * The overlap map's figure for the memo: the audit's correlation matrix put in display order, with
 * the positions where a new scale starts.
 */
import type { AuditJson } from '../audit/audit-json';
import type { OverlapMapFigure } from './memo-document';

/**
 * Orders the items of the audit's correlation matrix by scale (scales in the order they first
 * appear in the questionnaire, items in questionnaire order within each; items without a scale
 * last) and returns the reordered matrix.
 * @param audit the audit result.
 * @returns the figure: ids, matrix and scale breaks in display order.
 */
export function orderForOverlapMap(audit: AuditJson): OverlapMapFigure {
  const ids = audit.correlation.items;
  const scaleOf = new Map(audit.items.map((item) => [item.id, item.scale]));
  const scaleRank = new Map<string, number>();
  for (const id of ids) {
    const scale = scaleOf.get(id);
    if (scale && !scaleRank.has(scale)) scaleRank.set(scale, scaleRank.size);
  }
  const order = ids
    .map((id, position) => ({ id, position, rank: scaleRank.get(scaleOf.get(id) ?? '') ?? Number.MAX_SAFE_INTEGER }))
    .sort((a, b) => a.rank - b.rank || a.position - b.position);
  const scaleBreaks: number[] = [];
  order.forEach((entry, position) => {
    if (position > 0 && entry.rank !== order[position - 1].rank) scaleBreaks.push(position);
  });
  const matrix = order.map((row) =>
    order.map((column) => {
      const value = audit.correlation.matrix[row.position]?.[column.position];
      return typeof value === 'number' && Number.isFinite(value) ? value : null;
    }),
  );
  return { kind: 'overlap-map', items: order.map((entry) => entry.id), matrix, scaleBreaks, orderedBy: 'by scale, in questionnaire order within each scale' };
}
