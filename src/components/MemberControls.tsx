import { useState } from 'react';
import { roleLabels, roles, type Role } from '../lib/permissions';
import { teamsApi } from '../lib/api/teams';

/** An owner's controls on one member: change the role, remove from the team. */
export default function MemberControls({ teamId, userId, role, name, isSelf }: { teamId: string; userId: string; role: Role; name: string; isSelf: boolean }) {
  const [current, setCurrent] = useState<Role>(role);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState('');

  async function changeTo(next: Role) {
    const before = current;
    setCurrent(next);
    setBusy(true);
    setError('');
    const result = await teamsApi.changeRole(teamId, userId, { role: next });
    setBusy(false);
    if (!result.ok) {
      setCurrent(before);
      setError(result.error.message);
    } else if (isSelf && next !== 'owner') {
      location.reload();
    }
  }

  async function remove() {
    if (!confirm(`Remove ${name} from the team?`)) return;
    setBusy(true);
    const result = await teamsApi.removeMember(teamId, userId);
    if (result.ok) {
      location.reload();
      return;
    }
    setBusy(false);
    setError(result.error.message);
  }

  return (
    <div className="flex flex-wrap items-center justify-end gap-2">
      <label className="sr-only" htmlFor={`role-${userId}`}>Role of {name}</label>
      <select id={`role-${userId}`} className="field w-auto py-1 text-sm" value={current} disabled={busy} onChange={(e) => void changeTo(e.target.value as Role)}>
        {roles.map((r) => (
          <option key={r} value={r}>{roleLabels[r]}</option>
        ))}
      </select>
      <button type="button" className="text-sm font-semibold text-brick-700 hover:underline disabled:opacity-60" disabled={busy} onClick={() => void remove()}>
        Remove
      </button>
      {error && <p className="error-text w-full text-right text-sm" role="alert">{error}</p>}
    </div>
  );
}
