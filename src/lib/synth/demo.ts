import { createSeededRandom } from '../stats/seeded-random';
import { generateWave } from './generate-wave';
import type { SyntheticWave, WaveSpec } from './types';

/** Seed of the demo wave; changing it changes every demo number. */
export const DEMO_SEED = 20270415;

/** Invented name of the demo organisation and its questionnaire. */
export const DEMO_STUDY_NAME = 'Riverbend City Libraries member survey 2027';

/**
 * The demo's structure: six scales of an invented city library member survey. Planted:
 * near-duplicate pairs coll_2/coll_7 and space_1/space_6, the near-duplicate triple
 * dig_1/dig_4/dig_7, the reverse-worded twin staff_6 of staff_2, the exact copy events_3b of
 * events_3 (an export glitch), the constant item hours_7, missing codes 8 and 9, blanks,
 * straightliners and speeders.
 */
export const DEMO_SPEC: WaveSpec = Object.freeze({
  respondents: 400,
  scales: [
    {
      name: 'collections',
      points: 5,
      items: [
        { name: 'coll_1', text: 'The library has the books I want to read.' },
        { name: 'coll_2', text: 'New titles arrive on the shelves quickly.' },
        { name: 'coll_3', text: 'The choice of magazines and newspapers meets my needs.' },
        { name: 'coll_4', text: 'I can find books in the languages I read.' },
        { name: 'coll_5', text: "The children's collection is well stocked." },
        { name: 'coll_6', text: 'There are enough copies of popular titles to avoid long waits.' },
        { name: 'coll_7', text: 'New titles reach the shelves quickly.', twinOf: 'coll_2' },
      ],
    },
    {
      name: 'hours_access',
      points: 5,
      items: [
        { name: 'hours_1', text: 'The opening hours suit my daily routine.' },
        { name: 'hours_2', text: 'My nearest branch is easy to reach by public transport.' },
        { name: 'hours_3', text: 'There is enough parking near my branch.' },
        { name: 'hours_4', text: 'The library is open when I need it at weekends.' },
        { name: 'hours_5', text: 'The buildings are easy to get around for people with limited mobility.' },
        { name: 'hours_6', text: 'Reserving a book and collecting it at my branch is straightforward.' },
      ],
    },
    {
      name: 'staff_help',
      points: 7,
      items: [
        { name: 'staff_1', text: 'Staff are friendly and welcoming.' },
        { name: 'staff_2', text: 'Staff help me find what I am looking for.' },
        { name: 'staff_3', text: 'Staff explain the self-service machines clearly.' },
        { name: 'staff_4', text: 'Staff know the collection well enough to recommend books.' },
        { name: 'staff_5', text: 'I can get help quickly even when the library is busy.' },
        { name: 'staff_6', text: 'Staff do not help me find what I am looking for.', twinOf: 'staff_2', reverse: true },
      ],
    },
    {
      name: 'digital',
      points: 5,
      items: [
        { name: 'dig_1', text: 'The library website is easy to use.' },
        { name: 'dig_2', text: 'Borrowing e-books through the library app works well.' },
        { name: 'dig_3', text: 'The public computers are reliable.' },
        { name: 'dig_4', text: "The library's website is simple to use.", twinOf: 'dig_1' },
        { name: 'dig_5', text: 'The Wi-Fi in the library is fast enough for my needs.' },
        { name: 'dig_6', text: 'The online catalogue shows whether a book is on the shelf.' },
        { name: 'dig_7', text: 'The library website is easy to find my way around.', twinOf: 'dig_1' },
      ],
    },
    {
      name: 'spaces',
      points: 5,
      items: [
        { name: 'space_1', text: 'There are enough quiet places to study.' },
        { name: 'space_2', text: 'The reading areas are clean and tidy.' },
        { name: 'space_3', text: 'The temperature inside is comfortable all year round.' },
        { name: 'space_4', text: 'The seating is comfortable for long visits.' },
        { name: 'space_5', text: 'The lighting is good for reading.' },
        { name: 'space_6', text: 'There are enough quiet spaces for studying.', twinOf: 'space_1' },
        { name: 'space_7', text: 'The toilets are clean and well kept.' },
      ],
    },
    {
      name: 'events',
      points: 5,
      items: [
        { name: 'events_1', text: 'The library offers events that interest me.' },
        { name: 'events_2', text: "Children's activities are well organised." },
        { name: 'events_3', text: 'I hear about upcoming events in good time.' },
        { name: 'events_4', text: 'Talks and workshops are worth the time I give them.' },
        { name: 'events_5', text: 'Events are held at times I can attend.' },
        { name: 'events_6', text: "The programme reflects the mix of people in my neighbourhood." },
      ],
    },
  ],
  factorCorrelation: 0.35,
  loadingRange: [0.55, 0.78],
  twinNoise: 0.15,
  skew: 0.5,
  missingCodes: [
    { code: 8, label: "don't know", rate: 0.02 },
    { code: 9, label: 'prefer not to say', rate: 0.01 },
  ],
  blankRate: 0.015,
  constantItems: [{ name: 'hours_7', text: 'I know that library membership is free of charge.', scale: 'hours_access', value: 5 }],
  duplicateColumns: [{ source: 'events_3', name: 'events_3b' }],
  straightliners: 6,
  speeders: 8,
  medianDurationSeconds: 420,
  idColumn: 'respondent_id',
  durationColumn: 'duration_sec',
  firstRespondentId: 270001,
  outcome: {
    name: 'overall_sat',
    text: 'Overall, how satisfied are you with Riverbend City Libraries? (0 = not at all satisfied, 10 = completely satisfied)',
    weights: [1.2, 0.8, 1, 0.6, 0.7, 0.4],
    noiseShare: 0.35,
  },
} satisfies WaveSpec);

const FIRST_NAMES = ['ada', 'bram', 'chiara', 'dev', 'elin', 'farid', 'greta', 'hugo', 'ines', 'jonas', 'kofi', 'lena', 'mateo', 'nora', 'olu', 'priya', 'quinn', 'rosa', 'sami', 'tove', 'uma', 'vik', 'wren', 'yara', 'zeno'];
const LAST_NAMES = ['ashdown', 'brenner', 'calloway', 'dimarco', 'eklund', 'fairbrook', 'galloway', 'holm', 'iqbal', 'jansen', 'kowal', 'lindqvist', 'moreau', 'nakamura', 'okafor', 'pereira', 'quist', 'rahman', 'sorensen', 'thorne'];
const MAIL_DOMAINS = ['example.org', 'example.com', 'example.net'];
const COMMENTS = [
  'Please open later on Thursdays.',
  'The new self-service machines keep freezing.',
  'Lovely staff at the Millbrook branch, thank you!',
  'More graphic novels, please.',
  'The Wi-Fi drops out upstairs.',
  'Hard to find a seat during exam season.',
  'The storytime sessions are the highlight of our week.',
  'Parking is impossible on Saturdays.',
  'I would like more books in Polish.',
  'The app logs me out all the time.',
  'Heating in the reading room is too high, "tropical" even.',
  'Keep up the good work.',
  'Could events be announced by e-mail, not just on posters?',
  'Toilets on the ground floor need attention.',
  'The e-book waiting lists are very long, sometimes months.',
];

/**
 * The demo's pilot wave: the invented Riverbend City Libraries member survey (about 400
 * respondents, 41 item columns in six scales, an overall-satisfaction outcome 0-10), generated
 * from `DEMO_SPEC` and `DEMO_SEED`, with two personal-data columns appended: a free-text
 * `comments` column and an `email` column (invented addresses at reserved example domains),
 * both mostly blank. The same call always returns the same wave. The data are invented.
 * @returns The wave with its codebook and ground truth (the personal-data columns are not in the
 *   codebook).
 * References: Thurstone 1947, "Multiple-factor analysis" (common-factor model of the items).
 */
export function demoWave(): SyntheticWave {
  const wave = generateWave(DEMO_SPEC, DEMO_SEED);
  const random = createSeededRandom(DEMO_SEED + 1);
  const rows = DEMO_SPEC.respondents;
  const comments: (string | null)[] = [];
  const emails: (string | null)[] = [];
  for (let i = 0; i < rows; i++) {
    comments.push(random.next() < 0.22 ? COMMENTS[random.nextInt(COMMENTS.length)] : null);
    if (random.next() < 0.3) {
      const first = FIRST_NAMES[random.nextInt(FIRST_NAMES.length)];
      const last = LAST_NAMES[random.nextInt(LAST_NAMES.length)];
      emails.push(`${first}.${last}${i + 1}@${MAIL_DOMAINS[random.nextInt(MAIL_DOMAINS.length)]}`);
    } else {
      emails.push(null);
    }
  }
  return { ...wave, columns: [...wave.columns, { name: 'comments', values: comments }, { name: 'email', values: emails }] };
}

/** Seed of the demo's second, smaller wave (the home library service survey). */
export const HOME_SERVICE_SEED = 20260912;

/** Invented name of the demo's second study, whose cut list the seed takes as far as publishing. */
export const HOME_SERVICE_STUDY_NAME = 'Riverbend home library service survey 2026';

/**
 * The demo's second questionnaire: a short survey of the members whose books a home library
 * service brings to their door, three scales of five-point items. Planted: the near-duplicate
 * pairs visit_2/visit_5 and choice_1/choice_4; one missing code, a few blanks, straightliners and
 * speeders.
 */
export const HOME_SERVICE_SPEC: WaveSpec = Object.freeze({
  respondents: 300,
  scales: [
    {
      name: 'visits',
      points: 5,
      items: [
        { name: 'visit_1', text: 'The delivery arrives on the day I was told.' },
        { name: 'visit_2', text: 'The volunteer who visits has time for a chat.' },
        { name: 'visit_3', text: 'Changing the day of my delivery is easy.' },
        { name: 'visit_4', text: 'I know whom to call when a delivery is late.' },
        { name: 'visit_5', text: 'The volunteer who comes has time to talk with me.', twinOf: 'visit_2' },
      ],
    },
    {
      name: 'choice',
      points: 5,
      items: [
        { name: 'choice_1', text: 'The books chosen for me suit my taste.' },
        { name: 'choice_2', text: 'I can ask for particular titles.' },
        { name: 'choice_3', text: 'Large-print books are available when I want them.' },
        { name: 'choice_4', text: 'The books picked for me match what I like.', twinOf: 'choice_1' },
        { name: 'choice_5', text: 'Audiobooks are offered to me.' },
      ],
    },
    {
      name: 'contact',
      points: 5,
      items: [
        { name: 'contact_1', text: 'The service keeps me in touch with what happens at the library.' },
        { name: 'contact_2', text: 'I feel the library has not forgotten me.' },
        { name: 'contact_3', text: 'I would tell someone in my position to join the service.' },
        { name: 'contact_4', text: 'Telephone calls from the library are friendly.' },
      ],
    },
  ],
  factorCorrelation: 0.3,
  loadingRange: [0.55, 0.75],
  twinNoise: 0.1,
  skew: 0.6,
  missingCodes: [{ code: 9, label: 'prefer not to say', rate: 0.01 }],
  blankRate: 0.01,
  constantItems: [],
  duplicateColumns: [],
  straightliners: 3,
  speeders: 3,
  medianDurationSeconds: 300,
  idColumn: 'respondent_id',
  durationColumn: 'duration_sec',
  firstRespondentId: 260001,
  outcome: {
    name: 'overall_sat',
    text: 'Overall, how satisfied are you with the home library service? (0 = not at all satisfied, 10 = completely satisfied)',
    weights: [1, 0.8, 0.9],
    noiseShare: 0.35,
  },
} satisfies WaveSpec);

/**
 * The demo's second wave: the invented home library service survey (300 respondents, 14 items in
 * three scales, an overall-satisfaction outcome 0-10), generated from `HOME_SERVICE_SPEC` and
 * `HOME_SERVICE_SEED`. The same call always returns the same wave. The data are invented.
 * @returns The wave with its codebook and ground truth.
 * References: Thurstone 1947, "Multiple-factor analysis" (common-factor model of the items).
 */
export function homeServiceWave(): SyntheticWave {
  return generateWave(HOME_SERVICE_SPEC, HOME_SERVICE_SEED);
}
