/**
 * The redundancy engine's settings: every threshold, constraint and house figure it uses, named,
 * with its default and the reason for it. A literal threshold anywhere else in src/lib/engine is
 * a defect. See docs/decisions/003-redundancy-engine.md.
 */
import type { CorrelationMethod, MissingPolicy } from '../stats/types';

/** What the designer (or the audit's stored settings) may set. Every field has a default. */
export interface EngineSettings {
  /** Correlation family for the item matrix. */
  readonly method: CorrelationMethod;
  /** Missing-data policy for everything computed from pairs of items. */
  readonly missing: MissingPolicy;
  /** A pair with |r| at or above this (after reverse-keying) is a strong pair. Default 0.80. */
  readonly strongPairThreshold: number;
  /** A Belsley-Kuh-Welsch dimension with a condition index at or above this can be a near-dependency. Default 30. */
  readonly conditionIndexThreshold: number;
  /** ...when at least two items take this share or more of their coefficient variance from it. Default 0.5. */
  readonly varianceProportionThreshold: number;
  /**
   * An item of a near-dependency links to other items only when its VIF (from the full-sample
   * correlation matrix) is at or above this, or infinite. Default 5 (methods.md §3, "worth a look").
   */
  readonly dependencyVifThreshold: number;
  /** A removed item is merged into the keeper when their |r| is at or above this. Default 0.95. */
  readonly mergeCorrelation: number;
  /** ...or when their wording similarity is at or above this. Default 0.80. */
  readonly mergeWordingSimilarity: number;
  /**
   * No longer decides anything (issue 9: synonyms share few 3-grams, so low wording similarity is
   * no reason to reword); kept so that stored audit settings still resolve. Default 0.30.
   */
  readonly rewordWordingSimilarity: number;
  /** No scale may be cut below this many items. Default 3. */
  readonly minItemsPerScale: number;
  /** No scale's raw alpha may end below this after the cut. Default 0.70 (Nunnally 1978). */
  readonly alphaFloor: number;
  /** No scale's raw alpha may fall by more than this from its value before the cut. Default 0.10 (house figure). */
  readonly maxAlphaDrop: number;
  /** At most this share of the usable items may be cut (dropped or merged). Default 0.25 (house figure). */
  readonly maxCutShare: number;
  /** Answering time of one rating item, seconds, for minutes saved. Default 8 (house figure). */
  readonly secondsPerItem: number;
  /** Number of bootstrap resamples of respondents for stability; 0 turns the check off. Default 200. */
  readonly bootstrap: number;
  /** Seed of the bootstrap's random generator. Default 1. */
  readonly seed: number;
  /** A recommendation made in fewer than this share of resamples is marked unstable. Default 0.70. */
  readonly stabilityThreshold: number;
  /** Coverage of the Fisher-z interval shown beside each pair correlation. Default 0.95. */
  readonly confidenceLevel: number;
  /**
   * Relative residual (residual correlation minus the scale's mean residual) above which a pair
   * is locally dependent when no bootstrap critical value is available. Default 0.20 (Chen &
   * Thissen 1997; Christensen, Makransky & Horton 2017).
   */
  readonly residualRelativeThreshold: number;
  /**
   * The residual statistic: `residual` (r − λλᵀ, psych::fa's residual) or `q3` (the same divided by
   * both uniquenesses' square roots). Default `residual`: on the generated waves (60 per kind, README) the
   * engine with Q3 found about as many doublets (recall .838 vs .829) but made 1.78 recommendations
   * per ten clean waves against 0.94.
   */
  readonly residualStatistic: 'residual' | 'q3';
  /** Draws of the parametric bootstrap that gives each scale's critical value (0, or at least 20; 0 uses the fixed rule). Default 200 (the core's default). */
  readonly residualBootstrapDraws: number;
  /** Quantile of the bootstrap distribution of a scale's largest relative residual taken as its critical value. Default 0.99 (Christensen, Makransky & Horton 2017 tabulate the 95th and 99th; the 99th keeps false alarms on waves with nothing redundant near the ceiling of one per ten waves). */
  readonly residualCriticalQuantile: number;
  /**
   * A relative residual below this share of its critical value is "about zero". No longer read by
   * the rules (the modification index vetoes wTO flags since docs/decisions/022); kept so stored
   * settings resolve. Default 0.5 (house figure).
   */
  readonly residualAboutZeroShare: number;
  /**
   * Family-wise share of false alarms per scale of the sequential modification-index test: a
   * residual covariance is flagged when its modification index exceeds the χ²(1) quantile at this
   * share over the scale's pairs (Bonferroni). Default 0.001 (house figure; docs/decisions/022).
   */
  readonly modificationIndexAlpha: number;
  /**
   * The looser family-wise share at which a pair's modification index counts when the network also
   * links it (wTO at or above `wtoThreshold`). Default 0.05 (the conventional level; docs/decisions/022).
   */
  readonly modificationIndexNetworkAlpha: number;
  /**
   * Smallest standardized expected parameter change (the residual correlation the freed covariance
   * would take) of a flagged pair: with thousands of respondents trivial covariances pass any level,
   * so a flag needs both the test and a size that matters (Saris, Satorra & van der Veld 2009).
   * Default 0.20 (house figure; docs/decisions/022).
   */
  readonly modificationIndexMinSepc: number;
  /** A pair with weighted topological overlap at or above this is a wTO flag. Default 0.25 (Christensen, Garrido & Golino 2023). */
  readonly wtoThreshold: number;
  /** Gamma of the extended BIC that chooses the graphical-lasso penalty. Default 0.5 (Foygel & Drton 2010). */
  readonly ebicGamma: number;
  /** Penalties on the EBIC path, log-spaced down to 0.01 of the largest. Default 100 (qgraph::EBICglasso). */
  readonly ebicPenaltyCount: number;
  /**
   * A near-dependency on which the intercept takes at least this share of its variance is an
   * item-mean effect of an uncentred coding and forms no cluster. Default 0.5 (the proportion rule
   * of Belsley, Kuh & Welsch 1980 applied to the intercept).
   */
  readonly interceptDominanceThreshold: number;
}

/**
 * The range of values one setting takes: a choice among words, or a number between bounds
 * (each bound closed unless marked open), whole when `integer`; `off`, when given, is one value
 * outside the bounds that is also accepted and turns the computation off (e.g. 0 draws).
 */
export type SettingDomain =
  | { readonly kind: 'choice'; readonly choices: readonly string[] }
  | {
      readonly kind: 'number';
      readonly min: number;
      readonly max: number;
      readonly minOpen?: boolean;
      readonly maxOpen?: boolean;
      readonly integer?: boolean;
      readonly off?: number;
    };

/** The domain, default and source of one engine setting. */
export interface EngineSettingRule<Value> {
  readonly domain: SettingDomain;
  readonly default: Value;
  /** The published source of the default, or "house figure" (Paredown's own choice, docs/decisions/003). */
  readonly source: string;
}

const share = (defaultValue: number, source: string, minOpen = false): EngineSettingRule<number> => ({
  domain: { kind: 'number', min: 0, max: 1, ...(minOpen ? { minOpen: true } : {}) },
  default: defaultValue,
  source,
});

/**
 * The engine's part of the audit settings table (src/lib/audit/settings-table.ts adds the words
 * a reader sees): every setting's range, default and the source of the default, in the order the
 * settings are stored and echoed. The house figures (maximum alpha drop 0.10, cut cap 25%, 8
 * seconds per item, stability share 0.70, ...) are Paredown's own choices, stated in
 * docs/decisions/003 and adjustable per audit.
 */
export const ENGINE_SETTING_RULES: { readonly [Key in keyof EngineSettings]: EngineSettingRule<EngineSettings[Key]> } = Object.freeze({
  method: { domain: { kind: 'choice', choices: ['pearson', 'spearman', 'polychoric'] }, default: 'pearson', source: 'common practice (methods.md §1)' },
  missing: { domain: { kind: 'choice', choices: ['pairwise', 'listwise'] }, default: 'pairwise', source: 'common practice (methods.md §1)' },
  strongPairThreshold: share(0.8, 'house figure', true),
  conditionIndexThreshold: { domain: { kind: 'number', min: 1, max: 1e6 }, default: 30, source: 'Belsley, Kuh & Welsch 1980, "Regression Diagnostics"' },
  varianceProportionThreshold: share(0.5, 'Belsley, Kuh & Welsch 1980, "Regression Diagnostics"', true),
  dependencyVifThreshold: { domain: { kind: 'number', min: 1, max: 1e6 }, default: 5, source: 'methods.md §3 (VIF 5, "worth a look")' },
  mergeCorrelation: share(0.95, 'house figure'),
  mergeWordingSimilarity: share(0.8, 'house figure'),
  rewordWordingSimilarity: share(0.3, 'house figure'),
  minItemsPerScale: { domain: { kind: 'number', min: 1, max: 1_000, integer: true }, default: 3, source: 'house figure' },
  alphaFloor: share(0.7, 'Nunnally 1978, "Psychometric Theory"'),
  maxAlphaDrop: share(0.1, 'house figure'),
  maxCutShare: share(0.25, 'house figure'),
  secondsPerItem: { domain: { kind: 'number', min: 0, max: 3_600, minOpen: true }, default: 8, source: 'house figure' },
  bootstrap: { domain: { kind: 'number', min: 0, max: 10_000, integer: true }, default: 200, source: 'house figure' },
  seed: { domain: { kind: 'number', min: -(2 ** 31), max: 2 ** 31 - 1, integer: true }, default: 1, source: 'house figure' },
  stabilityThreshold: share(0.7, 'house figure'),
  confidenceLevel: { domain: { kind: 'number', min: 0, max: 1, minOpen: true, maxOpen: true }, default: 0.95, source: 'common practice (Fisher 1921, interval of r)' },
  residualRelativeThreshold: share(0.2, 'Chen & Thissen 1997; Christensen, Makransky & Horton 2017 (relative residual rule)'),
  residualStatistic: { domain: { kind: 'choice', choices: ['residual', 'q3'] }, default: 'residual', source: 'house figure (docs/decisions/010: fewer false alarms than q3 on generated waves)' },
  // 0 turns the bootstrap off (the fixed relative rule); fewer than 20 draws give no usable quantile (residualBootstrap).
  residualBootstrapDraws: { domain: { kind: 'number', min: 20, max: 10_000, integer: true, off: 0 }, default: 200, source: 'house figure (the core residualBootstrap default)' },
  residualCriticalQuantile: { domain: { kind: 'number', min: 0, max: 1, minOpen: true, maxOpen: true }, default: 0.99, source: 'Christensen, Makransky & Horton 2017 (95th and 99th percentiles tabulated)' },
  residualAboutZeroShare: share(0.5, 'house figure'),
  modificationIndexAlpha: { domain: { kind: 'number', min: 0, max: 1, minOpen: true, maxOpen: true }, default: 0.001, source: 'Sörbom 1989 (χ²(1) score test), Bonferroni over the scale\'s pairs; level a house figure (docs/decisions/022)' },
  modificationIndexNetworkAlpha: { domain: { kind: 'number', min: 0, max: 1, minOpen: true, maxOpen: true }, default: 0.05, source: 'common practice (the conventional 5% level), Bonferroni over the scale\'s pairs (docs/decisions/022)' },
  modificationIndexMinSepc: share(0.2, 'house figure (docs/decisions/022), after Saris, Satorra & van der Veld 2009 (judge a modification index with its EPC)'),
  wtoThreshold: share(0.25, 'Christensen, Garrido & Golino 2023 (Unique Variable Analysis)'),
  ebicGamma: share(0.5, 'Foygel & Drton 2010; qgraph::EBICglasso default'),
  ebicPenaltyCount: { domain: { kind: 'number', min: 2, max: 1_000, integer: true }, default: 100, source: 'qgraph::EBICglasso default (nlambda)' },
  interceptDominanceThreshold: share(0.5, 'Belsley, Kuh & Welsch 1980 (proportion rule applied to the intercept)'),
});

/** Names of the engine's settings, in their stored order. */
export const ENGINE_SETTING_NAMES = Object.freeze(Object.keys(ENGINE_SETTING_RULES)) as readonly (keyof EngineSettings)[];

/** The defaults, read from the rules above. */
/**
 * The partial-correlation network (graphical lasso over a path of penalties) is estimated only for
 * at most this many items: its cost grows with the cube of the items times the path length, and
 * past this size one audit's network took minutes on a 2-core machine. Larger waves get the
 * residual rule and the other evidence, with a warning (house figure).
 */
export const MAX_NETWORK_ITEMS = 120;

/**
 * The EM estimate of means and covariances (for condition indices when few respondents answered
 * every item) runs for at most this many items: each iteration works through every respondent's
 * own pattern of answers with a matrix of that size, which at 300 items took many minutes. Larger
 * waves with too few complete rows skip the near-dependency check, with a warning (house figure).
 */
export const MAX_EM_ITEMS = 80;

export const DEFAULT_ENGINE_SETTINGS: EngineSettings = Object.freeze(
  Object.fromEntries(ENGINE_SETTING_NAMES.map((name) => [name, ENGINE_SETTING_RULES[name].default])),
) as unknown as EngineSettings;

/**
 * The range of a domain in words, e.g. "a number above 0 and at most 1", "a whole number from 1
 * to 1000", "pearson, spearman or polychoric".
 * @param domain the setting's domain.
 * @returns the phrase.
 */
export function domainWords(domain: SettingDomain): string {
  if (domain.kind === 'choice') return `${domain.choices.slice(0, -1).join(', ')} or ${domain.choices[domain.choices.length - 1]}`;
  const what = domain.integer ? 'a whole number' : 'a number';
  const off = domain.off === undefined ? '' : `${domain.off} (off) or `;
  if (!domain.minOpen && !domain.maxOpen) return `${off}${what} from ${domain.min} to ${domain.max}`;
  return `${off}${what} ${domain.minOpen ? 'above' : 'at least'} ${domain.min} and ${domain.maxOpen ? 'below' : 'at most'} ${domain.max}`;
}

/**
 * Whether a value lies in a domain.
 * @param domain the setting's domain.
 * @param value any value.
 * @returns true when the value is one of the choices, or a finite number (whole when required) within the bounds or equal to its `off` value.
 */
export function inDomain(domain: SettingDomain, value: unknown): boolean {
  if (domain.kind === 'choice') return typeof value === 'string' && domain.choices.includes(value);
  if (typeof value !== 'number' || !Number.isFinite(value)) return false;
  if (domain.off !== undefined && value === domain.off) return true;
  if (domain.integer && !Number.isInteger(value)) return false;
  if (domain.minOpen ? !(value > domain.min) : !(value >= domain.min)) return false;
  return domain.maxOpen ? value < domain.max : value <= domain.max;
}

/**
 * The one sentence that refuses a value outside its domain, or null when the value is fine.
 * @param name the setting's name.
 * @param domain its domain.
 * @param value the value given.
 * @returns e.g. `strongPairThreshold must be a number above 0 and at most 1, got 2`, or null.
 */
export function settingProblem(name: string, domain: SettingDomain, value: unknown): string | null {
  if (inDomain(domain, value)) return null;
  return `${name} must be ${domainWords(domain)}, got ${shownValue(value)}`;
}

/** A value as a refusal quotes it. */
export function shownValue(value: unknown): string {
  if (typeof value === 'string') return `"${value}"`;
  if (typeof value === 'number') return String(value);
  try {
    return JSON.stringify(value) ?? String(value);
  } catch {
    return String(value);
  }
}

/**
 * The known name closest to a misspelt one (Levenshtein distance, case-insensitive), or null
 * when none is near (more than a third of the letters differ).
 * @param name the unknown name.
 * @param known the names it may have meant.
 * @returns the closest known name, or null.
 * References: Levenshtein 1966, "Binary codes capable of correcting deletions, insertions, and reversals".
 */
export function closestName(name: string, known: readonly string[]): string | null {
  let best: string | null = null;
  let bestDistance = Infinity;
  for (const candidate of known) {
    const distance = editDistance(name.toLowerCase(), candidate.toLowerCase());
    if (distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  return best !== null && bestDistance <= Math.max(2, Math.ceil(name.length / 3)) ? best : null;
}

function editDistance(a: string, b: string): number {
  let previous = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i += 1) {
    const current = [i];
    for (let j = 1; j <= b.length; j += 1) {
      current[j] = Math.min(previous[j] + 1, current[j - 1] + 1, previous[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    previous = current;
  }
  return previous[b.length];
}

/**
 * The sentence that refuses an unknown setting, naming the closest known one.
 * @param name the unknown key.
 * @param known the known names.
 * @param what what the names are, e.g. "an audit setting".
 * @returns e.g. `"strongPairThresold" is not an audit setting; did you mean "strongPairThreshold"?`
 */
export function unknownSettingSentence(name: string, known: readonly string[], what: string): string {
  const near = closestName(name, known);
  return `"${name}" is not ${what}; ${near === null ? `the settings are ${known.join(', ')}` : `did you mean "${near}"?`}`;
}

/** Bands of weighted topological overlap (Christensen, Garrido & Golino 2023): small-to-moderate from .20, moderate-to-large from .25, large from .30. Reported beside each pair. */
export const WTO_BANDS = Object.freeze({ small: 0.2, moderate: 0.25, large: 0.3 });

/**
 * Weights of the keeper score (see `keeperScore` in recommend-cuts.ts): how much one unit of
 * missing rate, of share of answers at the scale's ends, and of log VIF count against one unit
 * of item-rest correlation. House figures, stated in docs/decisions/003.
 */
export const KEEPER_SCORE_WEIGHTS = Object.freeze({
  fit: 1,
  missingRate: 1,
  extremeShare: 0.5,
  logVif: 0.05,
});

/**
 * Two keeper scores closer than this are a tie (broken by missing rate, then items[] order), so
 * rounding in a repaired matrix cannot pick between two identical columns.
 */
export const KEEPER_SCORE_TIE = 1e-6;

/**
 * Merges defaults with what the caller sets and checks every value against its rule in
 * `ENGINE_SETTING_RULES` (the same rules the audit's request schema is generated from).
 * @param overrides Any subset of the settings.
 * @throws {RangeError} naming the setting when a key is not an engine setting (with the closest
 *   known name) or a value lies outside its domain (e.g. a threshold outside (0, 1], a
 *   non-integer count, an unknown method).
 * @returns Complete, frozen settings, keys in the order of `ENGINE_SETTING_RULES`.
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics" (condition index 30, proportion
 * 0.5); Nunnally 1978, "Psychometric Theory" (alpha 0.70).
 */
export function resolveEngineSettings(overrides: Partial<EngineSettings> = {}): EngineSettings {
  const fail = (condition: string): never => {
    throw new RangeError(`resolveEngineSettings: ${condition}`);
  };
  for (const key of Object.keys(overrides)) {
    if (!Object.hasOwn(ENGINE_SETTING_RULES, key)) fail(unknownSettingSentence(key, ENGINE_SETTING_NAMES, 'an engine setting'));
  }
  const settings: Record<string, unknown> = {};
  for (const name of ENGINE_SETTING_NAMES) {
    const given = (overrides as Record<string, unknown>)[name];
    const value = given === undefined ? ENGINE_SETTING_RULES[name].default : given;
    const problem = settingProblem(name, ENGINE_SETTING_RULES[name].domain, value);
    if (problem !== null) fail(problem);
    settings[name] = value;
  }
  return Object.freeze(settings) as unknown as EngineSettings;
}
