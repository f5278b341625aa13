import { useId } from 'react';
import type { EarlyCutListJson } from '../../lib/audit/audit-json';
import { earlyCutListWords, proposedCutLine } from '../../lib/words';

/**
 * The recommendations of a running audit, shown while its bootstrap checks them: one line each
 * (what to keep, what to do with the rest) with its reason, under a note that their stability is
 * not known yet. The finished audit's page replaces it. Compact (a narrow list): the lines
 * without their reasons, and a link to the audit's page, which shows them.
 */
export default function EarlyCutList({
  cutList,
  compact = false,
  auditId,
  headingLevel = 3,
}: {
  cutList: EarlyCutListJson;
  compact?: boolean;
  auditId: string;
  /** 3 in the study page's lists (under their h2), 2 on the running audit's own page (under its h1). */
  headingLevel?: 2 | 3;
}) {
  // A page can show the same audit twice (the form's row and the study's list): ids of their own.
  const headingId = useId();
  const Heading = headingLevel === 2 ? 'h2' : 'h3';
  return (
    // A group, not a region landmark: the study page can list the same running audit twice.
    <div role="group" className="rounded border border-rule bg-spruce-50/40 px-3 py-2" data-testid="early-cut-list" aria-labelledby={headingId}>
      <Heading id={headingId} className="text-sm font-semibold">
        {earlyCutListWords.heading}
      </Heading>
      <p className="text-xs text-ink-soft">{earlyCutListWords.note(cutList.resamples)}</p>
      <ol className="mt-1.5 grid list-decimal gap-1 pl-5 text-sm">
        {cutList.recommendations.map((recommendation, index) => (
          <li key={index} data-testid="early-cut">
            <span className="font-semibold">{proposedCutLine(recommendation.keep, recommendation.actions)}</span>
            {!compact && <span className="block text-xs text-ink-soft">{recommendation.reason}</span>}
          </li>
        ))}
      </ol>
      {compact && (
        <p className="mt-1 text-xs">
          <a href={`/audits/${encodeURIComponent(auditId)}`}>{earlyCutListWords.reasonsLink}</a>
        </p>
      )}
    </div>
  );
}
