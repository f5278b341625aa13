/**
 * The audit settings table: one descriptor per setting an audit takes (name, the label a reader
 * sees, unit, type, range, default, the published source of the default or "house figure", a
 * help sentence, its command-line flag and its place in the form). Everything else is generated
 * from it: the strict request schema of the API and the command line (settings-schema.ts), the
 * command line's flags and `--settings FILE.json` (src/cli/audit.ts), the form's fields
 * (src/components/audits/AuditLauncher.tsx) and the resolution to the one stored shape
 * (`resolveAuditSettings`) that is stored with an audit, hashed for reuse and echoed unchanged in
 * the audit JSON's `settings`. The engine's settings take their range, default and source from
 * the engine's own rules (`ENGINE_SETTING_RULES`, which `resolveEngineSettings` checks), so the
 * engine checks exactly what this table admits; this table adds the words and the settings of
 * the audit around the engine (outcome, locked items, parallel analysis, test faults).
 *
 * Pure (no zod, server or DOM imports): the form's island imports it.
 * docs/decisions/006-settings-table-and-words.md.
 */
import {
  ENGINE_SETTING_NAMES,
  ENGINE_SETTING_RULES,
  closestName,
  domainWords,
  inDomain,
  settingProblem,
  shownValue,
  type EngineSettings,
  type SettingDomain,
} from '../engine/engine-settings';

/** Faults a test server (PAREDOWN_MODE=test) may inject into an audit, to test failure handling. */
export const testFaults = ['throw', 'crash'] as const;
export type TestFault = (typeof testFaults)[number];

/** Random data sets of parallel analysis when the settings do not say. */
export const DEFAULT_PARALLEL_ITERATIONS = 100;

/** The most bootstrap resamples one audit may ask for (about 10 minutes of polychoric work here). */
export const MAX_BOOTSTRAP = ENGINE_SETTING_RULES.bootstrap.domain.kind === 'number' ? ENGINE_SETTING_RULES.bootstrap.domain.max : 0;

/** The range of a setting: the engine's domains, plus an optional column name and a list of item ids. */
export type AuditSettingDomain =
  | SettingDomain
  | { readonly kind: 'text'; readonly maxLength: number; readonly nullable: true }
  | { readonly kind: 'list'; readonly maxItems: number; readonly maxLength: number };

/** Where a setting sits in the audit form; null: not a field of its own (the locked items are a checklist). */
export interface FormPlacement {
  readonly group: 'data' | 'overlap' | 'constraints' | 'more';
  /** The input's step. */
  readonly step?: string;
  /** Shown and typed as a percentage; stored as a share. */
  readonly percent?: boolean;
  /** Words for each choice of a `choice` setting. */
  readonly choices?: Readonly<Record<string, string>>;
}

/** One audit setting. */
export interface SettingDescriptor {
  readonly name: keyof StoredAuditSettings;
  /** What a reader sees beside the value. */
  readonly label: string;
  /** The unit of the value, or null when it has none. */
  readonly unit: string | null;
  readonly domain: AuditSettingDomain;
  /** The value when nobody sets one (undefined only for `testFault`, which is absent unless set). */
  readonly default: unknown;
  /** The published source of the default, "house figure" (Paredown's own choice) or "common practice". */
  readonly source: string;
  /** One sentence saying what the setting does. */
  readonly help: string;
  /** The command-line flag (without `--`); null when the command line does not take it. */
  readonly flag: string | null;
  /** Its field in the audit form; null when the form has none. */
  readonly form: FormPlacement | null;
  /** Accepted only by a test server. */
  readonly testOnly?: boolean;
}

/** The one stored shape of an audit's settings: what is stored, hashed for reuse and echoed in the audit JSON. */
export interface StoredAuditSettings extends EngineSettings {
  /** Outcome column id, or null for no outcome model. */
  readonly outcome: string | null;
  /** Item ids the designer locked, sorted, without repeats. */
  readonly locked: readonly string[];
  /** Item ids the driver model uses as predictors, sorted, without repeats; empty: every item of the correlation matrix. */
  readonly predictors: readonly string[];
  /** Random data sets of parallel analysis. */
  readonly parallelIterations: number;
  /** Test servers only: a fault to inject. Absent otherwise. */
  readonly testFault?: TestFault;
}

/** Complete settings of one audit (the stored shape). */
export type ResolvedAuditSettings = StoredAuditSettings;

/** What a request (API body, `--settings` file, flags) may name: any subset of the settings. */
export type AuditSettingsRequest = Partial<StoredAuditSettings>;

/** The words, unit, flag and form field of each engine setting (its range, default and source are the engine's). */
const ENGINE_SETTING_WORDS: { readonly [Key in keyof EngineSettings]: Omit<SettingDescriptor, 'name' | 'domain' | 'default' | 'source'> } = {
  method: {
    label: 'Correlation',
    unit: null,
    help: 'The correlation family of the item matrix; polychoric suits ordinal answers and takes longer.',
    flag: 'method',
    form: { group: 'data', choices: { pearson: 'Pearson', spearman: 'Spearman (ranks)', polychoric: 'Polychoric' } },
  },
  missing: {
    label: 'Missing answers',
    unit: null,
    help: 'How missing answers are handled for everything computed from pairs of items; pairwise keeps the most answers.',
    flag: 'missing',
    form: { group: 'data', choices: { pairwise: 'Pairwise deletion', listwise: 'Listwise deletion' } },
  },
  strongPairThreshold: {
    label: 'Strong pair, |r| at least',
    unit: '|r|',
    help: 'Two items whose correlation (after reverse-keying) reaches this are a strong pair.',
    flag: 'strong-pair-threshold',
    form: { group: 'overlap', step: '0.01' },
  },
  conditionIndexThreshold: {
    label: 'Near-dependency: condition index at least',
    unit: null,
    help: 'A dimension with a condition index at or above this can be a near-dependency (Belsley, Kuh & Welsch).',
    flag: 'condition-index-threshold',
    form: { group: 'overlap', step: '1' },
  },
  varianceProportionThreshold: {
    label: '…with variance proportions at least',
    unit: 'share',
    help: 'A near-dependency needs two or more items taking this share of their coefficient variance from it.',
    flag: 'variance-proportion-threshold',
    form: { group: 'overlap', step: '0.05' },
  },
  dependencyVifThreshold: {
    label: 'Near-dependency item: VIF at least',
    unit: 'VIF',
    help: 'An item of a near-dependency counts only when its VIF reaches this (or is infinite).',
    flag: 'dependency-vif-threshold',
    form: { group: 'more', step: '0.5' },
  },
  mergeCorrelation: {
    label: 'Merge when |r| with the keeper at least',
    unit: '|r|',
    help: 'A removed item is merged into the keeper when their correlation reaches this.',
    flag: 'merge-correlation',
    form: { group: 'more', step: '0.01' },
  },
  mergeWordingSimilarity: {
    label: 'Merge when wording similarity at least',
    unit: 'similarity',
    help: 'A removed item is merged into the keeper when their wording similarity reaches this.',
    flag: 'merge-wording-similarity',
    form: { group: 'more', step: '0.01' },
  },
  rewordWordingSimilarity: {
    label: 'Reword when wording similarity below',
    unit: 'similarity',
    help: 'An overlapping item whose wording differs this much from the keeper is sent for rewording, not cut.',
    flag: 'reword-wording-similarity',
    form: { group: 'more', step: '0.01' },
  },
  minItemsPerScale: {
    label: 'Items per scale, at least',
    unit: 'items',
    help: 'No scale is cut below this many items.',
    flag: 'min-items-per-scale',
    form: { group: 'constraints', step: '1' },
  },
  alphaFloor: {
    label: 'Scale alpha, at least',
    unit: 'alpha',
    help: "No scale's alpha may end below this after the cut.",
    flag: 'alpha-floor',
    form: { group: 'constraints', step: '0.01' },
  },
  maxAlphaDrop: {
    label: 'Alpha may drop by at most',
    unit: 'alpha',
    help: "No scale's alpha may fall by more than this from its value before the cut.",
    flag: 'max-alpha-drop',
    form: { group: 'constraints', step: '0.01' },
  },
  maxCutShare: {
    label: 'Items cut, at most',
    unit: 'share',
    help: 'At most this share of the usable items may be dropped or merged.',
    flag: 'max-cut-share',
    form: { group: 'constraints', step: '1', percent: true },
  },
  secondsPerItem: {
    label: 'Answering time per item, seconds',
    unit: 'seconds',
    help: 'The time one rating item takes to answer, for the minutes a cut saves.',
    flag: 'seconds-per-item',
    form: { group: 'constraints', step: '0.5' },
  },
  bootstrap: {
    label: 'Resamples',
    unit: 'resamples',
    help: 'Bootstrap resamples of respondents for the stability of each recommendation; 0 skips the check.',
    flag: 'bootstrap',
    form: { group: 'overlap', step: '1' },
  },
  seed: {
    label: 'Seed',
    unit: null,
    help: 'The seed of the random generator behind the bootstrap and parallel analysis: the same seed repeats the audit exactly.',
    flag: 'seed',
    form: { group: 'overlap', step: '1' },
  },
  stabilityThreshold: {
    label: 'Stable when made in at least',
    unit: 'share',
    help: 'A recommendation made in fewer than this share of resamples is marked unstable.',
    flag: 'stability-threshold',
    form: { group: 'overlap', step: '1', percent: true },
  },
  confidenceLevel: {
    label: 'Interval coverage',
    unit: 'share',
    help: 'The coverage of the interval shown beside each pair correlation.',
    flag: 'confidence-level',
    form: { group: 'more', step: '1', percent: true },
  },  residualRelativeThreshold: {
    label: 'Relative residual rule',
    unit: 'share',
    help: 'A pair\'s residual correlation minus its scale\'s mean residual above this is locally dependent when no bootstrap critical value is available.',
    flag: 'residual-relative-threshold',
    form: { group: 'more', step: '0.01' },
  },
  residualStatistic: {
    label: 'Residual statistic',
    unit: null,
    help: 'Raw residual correlation or Q3 (the residual divided by both uniquenesses).',
    flag: 'residual-statistic',
    form: { group: 'more', choices: { residual: 'Raw residual', q3: 'Q3' } },
  },
  residualBootstrapDraws: {
    label: 'Residual bootstrap draws',
    unit: null,
    help: 'Simulated data sets behind each scale\'s critical value for the relative residual: 0 uses the fixed rule; otherwise at least 20, which a percentile needs.',
    flag: 'residual-bootstrap-draws',
    form: { group: 'more', step: '1' },
  },
  residualCriticalQuantile: {
    label: 'Residual critical quantile',
    unit: 'share',
    help: 'Quantile of the simulated largest relative residual taken as the critical value.',
    flag: 'residual-critical-quantile',
    form: { group: 'more', step: '0.01' },
  },
  residualAboutZeroShare: {
    label: 'Residual about zero',
    unit: 'share',
    help: 'Kept for stored settings; the modification index now decides whether a wTO flag counts.',
    flag: 'residual-about-zero-share',
    form: { group: 'more', step: '0.01' },
  },
  modificationIndexAlpha: {
    label: 'Modification index level',
    unit: 'share',
    help: "Share of false alarms allowed per scale for the modification index of a pair's residual covariance (split over the scale's pairs).",
    flag: 'modification-index-alpha',
    form: { group: 'more', step: '0.001' },
  },
  modificationIndexNetworkAlpha: {
    label: 'Modification index level with the network',
    unit: 'share',
    help: 'The looser share of false alarms per scale for a pair the partial-correlation network also links (wTO at or above its threshold).',
    flag: 'modification-index-network-alpha',
    form: { group: 'more', step: '0.01' },
  },
  modificationIndexMinSepc: {
    label: 'Smallest expected residual correlation',
    unit: 'share',
    help: 'A pair is flagged by its modification index only when the residual correlation it would take is at least this large.',
    flag: 'modification-index-min-sepc',
    form: { group: 'more', step: '0.01' },
  },
  wtoThreshold: {
    label: 'wTO threshold',
    unit: 'share',
    help: 'Weighted topological overlap at or above this flags a pair when its modification index also passes the looser level.',
    flag: 'wto-threshold',
    form: { group: 'more', step: '0.01' },
  },
  ebicGamma: {
    label: 'EBIC gamma',
    unit: 'share',
    help: 'Gamma of the extended BIC that chooses the graphical-lasso penalty.',
    flag: 'ebic-gamma',
    form: { group: 'more', step: '0.1' },
  },
  ebicPenaltyCount: {
    label: 'EBIC penalties',
    unit: null,
    help: 'Penalties on the graphical-lasso path the extended BIC chooses from.',
    flag: 'ebic-penalty-count',
    form: { group: 'more', step: '1' },
  },
  interceptDominanceThreshold: {
    label: 'Intercept dominance',
    unit: 'share',
    help: 'A near-dependency on which the intercept takes at least this share of its variance is an item-mean effect and forms no cluster.',
    flag: 'intercept-dominance-threshold',
    form: { group: 'more', step: '0.05' },
  },
};

/** The table: every audit setting, in the order they are stored and echoed. */
export const AUDIT_SETTINGS: readonly SettingDescriptor[] = Object.freeze([
  ...ENGINE_SETTING_NAMES.map(
    (name): SettingDescriptor => ({
      name,
      domain: ENGINE_SETTING_RULES[name].domain,
      default: ENGINE_SETTING_RULES[name].default,
      source: ENGINE_SETTING_RULES[name].source,
      ...ENGINE_SETTING_WORDS[name],
    }),
  ),
  {
    name: 'outcome',
    label: 'Outcome for the driver model',
    unit: null,
    domain: { kind: 'text', maxLength: 200, nullable: true },
    default: null,
    source: 'common practice (no outcome model unless one is named)',
    help: 'The outcome column the items are modelled against (OLS and relative weights); none by default.',
    flag: 'outcome',
    form: null,
  },
  {
    name: 'locked',
    label: 'Locked items',
    unit: 'item ids',
    domain: { kind: 'list', maxItems: 5_000, maxLength: 200 },
    default: [],
    source: "the study's locked items",
    help: 'Trend, mandated or licensed items: the audit still measures them but never proposes them for cutting or rewording.',
    flag: 'locked',
    form: null,
  },
  {
    name: 'predictors',
    label: 'Predictors of the driver model',
    unit: 'item ids',
    domain: { kind: 'list', maxItems: 5_000, maxLength: 200 },
    default: [],
    source: 'common practice (a driver model uses every item unless the designer names a set)',
    help: 'The items the driver model explains the outcome with; none named means every item in the correlation matrix.',
    flag: 'predictors',
    form: null,
  },
  {
    name: 'parallelIterations',
    label: 'Parallel analysis data sets',
    unit: 'data sets',
    domain: { kind: 'number', min: 10, max: 1_000, integer: true },
    default: DEFAULT_PARALLEL_ITERATIONS,
    source: 'house figure (Horn 1965, "A rationale and test for the number of factors in factor analysis", names none)',
    help: 'Random data sets whose eigenvalues parallel analysis compares with the observed ones.',
    flag: 'parallel-iterations',
    form: { group: 'more', step: '10' },
  },
  {
    name: 'testFault',
    label: 'Injected fault',
    unit: null,
    domain: { kind: 'choice', choices: testFaults },
    default: undefined,
    source: 'test servers only',
    help: 'A fault a test server injects into the audit, to test failure handling.',
    flag: null,
    form: null,
    testOnly: true,
  },
]);

/** Every setting's name, in the stored order. */
export const AUDIT_SETTING_NAMES: readonly string[] = Object.freeze(AUDIT_SETTINGS.map((setting) => setting.name));

const byName = new Map(AUDIT_SETTINGS.map((setting) => [setting.name as string, setting]));

/**
 * The descriptor of one setting.
 * @param name the setting's name.
 * @returns its descriptor, or undefined for a name that is not a setting.
 */
export function settingDescriptor(name: string): SettingDescriptor | undefined {
  return byName.get(name);
}

/** The range of a descriptor in words, e.g. "a number above 0 and at most 1". */
export function rangeWords(domain: AuditSettingDomain): string {
  if (domain.kind === 'text') return `a column name of 1 to ${domain.maxLength} characters, or null`;
  if (domain.kind === 'list') return `a list of at most ${domain.maxItems} item ids of 1 to ${domain.maxLength} characters each`;
  return domainWords(domain);
}

function valueProblem(name: string, domain: AuditSettingDomain, value: unknown): string | null {
  if (domain.kind === 'choice' || domain.kind === 'number') return settingProblem(name, domain, value);
  const fits =
    domain.kind === 'text'
      ? value === null || (typeof value === 'string' && value.length >= 1 && value.length <= domain.maxLength)
      : Array.isArray(value) &&
        value.length <= domain.maxItems &&
        value.every((entry) => typeof entry === 'string' && entry.length >= 1 && entry.length <= domain.maxLength);
  return fits ? null : `${name} must be ${rangeWords(domain)}, got ${shownValue(value)}`;
}

/**
 * The setting's value of a number typed into the audit form: a percentage field's per cent as a
 * share (to a tenth of a per cent), any other field's number as typed.
 * @param descriptor the field's setting.
 * @param typed the text as typed (not empty).
 * @returns the value the request carries.
 */
export function formFieldValue(descriptor: SettingDescriptor, typed: string): number {
  const value = Number(typed.trim());
  return descriptor.form?.percent === true ? Math.round(value * 10) / 1000 : value;
}

/**
 * What is wrong with a number typed into the audit form, in the form's own words: the field's
 * label and its range in the units the field shows (per cent for a percentage field), so that the
 * form can say so before anything is sent (the server's refusal names the API's key instead).
 * @param descriptor the field's setting (a number setting with a form placement).
 * @param typed the text as typed.
 * @returns one sentence, or null when the value is in the setting's range (or the field is empty).
 */
export function formFieldProblem(descriptor: SettingDescriptor, typed: string): string | null {
  const domain = descriptor.domain;
  const text = typed.trim();
  if (domain.kind !== 'number' || text === '') return null;
  const percent = descriptor.form?.percent === true;
  if (inDomain(domain, formFieldValue(descriptor, text))) return null;
  const scale = percent ? 100 : 1;
  const shownDomain: SettingDomain = {
    ...domain,
    min: domain.min * scale,
    max: domain.max * scale,
    ...(domain.off === undefined ? {} : { off: domain.off * scale }),
  };
  return `${descriptor.label}: enter ${domainWords(shownDomain)}${percent ? ' per cent' : ''} (you entered ${text}).`;
}

/** How a refusal names a setting: by its JSON key (API, `--settings`) or by its flag. */
export type SettingSpelling = 'key' | 'flag';

/**
 * Everything wrong with a request's settings, one sentence each: a value that is not one object,
 * an unknown key (naming the closest known one), a value outside its range.
 * @param value the request's settings (anything JSON can hold).
 * @param spelling name settings by their key (default) or by their command-line flag.
 * @returns the sentences, empty when the settings are acceptable.
 */
export function auditSettingsProblems(value: unknown, spelling: SettingSpelling = 'key'): string[] {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    return [`The settings must be one JSON object of audit settings (e.g. {"bootstrap": 200}), got ${shownValue(value)}.`];
  }
  const problems: string[] = [];
  for (const [key, entry] of Object.entries(value)) {
    const descriptor = byName.get(key);
    if (descriptor === undefined) {
      const near = closestName(key, AUDIT_SETTING_NAMES);
      problems.push(`"${key}" is not an audit setting; ${near === null ? `the settings are ${AUDIT_SETTINGS.filter((setting) => !setting.testOnly).map((setting) => setting.name).join(', ')}.` : `did you mean "${near}"?`}`);
      continue;
    }
    if (entry === undefined) continue;
    const name = spelling === 'flag' && descriptor.flag !== null ? `--${descriptor.flag}` : key;
    const problem = valueProblem(name, descriptor.domain, entry);
    if (problem !== null) problems.push(`${problem}.`);
  }
  return problems;
}

/** Settings refused by `resolveAuditSettings`: one sentence per problem, the first as the message. */
export class AuditSettingsError extends RangeError {
  readonly problems: readonly string[];
  constructor(problems: readonly string[]) {
    super(problems[0]);
    this.name = 'AuditSettingsError';
    this.problems = problems;
  }
}

/**
 * Resolves a request's settings to the one stored shape: what the request sets, else what the
 * base sets (a study's constraints and locked items), else the table's default; the locked items
 * sorted without repeats; `testFault` only when set. Every value is checked against the table.
 * @param request the settings a request names (API body, `--settings` file and flags).
 * @param base settings that stand in for the defaults (e.g. the study's), checked alike.
 * @param options `allowTestFaults`: whether `testFault` is accepted (test servers, and the audit
 *   run that echoes stored settings).
 * @throws {AuditSettingsError} naming the first problem (unknown key, value out of range,
 *   `testFault` where it is not accepted).
 * @returns complete, frozen settings in the stored key order.
 * References: docs/decisions/003-redundancy-engine.md (defaults and house figures), 006 (the table).
 */
export function resolveAuditSettings(
  request: AuditSettingsRequest,
  base: AuditSettingsRequest = {},
  options: { allowTestFaults: boolean } = { allowTestFaults: false },
): ResolvedAuditSettings {
  const problems = [...auditSettingsProblems(request), ...auditSettingsProblems(base)];
  if (request.testFault !== undefined && !options.allowTestFaults) problems.push('testFault is only accepted by a test server.');
  if (problems.length > 0) throw new AuditSettingsError(problems);
  const resolved: Record<string, unknown> = {};
  for (const setting of AUDIT_SETTINGS) {
    const given = (request as Record<string, unknown>)[setting.name];
    const fallback = (base as Record<string, unknown>)[setting.name];
    const value = given !== undefined ? given : fallback !== undefined ? fallback : setting.default;
    if (value === undefined) continue;
    resolved[setting.name] = setting.domain.kind === 'list' ? Object.freeze([...new Set(value as string[])].sort()) : value;
  }
  return Object.freeze(resolved) as unknown as ResolvedAuditSettings;
}

/**
 * The engine's part of resolved settings (what `resolveEngineSettings` and the engine read).
 * @param settings resolved audit settings.
 * @returns the engine settings alone, in the engine's order.
 */
export function engineSettingsOf(settings: StoredAuditSettings): EngineSettings {
  return Object.freeze(Object.fromEntries(ENGINE_SETTING_NAMES.map((name) => [name, settings[name]]))) as unknown as EngineSettings;
}

/** The table's defaults in the stored shape (no study, no outcome, nothing locked). */
export const DEFAULT_AUDIT_SETTINGS: ResolvedAuditSettings = resolveAuditSettings({});

/**
 * A request from command-line flag values: each setting's flag, its text read by the setting's
 * type (numbers as numbers, the locked items as a comma-separated list). Text that is not a number
 * stays text, so the check refuses it by name.
 * @param values flag name (without `--`) → the text given; flags not given are absent or undefined.
 * @returns the request the flags make.
 */
export function requestFromFlags(values: Readonly<Record<string, string | undefined>>): AuditSettingsRequest {
  const request: Record<string, unknown> = {};
  for (const setting of AUDIT_SETTINGS) {
    if (setting.flag === null) continue;
    const text = values[setting.flag];
    if (text === undefined) continue;
    if (setting.domain.kind === 'number') request[setting.name] = /^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$/.test(text) ? Number(text) : text;
    else if (setting.domain.kind === 'list') request[setting.name] = text.split(',').map((id) => id.trim()).filter(Boolean);
    else request[setting.name] = text;
  }
  return request as AuditSettingsRequest;
}
