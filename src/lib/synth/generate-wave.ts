import { createSeededRandom, type SeededRandom } from '../stats/seeded-random';
import { discretiseLatent, ordinalThresholds } from './ordinal-thresholds';
import type { CodebookRow, ItemSpec, ScalePoints, SyntheticWave, WaveColumn, WaveSpec } from './types';

/** How an item's answers are produced, resolved once from the spec. */
interface ItemPlan {
  readonly name: string;
  readonly scaleIndex: number;
  readonly points: ScalePoints;
  readonly reverse: boolean;
  readonly loading: number;
  readonly thresholds: readonly number[];
  /** Index (in the plan list) of the source item for a twin, else -1. */
  readonly sourceIndex: number;
  /** Index of the doublet shared component this item takes part in, else -1. */
  readonly doubletIndex: number;
  /** Weight of the doublet shared component (sqrt of the residual covariance), else 0. */
  readonly doubletWeight: number;
  /** Index of the scale the item cross-loads on, else -1. */
  readonly crossScaleIndex: number;
  /** Loading on that scale's factor, else 0. */
  readonly crossLoading: number;
}

type Role = 'ordinary' | 'straightliner' | 'speeder';

/** Values a straightliner repeats down the whole questionnaire (agreement side is commoner). */
const STRAIGHTLINE_VALUES = [1, 3, 3, 4, 4, 5, 5, 5];

/**
 * Generates a synthetic pilot wave from a stated factor structure, with planted redundancy and
 * data-quality problems recorded in a ground truth.
 *
 * Each scale has one factor; the factors share a common correlation. An item's latent response is
 * `loading · factor + sqrt(1 − loading²) · noise` (unit variance), cut into 5 or 7 categories by
 * thresholds shifted towards agreement. A planted twin's latent response is its source's plus
 * noise of SD `twinNoise`, rescaled to unit variance, cut at the source's thresholds; a
 * reverse-worded item stores `min + max − x`. Ordinary respondents and speeders then lose answers
 * to missing codes and blanks at the stated rates; straightliners give one answer throughout;
 * speeders answer uniformly at random in a fraction of the median time. The same spec and seed
 * always give the same wave.
 *
 * @param spec The structure to generate (see `WaveSpec`).
 * @param seed Integer seed of the random generator.
 * @throws {RangeError} when the spec is inconsistent (sizes, rates or ranges out of bounds,
 *   duplicate column names, a twin whose source is missing, in another scale or itself a twin,
 *   a missing code inside an item's answer range).
 * @returns Raw columns (id, duration, items, constants and copies after their scale, outcome),
 *   the codebook, and the ground truth.
 * References: Thurstone 1947, "Multiple-factor analysis" (common-factor model);
 * Muthén 1984, "A general structural equation model with dichotomous, ordered categorical, and
 * continuous latent variable indicators" (threshold model).
 */
export function generateWave(spec: WaveSpec, seed: number): SyntheticWave {
  checkSpec(spec);
  const random = createSeededRandom(seed);
  const plans = planItems(spec, random);
  const roles = assignRoles(spec, random);
  const scaleCount = spec.scales.length;
  const rows = spec.respondents;

  const itemValues: (number | null)[][] = plans.map(() => new Array<number | null>(rows));
  const outcomeValues: (number | null)[] = new Array<number | null>(rows);
  const durations: number[] = new Array<number>(rows);
  const factors = new Float64Array(scaleCount);
  const latents = new Float64Array(plans.length);
  const sharedWeight = Math.sqrt(spec.factorCorrelation);
  const ownWeight = Math.sqrt(1 - spec.factorCorrelation);
  const doubletCount = plans.reduce((count, plan) => Math.max(count, plan.doubletIndex + 1), 0);
  const doubletShared = new Float64Array(doubletCount);

  for (let i = 0; i < rows; i++) {
    const general = random.nextNormal();
    for (let k = 0; k < scaleCount; k++) factors[k] = sharedWeight * general + ownWeight * random.nextNormal();
    const role = roles[i];
    const straightValue = STRAIGHTLINE_VALUES[random.nextInt(STRAIGHTLINE_VALUES.length)];

    plans.forEach((plan, j) => {
      let answer: number;
      if (role === 'straightliner') {
        answer = Math.min(straightValue, plan.points);
      } else if (role === 'speeder') {
        answer = 1 + random.nextInt(plan.points);
      } else {
        // Doublet components are drawn only for waves that plant doublets, so waves without them
        // draw exactly the random numbers they always drew (the demo does not change).
        if (j === 0) for (let d = 0; d < doubletCount; d++) doubletShared[d] = random.nextNormal();
        if (plan.sourceIndex < 0 && plan.doubletIndex < 0 && plan.crossScaleIndex < 0) {
          const uniqueness = Math.sqrt(1 - plan.loading * plan.loading);
          latents[j] = plan.loading * factors[plan.scaleIndex] + uniqueness * random.nextNormal();
        } else if (plan.sourceIndex < 0) {
          latents[j] = structuredLatent(plan, factors, doubletShared, spec.factorCorrelation, random);
        } else {
          const noisy = latents[plan.sourceIndex] + spec.twinNoise * random.nextNormal();
          latents[j] = noisy / Math.sqrt(1 + spec.twinNoise * spec.twinNoise);
        }
        answer = discretiseLatent(latents[j], plan.thresholds);
        if (plan.reverse) answer = 1 + plan.points - answer;
      }
      itemValues[j][i] = role === 'straightliner' ? answer : withMissingness(answer, spec, random);
    });

    outcomeValues[i] = spec.outcome === null ? null : outcomeAnswer(spec, factors, role, random);
    durations[i] = durationSeconds(spec.medianDurationSeconds, role, random);
  }

  return assemble(spec, plans, itemValues, outcomeValues, durations, roles);
}

/**
 * Latent response of an item with a doublet component and/or a cross-loading, unit variance:
 * `loading · own factor + cross · other factor + sqrt(θ) · shared + sqrt(rest) · noise`, where the
 * rest is `1 − loading² − cross² − 2 · loading · cross · φ − θ` (φ the factor correlation).
 */
function structuredLatent(plan: ItemPlan, factors: Float64Array, shared: Float64Array, factorCorrelation: number, random: SeededRandom): number {
  let latent = plan.loading * factors[plan.scaleIndex];
  let explained = plan.loading * plan.loading;
  if (plan.crossScaleIndex >= 0) {
    latent += plan.crossLoading * factors[plan.crossScaleIndex];
    explained += plan.crossLoading * plan.crossLoading + 2 * plan.loading * plan.crossLoading * factorCorrelation;
  }
  if (plan.doubletIndex >= 0) {
    latent += plan.doubletWeight * shared[plan.doubletIndex];
    explained += plan.doubletWeight * plan.doubletWeight;
  }
  return latent + Math.sqrt(1 - explained) * random.nextNormal();
}

function checkSpec(spec: WaveSpec): void {
  const fail = (condition: string): never => {
    throw new RangeError(`generateWave: ${condition}`);
  };
  if (!Number.isInteger(spec.respondents) || spec.respondents < 10) fail(`respondents must be an integer >= 10, got ${spec.respondents}`);
  if (spec.scales.length === 0) fail('at least one scale is required');
  if (!(spec.factorCorrelation >= 0 && spec.factorCorrelation <= 0.95)) fail(`factorCorrelation must lie in [0, 0.95], got ${spec.factorCorrelation}`);
  const [low, high] = spec.loadingRange;
  if (!(low > 0 && low <= high && high < 1)) fail(`loadingRange must satisfy 0 < low <= high < 1, got [${low}, ${high}]`);
  if (!(spec.twinNoise >= 0 && Number.isFinite(spec.twinNoise))) fail(`twinNoise must be finite and >= 0, got ${spec.twinNoise}`);
  if (!(spec.skew >= 0 && spec.skew <= 2)) fail(`skew must lie in [0, 2], got ${spec.skew}`);
  if (!(spec.blankRate >= 0 && spec.blankRate <= 0.5)) fail(`blankRate must lie in [0, 0.5], got ${spec.blankRate}`);
  const missingTotal = spec.missingCodes.reduce((sum, code) => sum + code.rate, 0) + spec.blankRate;
  if (missingTotal > 0.5) fail(`missing-code and blank rates add up to ${missingTotal}, more than 0.5`);
  if (!(spec.medianDurationSeconds >= 10)) fail(`medianDurationSeconds must be >= 10, got ${spec.medianDurationSeconds}`);
  if (!Number.isInteger(spec.firstRespondentId)) fail(`firstRespondentId must be an integer, got ${spec.firstRespondentId}`);
  const { straightliners, speeders } = spec;
  if (!Number.isInteger(straightliners) || !Number.isInteger(speeders) || straightliners < 0 || speeders < 0 || straightliners + speeders > spec.respondents / 2) {
    fail(`straightliners (${straightliners}) and speeders (${speeders}) must be integers >= 0 adding up to at most half the respondents`);
  }

  const names = new Set<string>();
  const claim = (name: string): void => {
    if (name.length === 0) fail('column names must not be empty');
    if (names.has(name)) fail(`column name "${name}" is used twice`);
    names.add(name);
  };
  claim(spec.idColumn);
  claim(spec.durationColumn);
  const maxPoints = Math.max(...spec.scales.map((scale) => scale.points));
  for (const code of spec.missingCodes) {
    if (!Number.isInteger(code.code) || (code.code >= 1 && code.code <= maxPoints)) fail(`missing code ${code.code} must be an integer outside 1..${maxPoints}`);
    if (!(code.rate >= 0)) fail(`missing code ${code.code} has a negative rate`);
  }
  const scaleNames = spec.scales.map((scale) => scale.name);
  for (const scale of spec.scales) {
    if (scale.points !== 5 && scale.points !== 7) fail(`scale "${scale.name}" must have 5 or 7 points, got ${scale.points}`);
    if (scale.items.length === 0) fail(`scale "${scale.name}" has no items`);
    const range = scale.loadingRange ?? spec.loadingRange;
    if (!(range[0] > 0 && range[0] <= range[1] && range[1] < 1)) fail(`scale "${scale.name}" loadingRange must satisfy 0 < low <= high < 1, got [${range[0]}, ${range[1]}]`);
    const byName = new Map<string, ItemSpec>(scale.items.map((item) => [item.name, item]));
    const inDoublet = new Set<string>();
    for (const item of scale.items) {
      claim(item.name);
      if (item.crossLoading !== undefined) {
        const { scale: other, loading } = item.crossLoading;
        if (!scaleNames.includes(other) || other === scale.name) fail(`item "${item.name}" cross-loads on "${other}", which must be another scale of the wave`);
        if (!(Math.abs(loading) > 0 && Math.abs(loading) < 1)) fail(`item "${item.name}" cross-loading must lie in (-1, 1) and not be 0, got ${loading}`);
        if (item.twinOf !== undefined || item.doubletOf !== undefined) fail(`item "${item.name}" cannot be both a cross-loading decoy and a twin or doublet`);
        const high = range[1];
        const worst = high * high + loading * loading + 2 * high * Math.abs(loading) * spec.factorCorrelation;
        if (!(worst < 1)) fail(`item "${item.name}" loading up to ${high} and cross-loading ${loading} leave no unique variance`);
      }
      if (item.doubletOf !== undefined) {
        const source = byName.get(item.doubletOf);
        const theta = item.doubletResidual;
        if (item.twinOf !== undefined) fail(`item "${item.name}" cannot be both a twin and a doublet`);
        if (source === undefined) fail(`doublet "${item.name}" names source "${item.doubletOf}", which is not an item of scale "${scale.name}"`);
        else if (source.twinOf !== undefined || source.doubletOf !== undefined || source.crossLoading !== undefined) fail(`doublet "${item.name}" names source "${item.doubletOf}", which must be an ordinary item`);
        else if (scale.items.indexOf(source) > scale.items.indexOf(item)) fail(`doublet "${item.name}" must come after its source "${item.doubletOf}"`);
        if (inDoublet.has(item.doubletOf)) fail(`source "${item.doubletOf}" already has a doublet`);
        inDoublet.add(item.doubletOf);
        if (theta === undefined || !(theta > 0 && theta < 1)) fail(`doublet "${item.name}" needs doubletResidual in (0, 1), got ${String(theta)}`);
        else if (!(range[1] * range[1] + theta < 1)) fail(`doublet "${item.name}": residual ${theta} plus a loading up to ${range[1]} leaves no unique variance (loading² + residual must stay below 1)`);
      } else if (item.doubletResidual !== undefined) fail(`item "${item.name}" has doubletResidual without doubletOf`);
      if (item.twinOf === undefined) continue;
      const source = byName.get(item.twinOf);
      if (source === undefined) fail(`twin "${item.name}" names source "${item.twinOf}", which is not an item of scale "${scale.name}"`);
      else if (source.twinOf !== undefined) fail(`twin "${item.name}" names source "${item.twinOf}", which is itself a twin`);
      else if (scale.items.indexOf(source) > scale.items.indexOf(item)) fail(`twin "${item.name}" must come after its source "${item.twinOf}"`);
    }
  }
  for (const constant of spec.constantItems) {
    claim(constant.name);
    const scale = spec.scales.find((candidate) => candidate.name === constant.scale);
    if (scale === undefined) fail(`constant item "${constant.name}" names unknown scale "${constant.scale}"`);
    else if (!Number.isInteger(constant.value) || constant.value < 1 || constant.value > scale.points) fail(`constant item "${constant.name}" value ${constant.value} is outside 1..${scale.points}`);
  }
  const itemNames = new Set(spec.scales.flatMap((scale) => scale.items.map((item) => item.name)));
  for (const copy of spec.duplicateColumns) {
    if (!itemNames.has(copy.source)) fail(`duplicate column "${copy.name}" names unknown source item "${copy.source}"`);
    claim(copy.name);
  }
  if (spec.outcome !== null) {
    claim(spec.outcome.name);
    if (spec.outcome.weights.length !== spec.scales.length) fail(`outcome needs ${spec.scales.length} weights, got ${spec.outcome.weights.length}`);
    if (spec.outcome.weights.every((weight) => weight === 0)) fail('outcome weights must not all be 0');
    if (!(spec.outcome.noiseShare >= 0 && spec.outcome.noiseShare < 1)) fail(`outcome noiseShare must lie in [0, 1), got ${spec.outcome.noiseShare}`);
  }
}

function planItems(spec: WaveSpec, random: SeededRandom): ItemPlan[] {
  const plans: ItemPlan[] = [];
  const indexByName = new Map<string, number>();
  const scaleIndexByName = new Map(spec.scales.map((scale, k) => [scale.name, k]));
  let doublets = 0;
  spec.scales.forEach((scale, scaleIndex) => {
    const [low, high] = scale.loadingRange ?? spec.loadingRange;
    for (const item of scale.items) {
      const loading = low + (high - low) * random.next();
      const shift = spec.skew * (0.5 + 0.5 * random.next());
      const sourceIndex = item.twinOf === undefined ? -1 : (indexByName.get(item.twinOf) as number);
      const thresholds = sourceIndex < 0 ? ordinalThresholds(scale.points, shift) : plans[sourceIndex].thresholds;
      let doubletIndex = -1;
      let doubletWeight = 0;
      if (item.doubletOf !== undefined) {
        const source = indexByName.get(item.doubletOf) as number;
        doubletIndex = doublets++;
        doubletWeight = Math.sqrt(item.doubletResidual as number);
        plans[source] = { ...plans[source], doubletIndex, doubletWeight };
      }
      indexByName.set(item.name, plans.length);
      plans.push({
        name: item.name,
        scaleIndex,
        points: scale.points,
        reverse: item.reverse === true,
        loading,
        thresholds,
        sourceIndex,
        doubletIndex,
        doubletWeight,
        crossScaleIndex: item.crossLoading === undefined ? -1 : (scaleIndexByName.get(item.crossLoading.scale) as number),
        crossLoading: item.crossLoading?.loading ?? 0,
      });
    }
  });
  return plans;
}

function assignRoles(spec: WaveSpec, random: SeededRandom): Role[] {
  const order = Array.from({ length: spec.respondents }, (_, i) => i);
  const picked = spec.straightliners + spec.speeders;
  for (let i = 0; i < picked; i++) {
    const j = i + random.nextInt(order.length - i);
    [order[i], order[j]] = [order[j], order[i]];
  }
  const roles = new Array<Role>(spec.respondents).fill('ordinary');
  for (let i = 0; i < spec.straightliners; i++) roles[order[i]] = 'straightliner';
  for (let i = spec.straightliners; i < picked; i++) roles[order[i]] = 'speeder';
  return roles;
}

function withMissingness(answer: number, spec: WaveSpec, random: SeededRandom): number | null {
  let draw = random.next();
  if (draw < spec.blankRate) return null;
  draw -= spec.blankRate;
  for (const code of spec.missingCodes) {
    if (draw < code.rate) return code.code;
    draw -= code.rate;
  }
  return answer;
}

function outcomeAnswer(spec: WaveSpec, factors: Float64Array, role: Role, random: SeededRandom): number | null {
  const outcome = spec.outcome!;
  const noise = random.nextNormal();
  const blank = random.next() < spec.blankRate;
  if (role === 'speeder') return blank ? null : random.nextInt(11);
  const weights = outcome.weights;
  let variance = 0;
  for (let k = 0; k < weights.length; k++) {
    for (let l = 0; l < weights.length; l++) variance += weights[k] * weights[l] * (k === l ? 1 : spec.factorCorrelation);
  }
  let signal = 0;
  for (let k = 0; k < weights.length; k++) signal += weights[k] * factors[k];
  const latent = Math.sqrt(1 - outcome.noiseShare) * (signal / Math.sqrt(variance)) + Math.sqrt(outcome.noiseShare) * noise;
  if (blank) return null;
  return Math.min(10, Math.max(0, Math.round(6.5 + 2 * latent)));
}

function durationSeconds(median: number, role: Role, random: SeededRandom): number {
  const z = random.nextNormal();
  const u = random.next();
  if (role === 'speeder') return Math.round(median * (0.12 + 0.16 * u));
  if (role === 'straightliner') return Math.round(median * Math.min(1.5, Math.max(0.55, Math.exp(-0.4 + 0.3 * z))));
  return Math.round(median * Math.min(4, Math.max(0.55, Math.exp(0.35 * z))));
}

function assemble(
  spec: WaveSpec,
  plans: readonly ItemPlan[],
  itemValues: (number | null)[][],
  outcomeValues: (number | null)[],
  durations: number[],
  roles: readonly Role[],
): SyntheticWave {
  const rows = spec.respondents;
  const missing = spec.missingCodes.map((code) => code.code);
  const columns: WaveColumn[] = [
    { name: spec.idColumn, values: Array.from({ length: rows }, (_, i) => spec.firstRespondentId + i) },
    { name: spec.durationColumn, values: durations },
  ];
  const codebook: CodebookRow[] = [];
  const scales: { name: string; points: ScalePoints; items: string[] }[] = [];
  const plannedIndex = new Map(plans.map((plan, j) => [plan.name, j]));
  const textByName = new Map(spec.scales.flatMap((scale) => scale.items.map((item) => [item.name, item.text] as const)));

  spec.scales.forEach((scale, scaleIndex) => {
    const items: string[] = [];
    const add = (name: string, values: (number | null)[], reverse: boolean, text: string): void => {
      columns.push({ name, values });
      codebook.push({ item: name, scale: scale.name, reverse, min: 1, max: scale.points, missing, text });
      items.push(name);
    };
    plans.forEach((plan, j) => {
      if (plan.scaleIndex === scaleIndex) add(plan.name, itemValues[j], plan.reverse, textByName.get(plan.name) as string);
    });
    for (const constant of spec.constantItems) {
      if (constant.scale === scale.name) add(constant.name, new Array<number>(rows).fill(constant.value), false, constant.text);
    }
    for (const copy of spec.duplicateColumns) {
      const source = plannedIndex.get(copy.source) as number;
      if (plans[source].scaleIndex === scaleIndex) add(copy.name, itemValues[source].slice(), plans[source].reverse, textByName.get(copy.source) as string);
    }
    scales.push({ name: scale.name, points: scale.points, items });
  });

  if (spec.outcome !== null) {
    columns.push({ name: spec.outcome.name, values: outcomeValues });
    codebook.push({ item: spec.outcome.name, scale: '', reverse: false, min: 0, max: 10, missing: [], text: spec.outcome.text });
  }

  const plantedPairs: [string, string][] = [];
  const reverseTwins: [string, string][] = [];
  plans.forEach((plan, j) => {
    if (plan.sourceIndex >= 0) return;
    const cluster = [plan.name, ...plans.filter((other) => other.sourceIndex === j).map((other) => other.name)];
    for (let a = 0; a < cluster.length; a++) for (let b = a + 1; b < cluster.length; b++) plantedPairs.push([cluster[a], cluster[b]]);
  });
  plans.forEach((plan) => {
    if (plan.sourceIndex >= 0 && plan.reverse !== plans[plan.sourceIndex].reverse) reverseTwins.push([plans[plan.sourceIndex].name, plan.name]);
  });

  const doublets: [string, string][] = [];
  spec.scales.forEach((scale) => {
    for (const item of scale.items) if (item.doubletOf !== undefined) doublets.push([item.doubletOf, item.name]);
  });
  const crossLoadings = spec.scales.flatMap((scale) => scale.items.filter((item) => item.crossLoading !== undefined).map((item) => item.name));
  const ownLoadingScales = spec.scales.filter((scale) => scale.loadingRange !== undefined).map((scale) => scale.name);

  const rolesOf = (role: Role): number[] => roles.flatMap((value, i) => (value === role ? [i] : []));
  return {
    columns,
    codebook,
    truth: {
      plantedPairs,
      duplicates: spec.duplicateColumns.map((copy) => [copy.source, copy.name] as const),
      doublets,
      crossLoadings,
      ownLoadingScales,
      reverseTwins,
      constantItems: spec.constantItems.map((constant) => constant.name),
      scales,
      straightliners: rolesOf('straightliner'),
      speeders: rolesOf('speeder'),
      outcome: spec.outcome === null ? null : spec.outcome.name,
    },
  };
}
