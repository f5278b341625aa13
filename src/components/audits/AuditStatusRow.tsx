import { useEffect, useState } from 'react';
import { auditsApi } from '../../lib/api/audits';
import { formatRecentTime } from '../date-words';
import AuditProgressBar from './AuditProgressBar';
import EarlyCutList from './EarlyCutList';
import { cancelAuditWords, constraintsLine, formatDuration, settingsLine, statusWords } from '../../lib/words';
import { useAuditStatus, type AuditState } from './use-audit-status';

/**
 * One audit as a live row: its settings, then a progress bar while it waits or runs (with a cancel
 * button for those who may run audits, and the proposed cuts so far while the bootstrap checks
 * them), a link to its page once done, or why it failed or who cancelled it (with a retry button
 * for those who may run audits). `onStatus` hears every change of status.
 */
export default function AuditStatusRow({
  initial,
  canRun,
  onStatus,
  compact = false,
  headingLevel = 3,
}: {
  initial: AuditState;
  canRun: boolean;
  onStatus?: (status: AuditState['status']) => void;
  /** In a narrow list: the early cut list without its reasons, with a link to the audit's page. */
  compact?: boolean;
  /** The level of the early cut list's heading: one below the heading the row sits under. */
  headingLevel?: 2 | 3;
}) {
  const [current, setCurrent] = useState(initial);
  const { audit, problem } = useAuditStatus(current);
  useEffect(() => {
    onStatus?.(audit.status);
  }, [audit.status]);
  const [retrying, setRetrying] = useState(false);
  const [retryError, setRetryError] = useState('');
  const [cancelling, setCancelling] = useState(false);
  const [cancelError, setCancelError] = useState('');

  async function retry() {
    setRetrying(true);
    setRetryError('');
    const answer = await auditsApi.retry(audit.id);
    setRetrying(false);
    if (answer.ok) setCurrent(answer.data.audit);
    else setRetryError(answer.error.message);
  }

  async function cancel() {
    setCancelling(true);
    setCancelError('');
    const answer = await auditsApi.cancel(audit.id);
    setCancelling(false);
    if (answer.ok) setCurrent(answer.data.audit);
    else setCancelError(answer.error.message);
  }

  const settings = audit.settings;
  return (
    <li className="grid gap-1.5 py-2.5" data-testid="audit-row" data-status={audit.status}>
      <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-0.5 text-sm">
        <span className="font-semibold">
          {audit.waveLabel ?? 'Audit'}
          <span className={`status ml-2 status-${audit.status}`}>{statusWords[audit.status] ?? audit.status}</span>
        </span>
        {audit.createdAt && <span className="text-xs text-ink-faint">{formatRecentTime(audit.createdAt)}</span>}
      </div>
      {settings && <p className="text-xs text-ink-soft">{settingsLine(settings)}</p>}
      {settings && <p className="text-xs text-ink-faint" data-testid="audit-constraints">{constraintsLine(settings)}</p>}
      {(audit.status === 'queued' || audit.status === 'running') && (
        <div className="grid gap-1">
          <AuditProgressBar status={audit.status} stage={audit.stage} percent={audit.percent} />
          {audit.status === 'running' && audit.earlyCutList && <EarlyCutList cutList={audit.earlyCutList} compact={compact} auditId={audit.id} headingLevel={headingLevel} />}
          {canRun && (
            <div>
              <button type="button" className="button button-quiet text-sm" data-testid="cancel-audit" onClick={cancel} disabled={cancelling}>
                {cancelling ? cancelAuditWords.pending : cancelAuditWords.button}
              </button>
            </div>
          )}
          {cancelError && <p className="error-text text-sm" role="alert">{cancelError}</p>}
        </div>
      )}
      {audit.status === 'done' && (
        <p className="text-sm">
          <a href={`/audits/${encodeURIComponent(audit.id)}`} className="font-semibold" data-testid="open-audit">Open the audit</a>
          {audit.timings?.runMs !== undefined && <span className="ml-2 text-xs text-ink-faint">ran in {formatDuration(audit.timings.runMs)}</span>}
        </p>
      )}
      {(audit.status === 'failed' || audit.status === 'cancelled') && (
        <div className="grid gap-1">
          <p className={audit.status === 'cancelled' ? 'text-sm text-ink-soft' : 'error-text text-sm'} data-testid="audit-error">{audit.error ?? (audit.status === 'cancelled' ? cancelAuditWords.cancelled : 'The audit failed.')}</p>
          {canRun && (
            <div>
              <button type="button" className="button button-quiet text-sm" onClick={retry} disabled={retrying}>{retrying ? 'Queuing…' : 'Retry'}</button>
            </div>
          )}
          {retryError && <p className="error-text text-sm" role="alert">{retryError}</p>}
        </div>
      )}
      {problem && <p className="text-xs text-ochre-700" role="status">{problem}</p>}
    </li>
  );
}
