import type { CutListResponse } from '../../../lib/api/cut-list';
import { formatNumber, rewordCaution, unknownStabilityCaution, unstableCaution } from '../../../lib/words';
import { decisionPhrase, stabilityPhrase } from './decision-words';

interface Props {
  cutList: CutListResponse;
  busy: boolean;
  onAccept: (which: number | 'all-stable') => void;
}

/**
 * The recommendations of the study's latest finished audit: what each proposes for its overlap
 * cluster, why, how stable it was across bootstrap resamples, and whether the current decisions
 * already follow it; accept one, or every stable one at once.
 */
export default function RecommendationList({ cutList, busy, onAccept }: Props) {
  const { recommendations, canDecide, items } = cutList;
  const textOf = new Map(items.map((item) => [item.id, item.text]));
  const lockedSet = new Set(cutList.constraints.lockedItems);
  const stableOpen = recommendations.filter((r) => r.stable && !r.accepted).length;
  return (
    <section className="panel p-4" aria-labelledby="recommendations-heading" data-testid="recommendations">
      <div className="mb-3 flex flex-wrap items-baseline gap-x-3 gap-y-2">
        <h2 id="recommendations-heading" className="font-semibold">Recommendations</h2>
        <span className="text-xs text-ink-faint">{recommendations.length === 0 ? 'none' : `${recommendations.length} overlap ${recommendations.length === 1 ? 'cluster' : 'clusters'}, strongest first`}</span>
        {canDecide && recommendations.length > 0 && (
          <button type="button" className="button button-quiet ml-auto py-1 text-sm" disabled={busy || stableOpen === 0} onClick={() => onAccept('all-stable')} data-testid="accept-all-stable">
            Accept all stable ({stableOpen})
          </button>
        )}
      </div>
      {recommendations.length === 0 ? (
        <div className="empty-state">{cutList.audit ? 'The latest audit found no overlap worth a cut.' : 'Recommendations appear once an audit of a confirmed wave has finished.'}</div>
      ) : (
        <ol className="space-y-3">
          {recommendations.map((recommendation) => (
            <li key={recommendation.index} className="rounded border border-rule px-3 py-2.5" data-testid="recommendation">
              <div className="flex flex-wrap items-start gap-x-3 gap-y-1">
                <div className="min-w-0 flex-1">
                  <ul className="space-y-0.5 text-[0.9375rem]">
                    {recommendation.actions.map((action) => (
                      <li key={action.item}>
                        <span className={`font-semibold ${action.action === 'keep' ? '' : 'text-brick-700'}`}>{decisionPhrase(action.action, action.into)}</span>{' '}
                        <code className="text-sm">{action.item}</code>
                        {lockedSet.has(action.item) && <span className="chip ml-1.5 align-middle" title="Locked item">locked</span>}
                        {textOf.get(action.item) && <span className="text-ink-soft"> · “{textOf.get(action.item)}”</span>}
                      </li>
                    ))}
                  </ul>
                  <p className="mt-1 text-sm text-ink-soft">{recommendation.reason}{recommendation.maxR !== null && <> (strongest |r| {formatNumber(Math.abs(recommendation.maxR), 2)})</>}</p>
                  <p className={`mt-1 text-sm ${recommendation.unstable ? 'font-semibold text-ochre-700' : 'text-ink-faint'}`} data-testid="recommendation-stability">
                    {stabilityPhrase(recommendation.stability, recommendation.unstable)}
                    {recommendation.unstable && <> — {unstableCaution}</>}
                    {recommendation.stability === null && <> — {unknownStabilityCaution}</>}
                  </p>
                  {recommendation.actions.some((a) => a.action === 'reword') && <p className="mt-1 text-xs text-ink-faint">{rewordCaution}</p>}
                </div>
                <div className="shrink-0">
                  {recommendation.accepted ? (
                    <span className="chip chip-owner" data-testid="recommendation-accepted">Accepted</span>
                  ) : canDecide ? (
                    <button type="button" className="button py-1 text-sm" disabled={busy} onClick={() => onAccept(recommendation.index)} data-testid="accept-recommendation">
                      Accept
                    </button>
                  ) : (
                    <span className="text-xs text-ink-faint">Not yet decided</span>
                  )}
                </div>
              </div>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
