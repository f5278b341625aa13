/**
 * Built-in ordered answer scales in English, for responses exported as labels ("Strongly agree")
 * without a codebook. A column whose distinct answers all belong to one scale is proposed with
 * that scale's codes 1..k, and the designer is asked to confirm.
 */
import { MISSING_ANSWER_TEXTS } from './ingest-thresholds';
import { labelKey } from './value-labels';
import type { ValueLabel } from './types';

/** One built-in scale: its options from the low to the high end, each with accepted spellings. */
export interface AnswerScale {
  readonly name: string;
  /** Options in order; the first spelling is the one shown. Codes are 1..k. */
  readonly options: readonly (readonly string[])[];
}

/** The built-in scales, most specific first within each family. */
export const ANSWER_SCALES: readonly AnswerScale[] = [
  { name: 'agreement-5', options: [['Strongly disagree'], ['Disagree'], ['Neither agree nor disagree', 'Neither agree or disagree', 'Neutral', 'Undecided'], ['Agree'], ['Strongly agree']] },
  { name: 'agreement-7', options: [['Strongly disagree'], ['Disagree'], ['Somewhat disagree', 'Slightly disagree'], ['Neither agree nor disagree', 'Neither agree or disagree', 'Neutral'], ['Somewhat agree', 'Slightly agree'], ['Agree'], ['Strongly agree']] },
  { name: 'agreement-4', options: [['Strongly disagree'], ['Disagree'], ['Agree'], ['Strongly agree']] },
  { name: 'frequency-5', options: [['Never'], ['Rarely', 'Seldom'], ['Sometimes', 'Occasionally'], ['Often', 'Frequently'], ['Always', 'Very often']] },
  { name: 'satisfaction-5', options: [['Very dissatisfied'], ['Dissatisfied', 'Somewhat dissatisfied'], ['Neither satisfied nor dissatisfied', 'Neither satisfied or dissatisfied', 'Neutral'], ['Satisfied', 'Somewhat satisfied'], ['Very satisfied']] },
  { name: 'likelihood-5', options: [['Very unlikely'], ['Unlikely', 'Somewhat unlikely'], ['Neither likely nor unlikely', 'Neither likely or unlikely', 'Neutral'], ['Likely', 'Somewhat likely'], ['Very likely']] },
  { name: 'importance-5', options: [['Not at all important'], ['Slightly important'], ['Moderately important'], ['Very important'], ['Extremely important']] },
  { name: 'quality-5', options: [['Very poor'], ['Poor'], ['Fair', 'Average'], ['Good'], ['Excellent']] },
  { name: 'quality-5-very-good', options: [['Poor'], ['Fair'], ['Good'], ['Very good'], ['Excellent']] },
  { name: 'extent-5', options: [['Not at all'], ['A little', 'Slightly'], ['Moderately', 'Somewhat'], ['Quite a bit'], ['Extremely', 'Completely']] },
];

/** A scale that covers a column's answers. */
export interface AnswerScaleMatch {
  readonly scale: AnswerScale;
  /** Labels with codes 1..k (first spelling, plus every spelling observed, so each maps). */
  readonly labels: readonly ValueLabel[];
  /** Observed answer texts read as no answer ("Don't know"). */
  readonly missingLabels: readonly string[];
}

const MISSING_KEYS = new Set(MISSING_ANSWER_TEXTS.map(labelKey));

/**
 * Whether an answer text commonly means no answer ("Don't know", "Prefer not to say", "N/A").
 * @param text an answer text.
 * @returns true for a no-answer text.
 * References: none published; common no-answer options of survey tools (docs/decisions/002-reading-waves.md).
 */
export function isMissingAnswerText(text: string): boolean {
  return MISSING_KEYS.has(labelKey(text));
}

/**
 * Every built-in scale whose options include all the given answer texts (no-answer texts set
 * aside), smallest first.
 * @param answers distinct non-blank, non-numeric answer texts of one column.
 * @returns the matching scales with their labels; empty when none covers the answers.
 * References: Likert 1932, "A technique for the measurement of attitudes", Archives of Psychology 140 (the five-option agreement format);
 *   Vagias 2006, "Likert-type scale response anchors", Clemson University (common frequency, satisfaction, importance, quality and likelihood anchors).
 */
export function matchAnswerScales(answers: readonly string[]): AnswerScaleMatch[] {
  const missingLabels = answers.filter(isMissingAnswerText);
  const substantive = answers.filter((answer) => !isMissingAnswerText(answer));
  if (substantive.length === 0) return [];
  const matches: AnswerScaleMatch[] = [];
  for (const scale of ANSWER_SCALES) {
    const codeOf = new Map<string, number>();
    scale.options.forEach((spellings, index) => spellings.forEach((spelling) => codeOf.set(labelKey(spelling), index + 1)));
    if (!substantive.every((answer) => codeOf.has(labelKey(answer)))) continue;
    const labels: ValueLabel[] = scale.options.map((spellings, index) => ({ code: index + 1, label: spellings[0] }));
    for (const answer of substantive) {
      const code = codeOf.get(labelKey(answer)) as number;
      if (!labels.some((label) => label.code === code && labelKey(label.label) === labelKey(answer))) labels.push({ code, label: answer });
    }
    matches.push({ scale, labels, missingLabels });
  }
  return matches.sort((a, b) => a.scale.options.length - b.scale.options.length);
}
