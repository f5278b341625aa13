import AuditStatusRow from './AuditStatusRow';
import type { AuditState } from './use-audit-status';

/**
 * On the page of an audit that is not done yet: its live progress (and a cancel button for those
 * who may run audits), and the page reloads once it ends: with the figures when it is done, with
 * its status in the heading when it failed or was cancelled. A failed or cancelled audit shows
 * why (and a retry button for those who may).
 */
export default function AuditWatcher({ initial, canRun }: { initial: AuditState; canRun: boolean }) {
  return (
    <ul className="panel px-4" data-testid="audit-watcher">
      <AuditStatusRow
        initial={initial}
        canRun={canRun}
        headingLevel={2}
        onStatus={(status) => {
          const ended = status === 'done' || status === 'failed' || status === 'cancelled';
          if (ended && status !== initial.status) location.reload();
        }}
      />
    </ul>
  );
}
