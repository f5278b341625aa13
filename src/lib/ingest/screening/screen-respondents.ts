/**
 * Respondent screening before item statistics (methods.md §6): straightlining (long-string
 * index and within-person SD), speeders, and respondents missing most items. Each flag comes
 * with its count; the union is proposed for exclusion and the designer accepts or changes it.
 */
import { selectItems, type ItemMatrix } from '../../stats/types';
import { reverseScore } from '../recode-item';
import { itemTypeOf } from '../propose-setup';
import type { BuiltWave, ItemType } from '../types';
import { longStringIndex } from './long-string-index';
import { missingShare } from './missing-share';
import { speedCheck } from './speeders';
import { withinPersonSd } from './within-person-sd';

/** Screening settings; every default is common practice, not a published cut-off. */
export interface ScreeningOptions {
  /** Long string flagged at a run of at least this share of the items (default 0.5). */
  readonly longStringShare: number;
  /** ... and at least this many items (default 5), so short questionnaires are not over-flagged. */
  readonly longStringMinimum: number;
  /** Within-person SD at or below this is flagged (default 0: one answer throughout). */
  readonly withinSdMaximum: number;
  /** Within-person SD is only judged with at least this many answered items (default 3). */
  readonly withinSdMinimumAnswers: number;
  /** Speeders: completion time below this share of the median (default 1/3). */
  readonly speederShare: number;
  /** Mostly missing: share of items without a valid answer above this (default 0.5). */
  readonly missingShareAbove: number;
}

/** The defaults of {@link ScreeningOptions} (common practice). */
export const DEFAULT_SCREENING_OPTIONS: ScreeningOptions = Object.freeze({
  longStringShare: 0.5,
  longStringMinimum: 5,
  withinSdMaximum: 0,
  withinSdMinimumAnswers: 3,
  speederShare: 1 / 3,
  missingShareAbove: 0.5,
});

/** One screening flag with the respondents it marks. */
export interface ScreeningFlag {
  readonly code: 'long-string' | 'low-variability' | 'speeder' | 'mostly-missing';
  /** The cut-off applied (run length in items, SD, seconds, or share). */
  readonly threshold: number;
  readonly count: number;
  /** 0-based respondent rows. */
  readonly respondents: readonly number[];
  /** One plain sentence. */
  readonly message: string;
}

/** A screening rule and whether it was applied, with the reason when it was not. */
export interface ScreeningRule {
  readonly code: ScreeningFlag['code'];
  readonly applied: boolean;
  /** Items the rule looked at (long string and within-person SD: the rating-grid items only). */
  readonly items: number;
  /** One plain sentence: what the rule looks at, or why it was not applied. */
  readonly note: string;
}

/** The screening of a wave. Per-respondent arrays are plain (JSON-ready), null where not computable. */
export interface ScreeningResult {
  readonly respondents: number;
  /** How many items of each type the wave holds (from the setup, else from the range: 0/1 dichotomous). */
  readonly itemTypes: Readonly<Record<ItemType, number>>;
  /** Every rule, applied or not, with the reason. */
  readonly rules: readonly ScreeningRule[];
  readonly options: ScreeningOptions;
  readonly longString: readonly number[];
  readonly withinSd: readonly (number | null)[];
  readonly missingShare: readonly number[];
  /** Completion time in seconds, null when unknown. */
  readonly duration: readonly (number | null)[] | null;
  readonly medianDuration: number | null;
  readonly flags: readonly ScreeningFlag[];
  /** Union of the flagged rows, sorted: the proposal the designer accepts or changes. */
  readonly proposedExclusions: readonly number[];
}

function checkOptions(options: ScreeningOptions): void {
  const inUnit = (name: keyof ScreeningOptions, value: number, lowOpen: boolean) => {
    if (!(lowOpen ? value > 0 : value >= 0) || !(value <= 1)) throw new RangeError(`screenRespondents: ${name} must be in ${lowOpen ? '(0' : '[0'}, 1], got ${value}`);
  };
  inUnit('longStringShare', options.longStringShare, true);
  inUnit('speederShare', options.speederShare, true);
  inUnit('missingShareAbove', options.missingShareAbove, false);
  if (!Number.isInteger(options.longStringMinimum) || options.longStringMinimum < 2) throw new RangeError(`screenRespondents: longStringMinimum must be a whole number of 2 or more, got ${options.longStringMinimum}`);
  if (!Number.isInteger(options.withinSdMinimumAnswers) || options.withinSdMinimumAnswers < 2) throw new RangeError(`screenRespondents: withinSdMinimumAnswers must be a whole number of 2 or more, got ${options.withinSdMinimumAnswers}`);
  if (!(options.withinSdMaximum >= 0)) throw new RangeError(`screenRespondents: withinSdMaximum must be 0 or more, got ${options.withinSdMaximum}`);
}

/**
 * The answers as given: the recoded matrix with reverse-keyed items flipped back, so a
 * respondent who ticked the same box throughout shows one value throughout.
 * @param wave a built wave.
 * @returns a new matrix; missing stays NaN.
 * References: Paredown methods.md §1 (reverse scoring x' = (min + max) − x, undone here).
 */
export function answersAsGiven(wave: Pick<BuiltWave, 'matrix' | 'items'>): ItemMatrix {
  const { rows, columns } = wave.matrix;
  const data = Float64Array.from(wave.matrix.data);
  wave.items.forEach((item, k) => {
    if (!item.reverse) return;
    for (let i = 0; i < rows; i++) {
      const index = k * rows + i;
      if (!Number.isNaN(data[index])) data[index] = reverseScore(data[index], item.min, item.max);
    }
  });
  return { rows, columns, data };
}

/**
 * Screens the respondents of a wave.
 * @param wave a built wave (its items in questionnaire order, its durations if any).
 * @param options any of {@link ScreeningOptions}; the rest take the defaults.
 * @throws {RangeError} when an option is outside its range (a programming or configuration error).
 * @returns per-respondent indices, the flags with counts, the rules applied (long string and
 *   within-person SD on rating-grid items only) and the proposed exclusions. `longString` and
 *   `withinSd` are computed over the rating-grid items (0 / null without any).
 * References: Johnson 2005, J. Research in Personality 39:103-129 (long-string index); Dunn, Heggestad,
 *   Shanock & Theilgard 2018, J. Business and Psychology 33:105-121 (within-person SD); Paredown methods.md §6.
 */
export function screenRespondents(wave: Pick<BuiltWave, 'matrix' | 'items' | 'duration' | 'respondents'>, options: Partial<ScreeningOptions> = {}): ScreeningResult {
  const settings: ScreeningOptions = { ...DEFAULT_SCREENING_OPTIONS, ...options };
  checkOptions(settings);
  // Without a reverse-keyed item the answers as given are the recoded matrix itself, read only
  // here: no copy of it is made (on a large wave it is hundreds of megabytes).
  const allAnswers = wave.items.some((item) => item.reverse) ? answersAsGiven(wave) : wave.matrix;
  const types = wave.items.map(itemTypeOf);
  const itemTypes: Record<ItemType, number> = { rating: 0, scored: 0, dichotomous: 0 };
  for (const type of types) itemTypes[type]++;
  // Long strings and a within-person SD of 0 mean careless answering only on a rating grid; on a
  // scored test a run of right answers is what the best performers give, and a checklist's 0/1
  // runs say nothing about effort. These two rules therefore look at the rating items only.
  const gridColumns = types.flatMap((type, k) => (type === 'rating' ? [k] : []));
  const answers = gridColumns.length === allAnswers.columns ? allAnswers : selectItems(allAnswers, gridColumns);
  const items = answers.columns;
  const longString = longStringIndex(answers);
  const withinSd = withinPersonSd(answers);
  const missing = missingShare(allAnswers);
  const gridMissing = items === allAnswers.columns ? missing : missingShare(answers);
  const answeredCount = gridMissing.map((share) => Math.round((1 - share) * items));
  const flags: ScreeningFlag[] = [];
  const rules: ScreeningRule[] = [];
  const otherTypes = (Object.keys(itemTypes) as ItemType[]).filter((type) => type !== 'rating' && itemTypes[type] > 0).map((type) => `${itemTypes[type]} ${type}`);
  const gridNote = items === 0
    ? `not applied: the wave has no rating-grid items (${otherTypes.join(', ')}), and a run of identical answers on a scored test or checklist is no sign of careless answering.`
    : otherTypes.length > 0
      ? `applied to the ${items} rating-grid items only (left out: ${otherTypes.join(', ')} items, where identical answers are no sign of careless answering).`
      : `applied to all ${items} items (rating grid).`;

  const runThreshold = Math.max(settings.longStringMinimum, Math.ceil(settings.longStringShare * items));
  const longRows = items === 0 ? [] : longString.flatMap((run, i) => (run >= runThreshold ? [i] : []));
  rules.push({ code: 'long-string', applied: items > 0, items, note: `Long string: ${gridNote}` });
  rules.push({ code: 'low-variability', applied: items > 0, items, note: `Within-person SD: ${gridNote}` });
  if (items > 0) flags.push({
    code: 'long-string', threshold: runThreshold, count: longRows.length, respondents: longRows,
    message: items < runThreshold
      ? `With ${items} items no run can reach ${runThreshold} identical answers, so no one is flagged for a long string.`
      : `${longRows.length} ${longRows.length === 1 ? 'respondent gave' : 'respondents gave'} the same answer to ${runThreshold} or more items in a row.`,
  });

  const lowRows = items === 0 ? [] : withinSd.flatMap((sd, i) => (sd !== null && answeredCount[i] >= settings.withinSdMinimumAnswers && sd <= settings.withinSdMaximum ? [i] : []));
  if (items > 0) flags.push({
    code: 'low-variability', threshold: settings.withinSdMaximum, count: lowRows.length, respondents: lowRows,
    message:
      settings.withinSdMaximum <= 0
        ? `${lowRows.length} ${lowRows.length === 1 ? 'respondent gave' : 'respondents gave'} the same answer to every item they answered (at least ${settings.withinSdMinimumAnswers} answers, no spread at all).`
        : `${lowRows.length} ${lowRows.length === 1 ? 'respondent has' : 'respondents have'} answers spread by a within-person SD of at most ${settings.withinSdMaximum} over at least ${settings.withinSdMinimumAnswers} answers.`,
  });

  let duration: (number | null)[] | null = null;
  let medianDuration: number | null = null;
  if (wave.duration !== null) {
    const speed = speedCheck(wave.duration, settings.speederShare);
    duration = Array.from(wave.duration, (value) => (Number.isFinite(value) ? value : null));
    medianDuration = speed.median;
    rules.push({ code: 'speeder', applied: speed.threshold !== null, items: allAnswers.columns, note: speed.threshold === null ? 'Speeders: not applied, no completion time could be read.' : 'Speeders: applied to the completion time.' });
    flags.push({
      code: 'speeder', threshold: speed.threshold ?? 0, count: speed.speeders.length, respondents: speed.speeders,
      message: speed.threshold === null
        ? 'No completion time could be read, so no one is flagged as a speeder.'
        : `${speed.speeders.length} ${speed.speeders.length === 1 ? 'respondent' : 'respondents'} took less than ${Math.round(speed.threshold)} seconds, under ${(settings.speederShare * 100).toFixed(0)}% of the median ${Math.round(speed.median as number)} seconds.`,
    });
  }

  if (wave.duration === null) rules.push({ code: 'speeder', applied: false, items: allAnswers.columns, note: 'Speeders: not applied, the wave has no completion-time column.' });
  const missingRows = missing.flatMap((share, i) => (share > settings.missingShareAbove ? [i] : []));
  rules.push({ code: 'mostly-missing', applied: true, items: allAnswers.columns, note: `Mostly missing: applied to all ${allAnswers.columns} items.` });
  flags.push({
    code: 'mostly-missing', threshold: settings.missingShareAbove, count: missingRows.length, respondents: missingRows,
    message: `${missingRows.length} ${missingRows.length === 1 ? 'respondent left' : 'respondents left'} more than ${(settings.missingShareAbove * 100).toFixed(0)}% of the items without a valid answer.`,
  });

  const proposed = [...new Set(flags.flatMap((flag) => flag.respondents))].sort((a, b) => a - b);
  return {
    respondents: wave.respondents, itemTypes, rules, options: settings, longString, withinSd, missingShare: missing, duration, medianDuration, flags, proposedExclusions: proposed,
  };
}
