/**
 * The exploratory view of a multi-scale wave (audit JSON `structure.exploratory`): as many minres
 * factors as the codebook has scales, rotated by direct oblimin (factors may correlate, as scales
 * of one questionnaire do), with the factor correlations, each item's pattern loadings,
 * cross-loadings, omega hierarchical (Schmid-Leiman, psych::omega's observed-variance version) and
 * the items that become candidates: weak items (no loading of .30 or more) and cross-loading
 * items (.30 or more on two or more factors). The .30 cut-off for a salient loading is common
 * practice (e.g. Tabachnick & Fidell, Using Multivariate Statistics; from memory). Candidates are
 * suggestions for the designer behind the same constraints as the cut list (locks, minimum items,
 * alpha floor and drop, cut cap, facets), counted on top of the proposed cut.
 */
import { scaleAlphaOracle } from '../engine/compute-evidence';
import type { EngineSettings } from '../engine/engine-settings';
import { blockingConstraints, type ConstraintName } from '../engine/recommend-cuts';
import type { EngineEvidence } from '../engine/types';
import { minresFactors } from '../stats/minres-factors';
import { obliminRotation } from '../stats/oblimin-rotation';
import { omegaHierarchical } from '../stats/omega-hierarchical';
import type { ItemMatrix } from '../stats/types';

/** A loading at or above this (absolute) is salient (common practice; see the module comment). */
export const SALIENT_LOADING = 0.3;
/** Largest item count the exploratory view factors (each iteration is an eigen-decomposition). */
export const EXPLORATORY_MAX_ITEMS = 150;

/** One candidate of the exploratory view. */
export interface ExploratoryCandidateJson {
  item: string;
  /** `weak`: no salient loading; `cross-loading`: salient on two or more factors. */
  reason: 'weak' | 'cross-loading';
  proposed: 'drop';
  /** Constraints that keep it (empty: the designer may drop it). */
  blockedBy: ConstraintName[];
  /** The item's pattern loadings (factor order), its largest |loading| and communality. */
  evidence: { loadings: number[]; maxLoading: number; salient: string[]; communality: number };
  message: string;
}

/** `structure.exploratory` of the audit JSON. */
export interface ExploratoryJson {
  factors: number;
  /** Each factor named by the scale most of its primary items come from (F1, F2... where none). */
  factorNames: string[];
  correlation: string;
  items: string[];
  /** Pattern loadings after oblimin, items × factors. */
  loadings: number[][];
  /** Structure loadings (item-factor correlations), items × factors. */
  structure: number[][];
  factorCorrelations: number[][];
  communalities: number[];
  omega: { hierarchical: number; total: number; general: number[]; flipped: string[]; variant: string } | null;
  crossLoadings: { item: string; factors: string[] }[];
  weak: { item: string; maxLoading: number }[];
  candidates: ExploratoryCandidateJson[];
  salientLoading: number;
  converged: boolean;
  note: string;
}

/**
 * The exploratory view, or null with the reason when the wave has fewer than two scales or too
 * few items for that many factors.
 * @param evidence the engine's evidence (correlation matrix, scales, items with their constraints).
 * @param matrix the audit's matrix (for the constraint check's reliabilities).
 * @param settings the engine settings (the designer's constraints).
 * @param removed indices into items[] the proposed cut removes.
 * @returns the view and warnings.
 * References: Jennrich 2002 and Bernaards & Jennrich 2005 (oblimin); Schmid & Leiman 1957;
 *   Zinbarg et al. 2005 (omega hierarchical); Harman & Jones 1966 (minres).
 */
export function exploratoryStructure(
  evidence: EngineEvidence,
  matrix: ItemMatrix,
  settings: EngineSettings,
  removed: readonly number[],
): { view: ExploratoryJson | null; warnings: { code: string; items: string[]; message: string }[] } {
  const ids = evidence.items.map((item) => item.id);
  const usable = evidence.usable;
  const scaleIds = [...new Set(usable.map((j) => evidence.items[j].scale).filter((scale): scale is string => scale !== null))];
  const k = scaleIds.length;
  if (k < 2) return { view: null, warnings: [] };
  const p = usable.length;
  if (p > EXPLORATORY_MAX_ITEMS) {
    return { view: null, warnings: [{ code: 'exploratory-skipped', items: [], message: `The exploratory view (oblimin factors, omega hierarchical) is skipped above ${EXPLORATORY_MAX_ITEMS} items; this wave has ${p} in the matrix.` }] };
  }
  if ((p - k) ** 2 < p + k || p < 2 * k) {
    return { view: null, warnings: [{ code: 'exploratory-skipped', items: [], message: `${k} scales need more than ${p} items for a ${k}-factor exploratory model (at least two items per factor and positive degrees of freedom); the exploratory view is skipped.` }] };
  }
  const fit = minresFactors(evidence.correlation, k);
  const rotated = obliminRotation(fit.loadings, p, k);
  const rows = (data: ArrayLike<number>, width: number) => Array.from({ length: data.length / width }, (_, i) => Array.from({ length: width }, (_, f) => data[i * width + f]));
  const loadings = rows(rotated.loadings, k);
  // Reflect each factor so that its loadings sum positive (the sign of a factor is arbitrary).
  for (let f = 0; f < k; f++) {
    if (loadings.reduce((sum, row) => sum + row[f], 0) >= 0) continue;
    for (const row of loadings) row[f] = -row[f];
    for (let g = 0; g < k; g++) if (g !== f) {
      rotated.factorCorrelations[f * k + g] *= -1;
      rotated.factorCorrelations[g * k + f] *= -1;
    }
    for (let i = 0; i < p; i++) rotated.structure[i * k + f] *= -1;
  }
  const primary = loadings.map((row) => row.reduce((best, value, f) => (Math.abs(value) > Math.abs(row[best]) ? f : best), 0));
  const factorNames = Array.from({ length: k }, (_, f) => {
    const counts = new Map<string, number>();
    primary.forEach((factor, i) => {
      const scale = evidence.items[usable[i]].scale;
      if (factor === f && scale !== null) counts.set(scale, (counts.get(scale) ?? 0) + 1);
    });
    const best = [...counts].sort((a, b) => b[1] - a[1])[0];
    return best ? best[0] : `F${f + 1}`;
  });
  const unique = factorNames.map((name, f) => (factorNames.indexOf(name) === f ? name : `${name} (F${f + 1})`));
  const oblique = { items: p, factors: k, loadings: Float64Array.from(loadings.flat()), factorCorrelations: rotated.factorCorrelations };
  const omega = omegaHierarchical(evidence.correlation, oblique, fit.communalities);

  const scaleAlpha = scaleAlphaOracle(evidence, matrix);
  const cut = new Set(removed);
  const weak: ExploratoryJson['weak'] = [];
  const crossLoadings: ExploratoryJson['crossLoadings'] = [];
  const candidates: ExploratoryCandidateJson[] = [];
  loadings.forEach((row, i) => {
    const item = usable[i];
    const salient = row.flatMap((value, f) => (Math.abs(value) >= SALIENT_LOADING ? [unique[f]] : []));
    const maxLoading = Math.max(...row.map(Math.abs));
    let reason: ExploratoryCandidateJson['reason'] | null = null;
    if (salient.length === 0) {
      weak.push({ item: ids[item], maxLoading });
      reason = 'weak';
    } else if (salient.length > 1) {
      crossLoadings.push({ item: ids[item], factors: salient });
      reason = 'cross-loading';
    }
    if (reason === null || cut.has(item)) return;
    const blockedBy = blockingConstraints(evidence, item, settings, scaleAlpha, cut);
    const figures = row.map((value, f) => `${unique[f]} ${value.toFixed(2)}`).join(', ');
    candidates.push({
      item: ids[item],
      reason,
      proposed: 'drop',
      blockedBy,
      evidence: { loadings: row, maxLoading, salient, communality: fit.communalities[i] },
      message: reason === 'weak'
        ? `${ids[item]} loads no factor at ${SALIENT_LOADING.toFixed(2)} or more (${figures}): it shares little with the questionnaire's scales; consider dropping or rewording it.`
        : `${ids[item]} loads ${salient.join(' and ')} at ${SALIENT_LOADING.toFixed(2)} or more (${figures}): it does not separate the scales; consider rewording it towards one of them, or dropping it.`,
    });
  });
  const warnings = [...fit.notices, ...rotated.notices, ...omega.notices.filter((notice) => notice.code !== 'two-factors')].map((notice) => ({
    code: `exploratory-${notice.code}`, items: notice.items.map((i) => ids[usable[i]] ?? String(i)), message: `Exploratory view: ${notice.message}`,
  }));
  return {
    view: {
      factors: k,
      factorNames: unique,
      correlation: evidence.method,
      items: usable.map((j) => ids[j]),
      loadings,
      structure: rows(rotated.structure, k),
      factorCorrelations: rows(rotated.factorCorrelations, k),
      communalities: Array.from(fit.communalities),
      omega: {
        hierarchical: omega.omegaHierarchical,
        total: omega.omegaTotal,
        general: Array.from(omega.general),
        flipped: omega.flipped.map((i) => ids[usable[i]]),
        variant: `Schmid-Leiman (psych::omega's method): minres factors, oblimin, ${k > 2 ? 'one minres factor of the factor correlations' : 'both factors loading the general factor equally (two factors)'}; omega hierarchical = (sum of general loadings)² / sum of the correlation matrix (observed variance), items with a negative general loading reversed first`,
      },
      crossLoadings,
      weak,
      candidates,
      salientLoading: SALIENT_LOADING,
      converged: fit.converged && rotated.converged,
      note: `${k} minres factors (one per codebook scale) on the ${evidence.missing} ${evidence.method} correlation matrix, rotated by direct oblimin (gamma 0, as GPArotation::oblimin); a loading of ${SALIENT_LOADING.toFixed(2)} or more counts as salient (common practice). Candidates are counted on top of the proposed cut and kept where a constraint says so.`,
    },
    warnings,
  };
}
