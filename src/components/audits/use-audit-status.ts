/**
 * Polls GET /api/audits/{id} while an audit is queued or running and returns its latest summary.
 * Stops by itself when the audit is done or failed, and when the component unmounts.
 */
import { useEffect, useState } from 'react';
import { auditsApi, type AuditSummary } from '../../lib/api/audits';

/** Milliseconds between two polls of a running audit. */
export const AUDIT_POLL_INTERVAL_MS = 1_000;

/** The part of an audit's summary the islands show. */
export type AuditState = Pick<AuditSummary, 'id' | 'status' | 'stage' | 'percent' | 'error'> & Partial<AuditSummary>;

/**
 * The live state of one audit.
 * @param initial the state known when the component mounts.
 * @returns the newest state, and an error message when the server could not be asked.
 */
export function useAuditStatus(initial: AuditState): { audit: AuditState; problem: string } {
  const [audit, setAudit] = useState<AuditState>(initial);
  const [problem, setProblem] = useState('');
  const active = audit.status === 'queued' || audit.status === 'running';
  useEffect(() => {
    setAudit(initial);
  }, [initial.id, initial.status]);
  useEffect(() => {
    if (!active) return;
    let stopped = false;
    let timer: ReturnType<typeof setTimeout> | undefined;
    const poll = async () => {
      const answer = await auditsApi.get(audit.id);
      if (stopped) return;
      if (answer.ok) {
        setProblem('');
        setAudit(answer.data.audit);
        if (answer.data.audit.status === 'queued' || answer.data.audit.status === 'running') timer = setTimeout(poll, AUDIT_POLL_INTERVAL_MS);
      } else {
        setProblem(answer.error.message);
        timer = setTimeout(poll, AUDIT_POLL_INTERVAL_MS * 3);
      }
    };
    timer = setTimeout(poll, AUDIT_POLL_INTERVAL_MS);
    return () => {
      stopped = true;
      if (timer) clearTimeout(timer);
    };
  }, [audit.id, active]);
  return { audit, problem };
}
