/**
 * The words of the handoff: refusals of publishing and marking, what became of an item, the
 * review states, the e-mails to the team and the sentences of the activity view. Pure; shared by
 * the routes, the pages and the islands.
 */

/** The decisions as one reader-facing word each. */
const decisionWords: Record<string, string> = { keep: 'Keep', drop: 'Drop', merge: 'Merge', reword: 'Reword', undecided: 'Undecided' };

/**
 * Joins names as prose: "a", "a and b", "a, b and c"; past `limit` names, "and N more".
 * @param names the names.
 * @param limit how many to name at most.
 * @returns the phrase.
 */
export function listPhrase(names: readonly string[], limit = 12): string {
  if (names.length === 0) return '';
  const shown = names.slice(0, limit);
  const rest = names.length - shown.length;
  if (rest > 0) return `${shown.join(', ')} and ${rest} more`;
  if (shown.length === 1) return shown[0];
  return `${shown.slice(0, -1).join(', ')} and ${shown[shown.length - 1]}`;
}

/** The refusals and notices of the handoff routes. */
export const handoffWords = {
  undecided: (itemIds: readonly string[]) =>
    `The cut list cannot be published while ${itemIds.length === 1 ? '1 item is' : `${itemIds.length} items are`} undecided: ${listPhrase(itemIds)}. Decide ${itemIds.length === 1 ? 'it' : 'each of them'} (keep, drop, merge or reword, with a reason) and publish again.`,
  noConfirmedWave: 'This study has no confirmed wave yet, so there is no item list to publish. Upload the pilot wave and confirm its setup first.',
  nothingPublished: 'Nothing has been published for this study yet: the designer publishes the cut list first.',
  versionNotFound: (number: number) => `Version ${number} of this study's cut list was never published.`,
  alreadyProgrammed: (number: number, who: string | null, when: string) =>
    `Version ${number} is already marked as programmed${who ? ` by ${who}` : ''} (${when}).`,
  badVersion: 'The version must be a published version number such as 1 or 2.',
  parentNotFound: 'The comment you answer is not in this study; reload the page and try again.',
  itemNotFound: (id: string) => `This study has no item called ${id}; comment on an item of its waves.`,
  auditNotFound: 'This study has no such audit; comment on one of its audits.',
} as const;

/**
 * What became of an item, in a few words for the field manager.
 * @param decision the decision.
 * @param into the item a merge goes into.
 * @returns e.g. "Kept", "Kept with new wording", "Dropped", "Merged into coll_2".
 */
export function itemFate(decision: string, into: string | null): string {
  switch (decision) {
    case 'keep':
      return 'Kept';
    case 'reword':
      return 'Kept with new wording';
    case 'drop':
      return 'Dropped';
    case 'merge':
      return into ? `Merged into ${into}` : 'Merged';
    default:
      return 'Undecided';
  }
}

/** Whether a decision keeps the item in the questionnaire the field manager programs. */
export function staysInQuestionnaire(decision: string): boolean {
  return decision === 'keep' || decision === 'reword';
}

/** The decision as one word. */
export function decisionWord(decision: string): string {
  return decisionWords[decision] ?? decision;
}

/** The review states as shown on the study page and the review page. */
export const reviewStateWords: Record<string, string> = {
  'none-published': 'Nothing published to review yet',
  awaiting: 'Awaiting the client’s review',
  approved: 'Approved by the client',
  changes_requested: 'Changes requested by the client',
};

/** The handoff of a study as the studies list shows it (StudySummary['handoff']). */
interface HandoffAtAGlance {
  latestVersion: { number: number; programmedAt: string | null } | null;
  review: string;
  /** Items without a decision; null before any wave is confirmed. */
  undecided: number | null;
}

/**
 * Where a study's handoff stands, in one line for the studies list: "Nothing published yet", or
 * the latest version, whether it is programmed, and the client's verdict on it.
 * @param handoff the latest version and the review state.
 * @returns the line.
 */
export function handoffLine(handoff: HandoffAtAGlance): string {
  const version = handoff.latestVersion;
  if (version === null) return 'Nothing published yet';
  const review = (reviewStateWords[handoff.review] ?? handoff.review).replace(/^\p{Lu}/u, (first) => first.toLowerCase());
  return `Version ${version.number} · ${version.programmedAt ? 'programmed' : 'not yet programmed'} · ${review}`;
}

/**
 * The handoff's next step when it is the signed-in role's to take, as a link: before the first
 * version, the designers (and the owner) decide the items still undecided, then publish; the field
 * manager programs a published version, the client reviewer reviews one that awaits a verdict, and
 * the designers answer a request for changes. Other roles may do some of these too (an owner may
 * mark a version programmed), but the list points each role only at its own part.
 * @param handoff the latest version and the review state.
 * @param role the signed-in member's role in the study's team.
 * @param studyId the study, for the link.
 * @returns the step's words and page, or null when nothing waits on this role.
 */
export function handoffNextStep(handoff: HandoffAtAGlance, role: string, studyId: string): { label: string; href: string } | null {
  const version = handoff.latestVersion;
  const study = `/studies/${encodeURIComponent(studyId)}`;
  const designs = role === 'designer' || role === 'owner';
  if (version === null) {
    if (!designs || handoff.undecided === null) return null;
    if (handoff.undecided > 0) return { label: `${handoff.undecided} ${handoff.undecided === 1 ? 'item' : 'items'} to decide`, href: `${study}/decisions` };
    return { label: 'Ready to publish', href: study };
  }
  if (role === 'field_manager' && version.programmedAt === null) return { label: `Version ${version.number} to program`, href: `${study}/field-list` };
  if (role === 'client_reviewer' && handoff.review === 'awaiting') return { label: `Version ${version.number} to review`, href: `${study}/review` };
  if (designs && handoff.review === 'changes_requested') return { label: 'Changes requested', href: `${study}/review` };
  return null;
}

/** The diff's change kinds as shown. */
export const diffChangeWords: Record<string, string> = { added: 'New in this version', removed: 'No longer listed', changed: 'Changed' };

/** An e-mail's subject and text. */
export interface MailWords {
  subject: string;
  text: string;
}

/**
 * The e-mail to field managers and client reviewers when a version is published.
 * @param args study name, version number, publisher, counts, the page links and the note.
 */
export function publishedMail(args: {
  study: string;
  version: number;
  by: string;
  kept: number;
  removed: number;
  changes: number | null;
  fieldListUrl: string;
  reviewUrl: string;
  note: string;
}): MailWords {
  const changed = args.changes === null ? 'This is the first published version.' : `${args.changes} ${args.changes === 1 ? 'item differs' : 'items differ'} from the version before.`;
  return {
    subject: `Cut list version ${args.version} of “${args.study}” is published`,
    text: [
      `${args.by} published version ${args.version} of the cut list of “${args.study}”.`,
      `${args.kept} ${args.kept === 1 ? 'item stays' : 'items stay'} in the questionnaire and ${args.removed} ${args.removed === 1 ? 'is' : 'are'} taken out. ${changed}`,
      args.note ? `Their note: ${args.note}` : '',
      `Field managers: the list to program, with XLSX and CSV downloads, is at ${args.fieldListUrl}`,
      `Client reviewers: the decisions with their reasons, to approve or to ask for changes, are at ${args.reviewUrl}`,
    ]
      .filter(Boolean)
      .join('\n\n'),
  };
}

/**
 * The e-mail to the designers when a version is marked as programmed.
 * @param args study name, version, who marked it and the page link.
 */
export function programmedMail(args: { study: string; version: number; by: string; url: string }): MailWords {
  return {
    subject: `Version ${args.version} of “${args.study}” is programmed`,
    text: `${args.by} marked version ${args.version} of the cut list of “${args.study}” as programmed: the questionnaire in the field now follows it.\n\nThe list: ${args.url}`,
  };
}

/**
 * The e-mail to the designers when the client reviews a version.
 * @param args study name, version, reviewer, verdict, comment and the page link.
 */
export function reviewedMail(args: { study: string; version: number; by: string; verdict: string; comment: string; url: string }): MailWords {
  const approved = args.verdict === 'approved';
  return {
    subject: approved ? `Version ${args.version} of “${args.study}” is approved` : `Changes asked for on version ${args.version} of “${args.study}”`,
    text: [
      approved
        ? `${args.by} approved version ${args.version} of the cut list of “${args.study}”.`
        : `${args.by} asks for changes to version ${args.version} of the cut list of “${args.study}”.`,
      args.comment ? `Their comment: ${args.comment}` : '',
      `The review and the team’s comments: ${args.url}`,
    ]
      .filter(Boolean)
      .join('\n\n'),
  };
}

/**
 * The activity view's sentence for one logged action (what follows the person's name).
 * @param action the logged action, `object.verb`.
 * @param detail what the log kept with it.
 * @returns e.g. "published version 2 of the cut list".
 */
export function activitySentence(action: string, detail: Record<string, unknown>): string {
  const text = (key: string) => (typeof detail[key] === 'string' || typeof detail[key] === 'number' ? String(detail[key]) : '');
  const items = Array.isArray(detail.items) ? detail.items.map(String) : [];
  switch (action) {
    case 'study.created':
      return `created the study${text('name') ? ` “${text('name')}”` : ''}`;
    case 'study.updated':
      return 'changed the study’s settings';
    case 'wave.uploaded':
      return `uploaded a wave${text('label') ? ` (${text('label')})` : ''}`;
    case 'wave.confirmed':
      return `confirmed the setup of a wave${text('label') ? ` (${text('label')})` : ''}`;
    case 'wave.exclusions-changed':
      return 'changed which respondents a wave leaves out';
    case 'wave.discarded':
      return 'discarded an unconfirmed wave';
    case 'audit.started':
      return 'started an audit';
    case 'audit.retried':
      return 'retried an audit';
    case 'audit.cancelled':
      return 'stopped an audit';
    case 'decision.changed':
      return `decided ${decisionWord(text('decision')).toLowerCase()} for ${items.length > 0 ? listPhrase(items, 5) : 'an item'}${text('into') ? ` (into ${text('into')})` : ''}`;
    case 'decision.accepted':
      return `accepted the recommendation${items.length === 1 ? '' : 's'} for ${items.length > 0 ? listPhrase(items, 5) : 'items'}`;
    case 'cutlist.published':
      return `published version ${text('version')} of the cut list`;
    case 'cutlist.programmed':
      return `marked version ${text('version')} as programmed`;
    case 'comment.posted':
      return `${detail.parentId ? 'answered a comment' : 'commented'} on ${text('about') || 'the study'}`;
    case 'review.approved':
      return `approved version ${text('version')}`;
    case 'review.changes-requested':
      return `asked for changes to version ${text('version')}`;
    default:
      return action.replace(/[._-]/g, ' ');
  }
}
