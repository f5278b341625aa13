/**
 * Contract of the overlap map's two routes, shared by the routes and the island:
 *
 * - `GET /api/audits/{id}/overlap-map` (members): the slice of a done audit the map draws, not the
 *   whole audit JSON: the items in the correlation matrix with their wording and scale, the
 *   matrix as a rounded upper triangle, the respondents each pair rests on, three orderings
 *   (cluster tree on 1 − |r| with average linkage, scale, questionnaire), the overlap clusters,
 *   the pair evidence the audit has and the recommendations that involve them.
 * - `GET /api/audits/{id}/crosstab?a=ITEM&b=ITEM` (members): the two items' recoded answers
 *   cross-tabulated over the respondents the audit used. Counts are aggregates; for roles that
 *   may not see respondent rows, cells below {@link SMALL_CELL_LIMIT} are suppressed.
 *
 * Pure: zod schemas and the types inferred from them, plus small readers of the packed matrix.
 */
import { z } from 'zod';
import { fisherZInterval } from '../stats/fisher-z-interval';

/** Decimals kept for each correlation in the map's slice (the map colours and the hover read 3). */
export const MAP_DECIMALS = 3;

/**
 * Cells of a crosstab holding fewer respondents than this, but at least one, are withheld from
 * roles that may not read respondent rows (client reviewers, field managers). Common practice in
 * statistical disclosure control (small-cell suppression thresholds of 3 to 10 are usual; 5 is
 * the value chosen here).
 */
export const SMALL_CELL_LIMIT = 5;

const nullableNumber = z.number().nullable();

export const mapItemSchema = z.object({
  id: z.string(),
  text: z.string().nullable(),
  scale: z.string().nullable(),
  /** 0-based position in the questionnaire (the wave's column order). */
  position: z.number().int(),
  locked: z.boolean(),
});

export const mapPairSchema = z.object({
  /** Indices into `items`. */
  a: z.number().int(),
  b: z.number().int(),
  r: z.number(),
  lower: nullableNumber,
  upper: nullableNumber,
  n: nullableNumber,
  /** Local-dependence evidence when the audit has it (audit-json.md, `pairs`). */
  residual: nullableNumber,
  residualCritical: nullableNumber,
  /** Modification index of the pair's residual covariance in its scale's one-factor model, its critical value and the standardized expected change. */
  mi: nullableNumber,
  miCritical: nullableNumber,
  sepc: nullableNumber,
  wto: nullableNumber,
  partial: nullableNumber,
  wording: nullableNumber,
  rules: z.array(z.string()),
});

export const mapRecommendationSchema = z.object({
  index: z.number().int(),
  cluster: z.array(z.string()),
  keep: z.string(),
  actions: z.array(z.object({ item: z.string(), action: z.string(), into: z.string().nullable() })),
  reason: z.string(),
  stability: nullableNumber,
  unstable: z.boolean(),
});

export const overlapMapSchema = z.object({
  auditId: z.string(),
  method: z.string(),
  missing: z.string(),
  respondentsUsed: z.number().int(),
  items: z.array(mapItemSchema),
  scales: z.array(z.object({ id: z.string(), items: z.array(z.number().int()) })),
  /**
   * The correlations above the diagonal, row by row: r(i, j) for i < j is at
   * `i·m − i·(i+1)/2 + (j − i − 1)`, rounded to MAP_DECIMALS; null where a pair has no value.
   */
  upper: z.array(z.number().nullable()),
  /** Respondents each pair rests on, in the same layout; one number when every pair has the same. */
  pairN: z.union([z.number().int(), z.array(z.number().int())]),
  orders: z.object({
    cluster: z.array(z.number().int()),
    scale: z.array(z.number().int()),
    questionnaire: z.array(z.number().int()),
  }),
  /** The cluster tree's merge heights (1 − |r|), for reading how tight the tree is. */
  clusterHeights: z.array(z.number()),
  /** Overlap clusters the engine found, as item indices, with the recommendation built on each (or null). */
  clusters: z.array(z.object({ items: z.array(z.number().int()), maxR: nullableNumber, recommendation: z.number().int().nullable() })),
  pairs: z.array(mapPairSchema),
  /** True when `pairs` carries the local-dependence evidence (residual, wTO, partial r). */
  localDependence: z.boolean(),
  recommendations: z.array(mapRecommendationSchema),
  strongPairThreshold: nullableNumber,
  confidenceLevel: z.number(),
});

export type OverlapMapItem = z.infer<typeof mapItemSchema>;
export type OverlapMapPair = z.infer<typeof mapPairSchema>;
export type OverlapMapRecommendation = z.infer<typeof mapRecommendationSchema>;
export type OverlapMap = z.infer<typeof overlapMapSchema>;
export type MapOrdering = keyof OverlapMap['orders'];

/** Where r(i, j) sits in the packed upper triangle of an order-m matrix. */
export function upperIndex(m: number, i: number, j: number): number {
  const [a, b] = i < j ? [i, j] : [j, i];
  return a * m - (a * (a + 1)) / 2 + (b - a - 1);
}

/** r(i, j) from the slice (1 on the diagonal, null when absent). */
export function mapCorrelation(map: Pick<OverlapMap, 'items' | 'upper'>, i: number, j: number): number | null {
  if (i === j) return 1;
  return map.upper[upperIndex(map.items.length, i, j)] ?? null;
}

/** Respondents behind r(i, j). */
export function mapPairN(map: Pick<OverlapMap, 'items' | 'pairN'>, i: number, j: number): number | null {
  if (typeof map.pairN === 'number') return map.pairN;
  if (i === j) return null;
  return map.pairN[upperIndex(map.items.length, i, j)] ?? null;
}

/**
 * The Fisher-z interval of a correlation read from the slice (rounded to MAP_DECIMALS, so the
 * bounds are approximate to that rounding), or null when it cannot be formed (|r| = 1, n < 4).
 */
export function mapInterval(r: number | null, n: number | null, confidence: number): { lower: number; upper: number } | null {
  if (r === null || n === null || !Number.isInteger(n) || n < 4 || Math.abs(r) >= 1) return null;
  const interval = fisherZInterval(r, n, confidence);
  return { lower: interval.lower, upper: interval.upper };
}

export const crosstabSchema = z.object({
  auditId: z.string(),
  items: z.array(z.object({ id: z.string(), text: z.string().nullable(), reverse: z.boolean(), values: z.array(z.number()), labels: z.array(z.string().nullable()) })).length(2),
  /** counts[row value of a][column value of b]; null where a small cell is withheld. */
  counts: z.array(z.array(z.number().int().nullable())),
  /** Row and column totals; null when withheld because a suppressed cell could be recovered from them. */
  rowTotals: z.array(z.number().int()).nullable(),
  columnTotals: z.array(z.number().int()).nullable(),
  /** Respondents the audit used, those who answered both, and those missing one or both. */
  respondents: z.number().int(),
  answeredBoth: z.number().int(),
  missingEither: z.number().int(),
  /** Cells below this were withheld for the caller's role; null when nothing is withheld for it. */
  suppressedBelow: z.number().int().nullable(),
  suppressedCells: z.number().int(),
  /** The wave's exclusions changed after the audit ran: the counts use the rows set aside now. */
  exclusionsChanged: z.boolean(),
});

export type Crosstab = z.infer<typeof crosstabSchema>;
