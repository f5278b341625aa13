import { useCallback, useEffect, useRef, useState } from 'react';
import { decisionKinds, removedItemIds, type AcceptResponse, type CutListItem, type CutListResponse, type DecisionKind, type DecisionResponse, type WhatIfResponse } from '../../../lib/api/cut-list';
import { callApi } from '../../../lib/api/client';
import { formatDayAndTime } from '../../date-words';
import { decisionCautions } from '../../../lib/words';
import HistoryList from './HistoryList';
import ItemDecisions from './ItemDecisions';
import RecommendationList from './RecommendationList';
import WhatIfPanel from './WhatIfPanel';
import ConstraintsPanel from './ConstraintsPanel';

/** What the workspace says after an action (announced to screen readers). */
interface Notice {
  kind: 'ok' | 'error';
  text: string;
}

/**
 * The decisions workspace of a study: the recommendations of its latest finished audit (accept
 * one, or every stable one), each item's decision with its reason, the live what-if of the
 * current decisions (computed off the request thread by the server's what-if worker), the locks
 * and constraints, and the history of every change. Everything comes from the HTTP API
 * (src/lib/api/cut-list.ts), so a script sees what a person sees.
 */
export default function DecisionWorkspace({ studyId }: { studyId: string }) {
  const [cutList, setCutList] = useState<CutListResponse | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [whatIf, setWhatIf] = useState<WhatIfResponse | null>(null);
  const [whatIfState, setWhatIfState] = useState<'idle' | 'busy' | 'error'>('idle');
  const [whatIfError, setWhatIfError] = useState<string | null>(null);
  const [notice, setNotice] = useState<Notice | null>(null);
  const [busy, setBusy] = useState(false);
  const whatIfRequest = useRef(0);

  const refreshWhatIf = useCallback(async (list: CutListResponse) => {
    if (!list.audit) return;
    const ticket = ++whatIfRequest.current;
    setWhatIfState('busy');
    const result = await callApi<WhatIfResponse>('POST', `/api/audits/${list.audit.id}/what-if`, { removed: removedItemIds(list.items) });
    if (ticket !== whatIfRequest.current) return;
    if (result.ok) {
      setWhatIf(result.data);
      setWhatIfState('idle');
      setWhatIfError(null);
    } else {
      setWhatIfState('error');
      setWhatIfError(result.error.message);
    }
  }, []);

  const load = useCallback(async () => {
    const result = await callApi<CutListResponse>('GET', `/api/studies/${studyId}/cut-list`);
    if (!result.ok) {
      setLoadError(result.error.message);
      return null;
    }
    setCutList(result.data);
    setLoadError(null);
    void refreshWhatIf(result.data);
    return result.data;
  }, [studyId, refreshWhatIf]);

  useEffect(() => {
    void load();
  }, [load]);

  const decide = useCallback(
    async (item: CutListItem, change: { decision: DecisionKind; into: string | null; wording: string | null; reason: string }): Promise<string | null> => {
      setBusy(true);
      const body = {
        decision: change.decision,
        reason: change.reason,
        ...(change.decision === 'merge' ? { into: change.into } : {}),
        ...(change.decision === 'reword' ? { wording: change.wording } : {}),
      };
      const result = await callApi<DecisionResponse>('PUT', `/api/studies/${studyId}/cut-list/${encodeURIComponent(item.id)}`, body);
      setBusy(false);
      if (!result.ok) return result.error.message;
      setNotice({ kind: 'ok', text: result.data.changed ? `${item.id}: ${change.decision} recorded.` : `${item.id}: nothing changed.` });
      await load();
      return null;
    },
    [studyId, load],
  );

  const accept = useCallback(
    async (which: number | 'all-stable') => {
      setBusy(true);
      const result = await callApi<AcceptResponse>('POST', `/api/studies/${studyId}/cut-list/accept`, { recommendation: which });
      setBusy(false);
      if (!result.ok) {
        setNotice({ kind: 'error', text: result.error.message });
        return;
      }
      const { changed, needsWording } = result.data;
      const parts = [changed.length === 0 ? 'Nothing changed: the decisions already match.' : `${changed.length} ${changed.length === 1 ? 'decision' : 'decisions'} recorded (${changed.join(', ')}).`];
      if (needsWording.length > 0) parts.push(`${needsWording.join(', ')} ${needsWording.length === 1 ? 'needs' : 'need'} new wording: decide ${needsWording.length === 1 ? 'it' : 'them'} below.`);
      setNotice({ kind: 'ok', text: parts.join(' ') });
      await load();
    },
    [studyId, load],
  );

  if (loadError) return <p className="error-text" role="alert">{loadError}</p>;
  if (!cutList) return <p className="text-ink-soft" aria-busy="true">Loading the cut list…</p>;

  const { counts, audit } = cutList;
  return (
    <div data-testid="decision-workspace">
      <div className="mb-4 flex flex-wrap items-center gap-x-4 gap-y-2">
        <ul className="flex flex-wrap gap-2 text-sm" aria-label="Decisions so far" data-testid="decision-counts">
          {decisionKinds.map((kind) => (
            <li key={kind} className={`rounded border px-2 py-0.5 ${kind === 'undecided' && counts.undecided > 0 ? 'border-ochre-700 bg-ochre-50' : 'border-rule bg-card'}`}>
              <span className="capitalize text-ink-soft">{kind}</span> <span className="num font-semibold">{counts[kind]}</span>
            </li>
          ))}
        </ul>
        <p className="text-sm text-ink-faint">
          {audit
            ? <>Recommendations from the audit of {audit.waveLabel}{audit.finishedAt ? `, finished ${formatDayAndTime(audit.finishedAt)}` : ''} · <a href={`/audits/${audit.id}`}>open the audit</a></>
            : 'No audit has finished yet: decisions can be recorded, recommendations and the what-if come with the first finished audit.'}
        </p>
      </div>

      <details className="notice mb-5" open>
        <summary className="cursor-pointer font-semibold">Before you decide</summary>
        <ul className="mt-1 list-disc space-y-0.5 pl-5 text-sm" data-testid="decision-cautions">
          {decisionCautions.map((caution) => <li key={caution}>{caution}</li>)}
        </ul>
      </details>

      <p className="sr-only" role="status" aria-live="polite">{notice?.text ?? ''}</p>
      {notice && (
        <p className={`mb-4 rounded border px-3 py-2 text-sm ${notice.kind === 'error' ? 'border-brick-700 bg-brick-50 text-brick-700' : 'border-spruce-600 bg-spruce-50 text-spruce-800'}`} data-testid="workspace-notice">
          {notice.text}
        </p>
      )}

      <div className="grid grid-cols-[minmax(0,1fr)] gap-5 lg:grid-cols-3">
        <div className="min-w-0 space-y-5 lg:col-span-2">
          <RecommendationList cutList={cutList} busy={busy} onAccept={accept} />
          <ItemDecisions cutList={cutList} busy={busy} onDecide={decide} />
        </div>
        {/* Below lg the what-if comes first, so a change's effect is in view without scrolling past every item. */}
        <div className="order-first min-w-0 space-y-5 lg:order-none">
          <div className="space-y-5 lg:sticky lg:top-4">
            <WhatIfPanel whatIf={whatIf} state={whatIfState} error={whatIfError} constraints={cutList.constraints} hasAudit={audit !== null} />
            <ConstraintsPanel constraints={cutList.constraints} />
          </div>
        </div>
      </div>
      <HistoryList history={cutList.history} />
    </div>
  );
}
