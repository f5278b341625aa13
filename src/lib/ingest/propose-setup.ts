/**
 * Proposes a role for every column of a table, with its reason: item, respondent id, outcome,
 * duration, weight or ignore; and for items the scale, reverse keying, valid range, missing
 * codes, wording and value labels, from the codebook where it has them and guessed where not.
 * Personal data and free text are proposed as ignored and never as items.
 */
import { matchAnswerScales, isMissingAnswerText, type AnswerScaleMatch } from './answer-scales';
import { columnData, columnPersonalData, type ColumnData } from './column-profile';
import { guessAnswerRange } from './guess-answer-range';
import { MAX_ANSWER_LABELS, MODAL_RANGE_SHARE, NUMERIC_MAJORITY, PATTERN_SHARE, RATING_MAX_SPAN } from './ingest-thresholds';
import { looksLikeTimeText, parseDuration } from './parse-duration';
import { recodeCodedCounts } from './recode-item';
import type {
  Codebook, CodebookEntry, ColumnProposal, ColumnRole, DurationUnit, ItemSetup, ItemType, LabelSource, ProposedSetup, ValueLabel, WaveSetup, WaveTable, WaveWarning,
} from './types';
import { WaveRefusal } from './wave-refusal';

/**
 * Header split into lower-case words: `ResponseId` → `response id`, `time_taken` → `time taken`.
 * @param header a column header.
 * @returns lower-case words separated by single spaces.
 * References: none published; naming conventions of survey exports.
 */
export function headerWords(header: string): string {
  return header
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .toLowerCase()
    .replace(/[_\-.:/()[\]]+/g, ' ')
    .replace(/\s+/g, ' ')
    .trim();
}

const ID_HEADER = /^(id|uuid|guid|pid|rid|serial|serial (no|number)|(respondent|resp|response|participant|case|record|interview|panelist|panel member|member|subject|user) ?(id|no|nr|number|code)?)$/;
const DURATION_HEADER = /\b(duration|durations|time taken|elapsed|completion time|time to complete|length of interview|loi|seconds|secs|minutes|mins|response time|time spent|interview time)\b/;
const TIMESTAMP_HEADER = /\b(date|time ?stamp|timestamp|start|end|started|ended|finished|submitted|start time|end time|recorded)\b/;
const WEIGHT_HEADER = /\b(weight|weights|wgt|wt|weighting|gewicht|poids|peso|ponderacion|ponderación)\b/;
const OUTCOME_HEADER = /\b(outcome|dependent|dv|criterion|target|overall|nps|net promoter|recommend|ltr)\b/;
const REVERSE_SUFFIX = /(?:[_\-. ](?:r|rev|reversed|inv)|\(r\))$/i;
/** Ranges assumed for a constant item when no other item shows one: the smallest common rating scale holding its value. */
const COMMON_RANGES: readonly (readonly [number, number])[] = [[1, 5], [1, 7], [0, 10]];
const DATE_VALUE = /^(\d{4}-\d{2}-\d{2}|\d{1,2}[./]\d{1,2}[./]\d{2,4})([ T]\d{1,2}:\d{2}(:\d{2})?.*)?$/;

interface Draft {
  readonly data: ColumnData;
  role: ColumnRole;
  reason: string;
  item: MutableItem | null;
  durationUnit: DurationUnit | null;
  labelSource: LabelSource | null;
  answerScale: string | null;
  /** Range from the codebook or value labels: never widened. */
  rangeKnown: boolean;
  /** A whole-number column with one value, waiting for a range. */
  constantValue: number | null;
  /** A whole-number column too wide for a rating item, which may still fit the common range. */
  wide: boolean;
  labelCandidates: AnswerScaleMatch[] | null;
  guessedMissing: number[];
  personal: string | null;
  unmappedText: boolean;
  scaleFromCodebook: boolean;
  /** A constant item whose range was assumed. */
  rangeAssumed: boolean;
  /** The codebook lists the column as an item but its values are personal data (never stored). */
  codebookOverruled: boolean;
  /** Item type from the codebook's `type` column. */
  typeFromCodebook: ItemType | null;
}

interface MutableItem {
  id: string;
  scale: string | null;
  reverse: boolean;
  min: number;
  max: number;
  missingCodes: number[];
  text: string | null;
  labels: ValueLabel[];
  missingLabels: string[];
  type?: ItemType;
  facet?: string | null;
}

function list(values: readonly (string | number)[], most = 5): string {
  return values.slice(0, most).join(', ') + (values.length > most ? ', ...' : '');
}

function share(count: number, total: number): number {
  return total === 0 ? 0 : count / total;
}

function newDraft(data: ColumnData): Draft {
  return {
    data, role: 'ignore', reason: '', item: null, durationUnit: null, labelSource: null, answerScale: null,
    rangeKnown: false, constantValue: null, wide: false, labelCandidates: null, guessedMissing: [], personal: null,
    unmappedText: false, scaleFromCodebook: false, rangeAssumed: false, codebookOverruled: false, typeFromCodebook: null,
  };
}

function blankItem(header: string): MutableItem {
  return { id: header, scale: null, reverse: REVERSE_SUFFIX.test(header), min: 0, max: 0, missingCodes: [], text: null, labels: [], missingLabels: [] };
}

function reverseNote(item: MutableItem, fromCodebook: boolean): string {
  return item.reverse && !fromCodebook ? '; its name marks it reverse-keyed' : '';
}

/** Guesses an item from whole numbers, value labels of a built-in scale, or says why not. */
function guessItem(draft: Draft): void {
  const { data } = draft;
  const substantiveTexts = data.texts.filter((text) => !isMissingAnswerText(text));
  const missingTexts = data.texts.filter(isMissingAnswerText);
  const missingSet = new Set(missingTexts);
  const answeredCells = missingSet.size === 0 ? data.profile.nonBlank : data.filled.filter((cell) => !missingSet.has(cell)).length;
  const numericShare = share(data.profile.numeric, answeredCells);
  if (substantiveTexts.length > 0 && numericShare < NUMERIC_MAJORITY) {
    const matches = matchAnswerScales(data.texts);
    if (matches.length > 0) {
      draft.role = 'item';
      draft.labelCandidates = matches;
      return;
    }
    draft.role = 'ignore';
    if (substantiveTexts.length <= MAX_ANSWER_LABELS) {
      draft.unmappedText = true;
      draft.reason = `Text answers (${list(substantiveTexts.map((text) => `"${text}"`), 4)}) are not in the codebook or a known answer scale; add value labels to use it as an item.`;
    } else {
      draft.reason = `Text with ${substantiveTexts.length} different values, not a rating item.`;
    }
    return;
  }
  if (data.profile.numeric === 0) {
    draft.reason = 'Only no-answer texts, no answers.';
    return;
  }
  // The whole numbers are counted in the profile; their range is guessed from the distinct ones.
  if (share(data.profile.wholeNumbers, data.profile.numeric) < PATTERN_SHARE) {
    draft.reason = `Numbers with decimals (${data.profile.minimum} to ${data.profile.maximum}), not a rating item.`;
    return;
  }
  const guess = guessAnswerRange(data.distinctNumbers.filter((value) => Number.isInteger(value)));
  if (guess === null) return;
  const item = blankItem(data.header);
  item.min = guess.min;
  item.max = guess.max;
  item.missingCodes = [...guess.missingCodes];
  item.missingLabels = missingTexts;
  draft.item = item;
  draft.guessedMissing = [...guess.missingCodes];
  const span = guess.max - guess.min;
  if (span === 0) {
    draft.role = 'item';
    draft.constantValue = guess.min;
    return;
  }
  if (span > RATING_MAX_SPAN) {
    draft.role = 'ignore';
    draft.wide = true;
    draft.reason = `Whole numbers from ${guess.min} to ${guess.max} span too wide a range for a rating item; set it as an item if it is a slider or a count.`;
    return;
  }
  draft.role = 'item';
  const codes = guess.missingCodes.length > 0 ? `; ${list(guess.missingCodes)} beyond that ${guess.missingCodes.length === 1 ? 'looks like a missing code' : 'look like missing codes'}` : '';
  draft.reason = `Whole numbers from ${guess.min} to ${guess.max} look like a rating item${codes}${reverseNote(item, false)}.`;
}

/** An item from a codebook row, filling what the row leaves open from the data. */
function itemFromCodebook(draft: Draft, entry: CodebookEntry): void {
  const { data } = draft;
  const item = blankItem(data.header);
  const guessed: string[] = [];
  item.scale = entry.scale;
  if (entry.facet) item.facet = entry.facet;
  draft.scaleFromCodebook = entry.scale !== null;
  item.text = entry.text;
  if (entry.reverse !== null) item.reverse = entry.reverse;
  else if (item.reverse) guessed.push('reverse keying from its name');
  item.labels = entry.labels ? [...entry.labels] : [];
  draft.labelSource = item.labels.length > 0 ? 'codebook' : 'none';
  const labelKeys = new Set(item.labels.map((label) => label.label.trim().toLowerCase()));
  const unlabelledTexts = data.texts.filter((text) => !labelKeys.has(text.toLowerCase()));
  if (item.labels.length === 0 && unlabelledTexts.some((text) => !isMissingAnswerText(text))) {
    const matches = matchAnswerScales(data.texts);
    if (matches.length > 0) {
      item.labels = [...matches[0].labels];
      draft.labelSource = 'answer-scale';
      draft.answerScale = matches[0].scale.name;
      guessed.push(`value labels from the built-in ${matches[0].scale.name} scale`);
    }
  }
  item.missingLabels = unlabelledTexts.filter(isMissingAnswerText);
  const dataGuess = guessAnswerRange(data.distinctNumbers.filter((value) => Number.isInteger(value)));
  if (entry.missingCodes !== null) item.missingCodes = [...entry.missingCodes];
  else if (dataGuess && dataGuess.missingCodes.length > 0 && entry.min === null && entry.max === null && item.labels.length === 0) {
    item.missingCodes = [...dataGuess.missingCodes];
    draft.guessedMissing = [...dataGuess.missingCodes];
    guessed.push(`missing codes ${list(dataGuess.missingCodes)}`);
  }
  const labelCodes = item.labels.map((label) => label.code).filter((code) => !item.missingCodes.includes(code));
  let min = entry.min;
  let max = entry.max;
  draft.rangeKnown = min !== null && max !== null;
  if ((min === null || max === null) && labelCodes.length >= 2) {
    min ??= Math.min(...labelCodes);
    max ??= Math.max(...labelCodes);
    draft.rangeKnown = true;
  }
  if (min === null || max === null) {
    // Every number counts here, decimals too: a codebook item may hold scale scores or slider
    // values such as 3.3333333 (the codebook's word wins over the whole-number guess).
    // The distinct numbers have the smallest and largest of all the numbers.
    const answers = data.distinctNumbers.filter((value) => !item.missingCodes.includes(value));
    if (answers.length > 0) {
      min ??= Math.min(...answers);
      max ??= Math.max(...answers);
      guessed.push('the range from the answers');
    }
  }
  item.min = min ?? 0;
  item.max = max ?? 0;
  draft.typeFromCodebook = entry.type ?? null;
  draft.item = item;
  draft.role = 'item';
  if (item.min >= item.max) {
    draft.constantValue = item.min;
    draft.rangeKnown = false;
  }
  draft.reason = `Listed in the codebook${guessed.length > 0 ? `; ${guessed.join(', ')} guessed` : ''}.`;
}

/** Proposes one column's role (first pass, before ranges are compared across items). */
function classify(draft: Draft, entry: CodebookEntry | undefined, decimalSeparator: '.' | ',', taken: Set<ColumnRole>): void {
  const { data } = draft;
  const words = headerWords(data.header);
  if (data.profile.nonBlank === 0) {
    draft.reason = entry ? 'Listed in the codebook but empty.' : 'The column is empty.';
    return;
  }
  // findPersonalData looks at sampleCells(filled) only, which is the sample the column keeps.
  const personal = columnPersonalData(data.header, data.column, decimalSeparator);
  if (personal && (personal.fromValues || !entry)) {
    // A codebook's word wins over every guess but this one: e-mail addresses, phone numbers and
    // network addresses are never stored as items (buildWave refuses them), so say so loudly.
    draft.codebookOverruled = entry !== undefined;
    draft.personal = personal.what;
    draft.reason = `Looks like personal data (${personal.what}); it is never used as an item.`;
    return;
  }
  if (entry) {
    itemFromCodebook(draft, entry);
    if (entry.scale === null && OUTCOME_HEADER.test(words) && !taken.has('outcome') && draft.constantValue === null) {
      taken.add('outcome');
      draft.role = 'outcome';
      draft.reason = 'Listed in the codebook without a scale and named like an outcome; items are audited as its predictors.';
    }
    return;
  }
  if (ID_HEADER.test(words)) {
    const filled = data.filled;
    const distinct = new Set(filled).size;
    if (!taken.has('respondent-id') && data.profile.blank === 0 && distinct === filled.length) {
      draft.role = 'respondent-id';
      taken.add('respondent-id');
      draft.reason = 'Named like an identifier, and every row has a different value.';
    } else {
      draft.reason = taken.has('respondent-id')
        ? 'Named like an identifier, but another column was taken as the respondent id.'
        : `Named like an identifier, but ${data.profile.blank > 0 ? 'some rows are blank' : 'some values repeat'}.`;
    }
    return;
  }
  const sample = data.filledSample;
  const durationShare = share(sample.filter((cell) => !Number.isNaN(parseDuration(cell, 'seconds', decimalSeparator))).length, sample.length);
  const timeTextShare = data.texts.length === 0 ? 0 : share(sample.filter(looksLikeTimeText).length, sample.length);
  if (DURATION_HEADER.test(words) && durationShare >= PATTERN_SHARE && !taken.has('duration')) {
    draft.role = 'duration';
    taken.add('duration');
    draft.durationUnit = /\b(minutes|mins|min)\b/.test(words) ? 'minutes' : /\b(ms|milliseconds|msec)\b/.test(words) ? 'milliseconds' : 'seconds';
    draft.reason = timeTextShare >= PATTERN_SHARE
      ? 'Named like a completion time and written as times (mm:ss or hh:mm:ss).'
      : `Named like a completion time; plain numbers read as ${draft.durationUnit}.`;
    return;
  }
  if (TIMESTAMP_HEADER.test(words) || (data.texts.length > 0 && share(sample.filter((cell) => DATE_VALUE.test(cell)).length, sample.length) >= PATTERN_SHARE)) {
    draft.reason = 'Dates or times of day; audits do not use them.';
    return;
  }
  if (timeTextShare >= PATTERN_SHARE && !taken.has('duration')) {
    draft.role = 'duration';
    taken.add('duration');
    draft.durationUnit = 'seconds';
    draft.reason = 'Written as times (mm:ss or hh:mm:ss), so read as a completion time.';
    return;
  }
  const numericShare = share(data.profile.numeric, data.profile.nonBlank);
  if (WEIGHT_HEADER.test(words) && numericShare >= PATTERN_SHARE && data.numbers.every((value) => value >= 0) && !taken.has('weight')) {
    draft.role = 'weight';
    taken.add('weight');
    draft.reason = 'Named like a weight and holds numbers of zero or more.';
    return;
  }
  guessItem(draft);
  if (OUTCOME_HEADER.test(words) && numericShare >= PATTERN_SHARE && !taken.has('outcome')) {
    taken.add('outcome');
    draft.role = 'outcome';
    draft.wide = false;
    if (draft.constantValue !== null || (draft.item !== null && draft.item.min >= draft.item.max)) draft.item = null;
    draft.constantValue = null;
    draft.reason = `Named like an outcome${draft.item ? ` (whole numbers from ${draft.item.min} to ${draft.item.max})` : ''}; items are audited as its predictors.`;
  }
}

/** The (min, max) pair most items share (ties to the wider), or null. */
function modalRange(drafts: readonly Draft[]): { min: number; max: number } | null {
  const counts = new Map<string, { min: number; max: number; n: number }>();
  for (const draft of drafts) {
    if (draft.role !== 'item' || draft.item === null || draft.constantValue !== null) continue;
    const key = `${draft.item.min}|${draft.item.max}`;
    const entry = counts.get(key) ?? { min: draft.item.min, max: draft.item.max, n: 0 };
    entry.n++;
    counts.set(key, entry);
  }
  let best: { min: number; max: number; n: number } | null = null;
  for (const entry of counts.values()) {
    if (best === null || entry.n > best.n || (entry.n === best.n && entry.max - entry.min > best.max - best.min)) best = entry;
  }
  return best === null ? null : { min: best.min, max: best.max };
}

/** Chooses one built-in scale per label column: the candidate that covers the most columns. */
function settleLabelScales(drafts: readonly Draft[]): void {
  const coverage = new Map<string, number>();
  for (const draft of drafts) {
    for (const match of draft.labelCandidates ?? []) coverage.set(match.scale.name, (coverage.get(match.scale.name) ?? 0) + 1);
  }
  for (const draft of drafts) {
    if (!draft.labelCandidates) continue;
    let chosen = draft.labelCandidates[0];
    for (const match of draft.labelCandidates) {
      if ((coverage.get(match.scale.name) ?? 0) > (coverage.get(chosen.scale.name) ?? 0)) chosen = match;
    }
    const k = chosen.scale.options.length;
    const item = blankItem(draft.data.header);
    item.min = 1;
    item.max = k;
    item.labels = [...chosen.labels];
    item.missingLabels = [...chosen.missingLabels];
    draft.item = item;
    draft.rangeKnown = true;
    draft.labelSource = 'answer-scale';
    draft.answerScale = chosen.scale.name;
    draft.reason = `Answers are the options of the built-in ${chosen.scale.name} scale, mapped to codes 1 to ${k}; confirm the mapping${reverseNote(item, false)}.`;
  }
}

/**
 * Codes taken as missing in most guessed items (8 and 9 beside 1..5 items) are taken as missing
 * in the other guessed items too, where they sit at the edge of the answers (8 and 9 after 1..7).
 */
function settleCommonMissingCodes(drafts: readonly Draft[]): void {
  const guessed = drafts.filter((draft) => draft.role === 'item' && draft.item !== null && draft.labelCandidates === null && draft.labelSource === null && !draft.rangeKnown && draft.constantValue === null);
  const counts = new Map<number, number>();
  for (const draft of guessed) for (const code of draft.guessedMissing) counts.set(code, (counts.get(code) ?? 0) + 1);
  const common = new Set([...counts.entries()].filter(([, count]) => count >= 2 && count >= guessed.length / 2).map(([code]) => code));
  if (common.size === 0) return;
  for (const draft of guessed) {
    const item = draft.item as MutableItem;
    const values = draft.data.distinctNumbers.filter((value) => Number.isInteger(value)).sort((a, b) => a - b);
    const answers = values.filter((value) => !common.has(value) && !item.missingCodes.includes(value));
    if (answers.length < 2) continue;
    const low = answers[0];
    const high = answers[answers.length - 1];
    const added = values.filter((value) => common.has(value) && !item.missingCodes.includes(value) && (value > high || value < low));
    if (added.length === 0) continue;
    item.missingCodes = [...item.missingCodes, ...added].sort((a, b) => a - b);
    draft.guessedMissing = [...item.missingCodes];
    item.min = low;
    item.max = high;
    draft.reason = `Whole numbers from ${low} to ${high} look like a rating item; ${list(item.missingCodes)} beyond that ${item.missingCodes.length === 1 ? 'is a missing code' : 'are missing codes'} as in most items${reverseNote(item, false)}.`;
  }
}

/** Settles ranges against the range most items share: constant items, narrow guesses, wide columns. */
function settleRanges(drafts: readonly Draft[]): void {
  const modal = modalRange(drafts);
  for (const draft of drafts) {
    const item = draft.item;
    if (item === null) continue;
    if (draft.role === 'item' && draft.constantValue !== null) {
      const value = draft.constantValue;
      const common = COMMON_RANGES.find(([low, high]) => value >= low && value <= high);
      const range = modal && value >= modal.min && value <= modal.max ? modal : common ? { min: common[0], max: common[1] } : null;
      if (range) {
        item.min = range.min;
        item.max = range.max;
        draft.constantValue = null;
        draft.rangeAssumed = true;
        const assumed = `only one value (${value}) appears, so the range ${range.min} to ${range.max} ${range === modal ? 'of most items' : 'of a common rating scale'} was assumed.`;
        draft.reason = draft.reason.startsWith('Listed') ? `Listed in the codebook; ${assumed}` : `${assumed[0].toUpperCase()}${assumed.slice(1)}`;
      } else {
        draft.role = 'ignore';
        draft.item = null;
        draft.reason = `Only one value (${value}) appears, so no range can be guessed; set a range to use it as an item.`;
      }
      continue;
    }
    if (!modal) continue;
    if (draft.role === 'item' && !draft.rangeKnown && item.min >= modal.min && item.max <= modal.max && (item.min > modal.min || item.max < modal.max)) {
      item.min = modal.min;
      item.max = modal.max;
      draft.reason = draft.reason.replace(/\.$/, `; widened to ${modal.min} to ${modal.max} like most items.`);
      continue;
    }
    if (draft.wide) {
      const whole = draft.data.numbers.filter((value) => Number.isInteger(value) && !item.missingCodes.includes(value));
      const inside = whole.filter((value) => value >= modal.min && value <= modal.max).length;
      if (whole.length > 0 && inside / whole.length >= MODAL_RANGE_SHARE) {
        draft.role = 'item';
        item.min = modal.min;
        item.max = modal.max;
        draft.wide = false;
        draft.reason = `Most answers lie between ${modal.min} and ${modal.max} like the other items; ${whole.length - inside} outside that range count as out of range.`;
      }
    }
  }
}

/** Scales guessed from header prefixes (SAT_1, SAT_2, USE_1, ...) when at least two prefixes group two or more items. */
function guessScales(drafts: readonly Draft[]): void {
  if (drafts.some((draft) => draft.scaleFromCodebook)) return;
  const prefixOf = (header: string): string | null => {
    const match = /^(.*?[A-Za-z])[_\-. ]?\d+[a-z]?$/.exec(header.replace(REVERSE_SUFFIX, ''));
    return match ? match[1].replace(/[_\-. ]+$/, '') : null;
  };
  const groups = new Map<string, Draft[]>();
  for (const draft of drafts) {
    if (draft.role !== 'item' || draft.item === null) continue;
    const prefix = prefixOf(draft.data.header);
    if (prefix === null) continue;
    groups.set(prefix, [...(groups.get(prefix) ?? []), draft]);
  }
  const usable = [...groups.entries()].filter(([, members]) => members.length >= 2);
  if (usable.length < 2) return;
  for (const [prefix, members] of usable) {
    for (const draft of members) {
      if (draft.item && draft.item.scale === null) {
        draft.item.scale = prefix;
        draft.reason = draft.reason.replace(/\.$/, `; scale "${prefix}" guessed from the name.`);
      }
    }
  }
}

/**
 * The item type a setup gives, or the one its range implies: `dichotomous` for the range 0 to 1,
 * else `rating`.
 * @param item an item setup.
 * @returns the item type.
 * References: none published; common practice (0/1 items are checklists or scored answers, wider
 *   ranges rating grids).
 */
export function itemTypeOf(item: Pick<ItemSetup, 'min' | 'max' | 'type'>): ItemType {
  if (item.type) return item.type;
  return item.min === 0 && item.max === 1 ? 'dichotomous' : 'rating';
}

/** Sets the item type of every proposed item: the codebook's `type`, else from its range. */
function settleItemTypes(drafts: readonly Draft[]): void {
  for (const draft of drafts) {
    if (draft.item === null || draft.role !== 'item') continue;
    draft.item.type = draft.typeFromCodebook ?? itemTypeOf({ min: draft.item.min, max: draft.item.max });
    if (draft.typeFromCodebook === null && draft.item.type === 'dichotomous') {
      draft.reason = draft.reason.replace(/\.$/, '; answers 0 and 1 make it a dichotomous item (a checklist or a scored answer).');
    }
  }
}

/** A column an audit does not use, with the reason. */
export interface ColumnLeftOut {
  readonly column: string;
  readonly reason: string;
}

/**
 * The columns a setup leaves out of the wave (role `ignore`, or not named at all), each with
 * the reason: the proposal's own reason where the setup kept the proposed role, else that the
 * designer set it aside.
 * @param proposal the proposal (every column of the table, with reasons).
 * @param setup the setup in force (default: the proposal itself).
 * @returns one entry per column left out, in table order.
 * References: none published; issue 14 (every column left out of an audit is named with its reason).
 */
export function columnsLeftOut(proposal: Pick<ProposedSetup, 'columns'>, setup: WaveSetup = proposal): ColumnLeftOut[] {
  const roleOf = new Map(setup.columns.map((column) => [column.column, column.role]));
  const out: ColumnLeftOut[] = [];
  for (const column of proposal.columns) {
    const role = roleOf.get(column.column) ?? 'ignore';
    if (role !== 'ignore') continue;
    const reason = column.role === 'ignore' ? column.reason : 'The confirmed setup sets it to ignore.';
    out.push({ column: column.column, reason });
  }
  return out;
}

/**
 * Proposes the setup of a wave.
 * @param table a table from `readTable`.
 * @param codebook a codebook from `readCodebook`, or null. Codebook items are matched to
 *   headers exactly, then without regard to case.
 * @throws {WaveRefusal} 422 `no-respondents` when the table has a header but no answers.
 * @returns one proposal per column (in table order) with its reason, profile and cell counts,
 *   and warnings: `personal-data-ignored`, `labels-mapped-by-guess`, `labels-unmapped`,
 *   `missing-codes-guessed`, `range-assumed`, `codebook-item-not-in-data` (one per name), `no-items-proposed`.
 * References: Paredown methods.md §1 (missing cells, missing codes, reverse-keyed items); Likert 1932,
 *   "A technique for the measurement of attitudes" (rating items as ordered whole-number options).
 */
export function proposeSetup(table: WaveTable, codebook: Codebook | null = null): ProposedSetup {
  if (table.rows.length === 0) {
    throw new WaveRefusal(422, 'no-respondents', `"${table.source.fileName}" has a header row but no answers; upload the export with the responses.`);
  }
  const decimalSeparator = table.source.decimalSeparator;
  const byExact = new Map<string, CodebookEntry>();
  const byLower = new Map<string, CodebookEntry>();
  for (const entry of codebook?.entries ?? []) {
    byExact.set(entry.item, entry);
    if (!byLower.has(entry.item.toLowerCase())) byLower.set(entry.item.toLowerCase(), entry);
  }
  const used = new Set<CodebookEntry>();
  const taken = new Set<ColumnRole>();
  const drafts: Draft[] = table.headers.map((header, j) => {
    const draft = newDraft(columnData(table, j));
    const original = table.originalHeaders[j];
    const entry = byExact.get(header) ?? (original === header ? undefined : byExact.get(original)) ?? byLower.get(header.toLowerCase());
    if (entry && !used.has(entry)) used.add(entry);
    classify(draft, entry, decimalSeparator, taken);
    return draft;
  });
  settleLabelScales(drafts);
  settleCommonMissingCodes(drafts);
  settleRanges(drafts);
  guessScales(drafts);
  settleItemTypes(drafts);

  const columns: ColumnProposal[] = drafts.map((draft) => {
    const item: ItemSetup | null = draft.item === null || (draft.role !== 'item' && draft.role !== 'outcome') ? null : { ...draft.item };
    return {
      column: draft.data.header,
      role: draft.role,
      item,
      durationUnit: draft.role === 'duration' ? draft.durationUnit : null,
      reason: draft.reason,
      profile: draft.data.profile,
      counts: item === null ? null : recodeCodedCounts(draft.data.column, item, decimalSeparator),
      labelSource: item === null ? null : draft.labelSource ?? (item.labels.length > 0 ? 'codebook' : 'none'),
      answerScale: item === null ? null : draft.answerScale,
    };
  });

  const warnings: WaveWarning[] = [];
  const personal = drafts.filter((draft) => draft.personal !== null);
  if (personal.length > 0) {
    warnings.push({
      code: 'personal-data-ignored',
      columns: personal.map((draft) => draft.data.header),
      message: `${personal.length} ${personal.length === 1 ? 'column looks' : 'columns look'} like personal data or free text (${list(personal.map((draft) => `${draft.data.header}: ${draft.personal}`))}) and ${personal.length === 1 ? 'is' : 'are'} set to ignore; ${personal.length === 1 ? 'it is' : 'they are'} never stored as items.`,
    });
  }
  const overruled = drafts.filter((draft) => draft.codebookOverruled);
  if (overruled.length > 0) {
    warnings.push({
      code: 'codebook-item-personal-data',
      columns: overruled.map((draft) => draft.data.header),
      message: `The codebook lists ${list(overruled.map((draft) => `${draft.data.header} (${draft.personal})`))} as ${overruled.length === 1 ? 'an item, but its values look' : 'items, but their values look'} like personal data, which is never stored as an item; check the column or remove those values.`,
    });
  }
  const guessedLabels = columns.filter((column) => column.labelSource === 'answer-scale');
  if (guessedLabels.length > 0) {
    warnings.push({
      code: 'labels-mapped-by-guess',
      columns: guessedLabels.map((column) => column.column),
      message: `${guessedLabels.length} ${guessedLabels.length === 1 ? 'item holds' : 'items hold'} answer texts mapped to codes through a built-in answer scale (${list([...new Set(guessedLabels.map((column) => column.answerScale as string))])}); confirm the mapping or give value labels in the codebook.`,
    });
  }
  const unmapped = drafts.filter((draft) => draft.unmappedText);
  if (unmapped.length > 0) {
    warnings.push({
      code: 'labels-unmapped',
      columns: unmapped.map((draft) => draft.data.header),
      message: `${unmapped.length} ${unmapped.length === 1 ? 'column holds' : 'columns hold'} text answers that match no codebook labels or known answer scale (${list(unmapped.map((draft) => draft.data.header))}); add value labels to use ${unmapped.length === 1 ? 'it' : 'them'} as items.`,
    });
  }
  const guessedMissing = drafts.filter((draft) => draft.item !== null && (draft.role === 'item' || draft.role === 'outcome') && draft.guessedMissing.length > 0);
  if (guessedMissing.length > 0) {
    warnings.push({
      code: 'missing-codes-guessed',
      columns: guessedMissing.map((draft) => draft.data.header),
      message: `Codes beyond the answer range were taken as missing codes (${list(guessedMissing.map((draft) => `${draft.data.header}: ${draft.guessedMissing.join(' ')}`))}); confirm them.`,
    });
  }
  for (const entry of codebook?.entries ?? []) {
    if (used.has(entry)) continue;
    warnings.push({
      code: 'codebook-item-not-in-data',
      columns: [entry.item],
      message: `The codebook lists "${entry.item}", but the data has no column of that name; check the spelling or remove the row.`,
    });
  }
  const assumed = drafts.filter((draft) => draft.rangeAssumed && draft.role === 'item');
  if (assumed.length > 0) {
    warnings.push({
      code: 'range-assumed',
      columns: assumed.map((draft) => draft.data.header),
      message: `${assumed.length} ${assumed.length === 1 ? 'item shows' : 'items show'} only one value, so ${assumed.length === 1 ? 'its range was' : 'their ranges were'} assumed (${list(assumed.map((draft) => `${draft.data.header}: ${draft.item?.min} to ${draft.item?.max}`))}); confirm or give the range in the codebook.`,
    });
  }
  if (!columns.some((column) => column.role === 'item')) {
    warnings.push({
      code: 'no-items-proposed',
      columns: [],
      message: 'No column looks like a rating item; choose the item columns by hand or upload a codebook.',
    });
  }
  return { columns, respondents: table.rows.length, warnings };
}
