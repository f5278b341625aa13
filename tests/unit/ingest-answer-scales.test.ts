import { describe, expect, it } from 'vitest';
import { ANSWER_SCALES, isMissingAnswerText, matchAnswerScales } from '../../src/lib/ingest';

describe('matchAnswerScales', () => {
  it('maps agreement labels to 1..5 in order (Likert 1932: strongly disapprove … strongly approve)', () => {
    const [best] = matchAnswerScales(Object.freeze(['Agree', 'Strongly agree', 'strongly disagree', 'Neither agree nor disagree']));
    expect(best.scale.name).toBe('agreement-5');
    const code = (text: string) => best.labels.find((label) => label.label.toLowerCase() === text.toLowerCase())?.code;
    expect([code('Strongly disagree'), code('Disagree'), code('Neither agree nor disagree'), code('Agree'), code('Strongly agree')]).toEqual([1, 2, 3, 4, 5]);
  });

  it('lists every scale that covers the answers, smallest first, and sets no-answer texts aside', () => {
    const matches = matchAnswerScales(['Agree', 'Disagree', "Don't know"]);
    expect(matches.map((match) => match.scale.name)).toEqual(['agreement-4', 'agreement-5', 'agreement-7']);
    expect(matches[0].missingLabels).toEqual(["Don't know"]);
  });

  it('adds observed spellings so each maps ("Neutral" is option 3 of agreement-5)', () => {
    const [best] = matchAnswerScales(['Neutral', 'Agree', 'Strongly disagree']);
    expect(best.labels).toContainEqual({ code: 3, label: 'Neutral' });
  });

  it('matches nothing for answers outside every scale, or only no-answer texts', () => {
    expect(matchAnswerScales(['Agree', 'Purple'])).toEqual([]);
    expect(matchAnswerScales(['N/A'])).toEqual([]);
  });

  it('has no scale that gives two options the same spelling', () => {
    for (const scale of ANSWER_SCALES) {
      const spellings = scale.options.flat().map((text) => text.toLowerCase());
      expect(new Set(spellings).size, scale.name).toBe(spellings.length);
    }
  });
});

describe('isMissingAnswerText', () => {
  it('knows common no-answer texts', () => {
    for (const text of ["Don't know", 'DON\u2019T KNOW', 'Prefer not to say', 'n/a', 'Refused']) expect(isMissingAnswerText(text), text).toBe(true);
    expect(isMissingAnswerText('Never')).toBe(false);
  });
});
