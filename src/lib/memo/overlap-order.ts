/**
 * The overlap map's figure for the memo: the audit's correlation matrix put in display order, with
 * the positions where a new scale starts.
 */
import type { AuditJson } from '../audit/audit-json';
import { hierarchicalClustering, type HierarchicalClustering } from '../stats/hierarchical-clustering';
import type { OverlapMapFigure } from './memo-document';

/**
 * The overlap map's cluster order: average-linkage clustering on 1 − |r| (a pair without a
 * correlation counts as 1, as far apart as two items can be), its leaf order. The island's
 * default order and the memo's figure both use it.
 * @param correlation the correlation matrix (rows), null where a pair has no correlation.
 * @returns the clustering (its `order`: 0-based item positions in cluster order; `height`: merge heights).
 * References: Sokal & Michener (1958), average linkage (UPGMA); checked against R's hclust.
 */
export function clusterTreeOfCorrelations(correlation: readonly (readonly (number | null | undefined)[])[]): HierarchicalClustering {
  const m = correlation.length;
  if (m === 0) return { merge: [], height: [], order: [] };
  const distances = new Float64Array(m * m);
  for (let i = 0; i < m; i++) {
    for (let j = i + 1; j < m; j++) {
      const r = correlation[i]?.[j];
      const distance = typeof r === 'number' && Number.isFinite(r) ? Math.max(0, 1 - Math.abs(r)) : 1;
      distances[i * m + j] = distance;
      distances[j * m + i] = distance;
    }
  }
  return hierarchicalClustering({ order: m, data: distances });
}

/**
 * Puts the audit's correlation matrix in the overlap map's default order (clusters together, as
 * on screen) and returns the reordered matrix; no scale lines, since a cluster may span scales.
 * @param audit the audit result.
 * @returns the figure: ids and matrix in display order.
 */
export function orderForOverlapMap(audit: AuditJson): OverlapMapFigure {
  const ids = audit.correlation.items;
  const order = clusterTreeOfCorrelations(audit.correlation.matrix).order;
  const matrix = order.map((row) =>
    order.map((column) => {
      const value = audit.correlation.matrix[row]?.[column];
      return typeof value === 'number' && Number.isFinite(value) ? value : null;
    }),
  );
  return { kind: 'overlap-map', items: order.map((position) => ids[position]), matrix, scaleBreaks: [], orderedBy: 'by cluster (average linkage on 1 − |r|), as the overlap map on screen orders them by default' };
}
