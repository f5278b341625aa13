import AuditStatusRow from './AuditStatusRow';
import type { AuditState } from './use-audit-status';

/**
 * On the page of an audit that is not done yet: its live progress, and the page reloads with the
 * figures once it is done. A failed audit shows its reason (and a retry button for those who may).
 */
export default function AuditWatcher({ initial, canRun }: { initial: AuditState; canRun: boolean }) {
  return (
    <ul className="panel px-4" data-testid="audit-watcher">
      <AuditStatusRow
        initial={initial}
        canRun={canRun}
        onStatus={(status) => {
          if (status === 'done' && initial.status !== 'done') location.reload();
        }}
      />
    </ul>
  );
}
