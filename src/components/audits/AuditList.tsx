import { useEffect, useState } from 'react';
import type { AuditSummary } from '../../lib/api/audits';
import AuditStatusRow from './AuditStatusRow';

/** Audits listed before "show older". */
const SHOWN_AT_FIRST = 4;

/** The browser event the audit form sends when it has started (or reused) an audit. */
export const AUDIT_STARTED_EVENT = 'paredown:audit-started';

/**
 * A study's audits, newest first, each a live row (progress while running, a link when done).
 * Audits started from the form on the same page join the list at once.
 */
export default function AuditList({ audits, canRun }: { audits: AuditSummary[]; canRun: boolean }) {
  const [list, setList] = useState(audits);
  const [showAll, setShowAll] = useState(false);
  useEffect(() => {
    const added = (event: Event) => {
      const audit = (event as CustomEvent<AuditSummary>).detail;
      setList((current) => [audit, ...current.filter((entry) => entry.id !== audit.id)]);
    };
    window.addEventListener(AUDIT_STARTED_EVENT, added);
    return () => window.removeEventListener(AUDIT_STARTED_EVENT, added);
  }, []);
  if (list.length === 0) {
    return <div className="empty-state">No audit has run yet.{canRun ? ' Start one below.' : ''}</div>;
  }
  const shown = showAll ? list : list.slice(0, SHOWN_AT_FIRST);
  return (
    <div>
      <ul className="divide-y divide-rule" data-testid="audit-list">
        {shown.map((audit) => (
          <AuditStatusRow key={`${audit.id}:${audit.createdAt}`} initial={audit} canRun={canRun} compact />
        ))}
      </ul>
      {list.length > shown.length && (
        <button type="button" className="button button-quiet mt-1 text-sm" onClick={() => setShowAll(true)}>
          Show {list.length - shown.length} older {list.length - shown.length === 1 ? 'audit' : 'audits'}
        </button>
      )}
    </div>
  );
}
