import { useState, type FormEvent } from 'react';
import { roleLabels, roles, type Role } from '../lib/permissions';
import { teamsApi } from '../lib/api/teams';

/** Invites an e-mail address into the team with a role (owners only see it). */
export default function InviteForm({ teamId, outbox }: { teamId: string; outbox: boolean }) {
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string } | null>(null);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const form = new FormData(formElement);
    setBusy(true);
    setMessage(null);
    const email = String(form.get('email') ?? '').trim();
    const result = await teamsApi.invite(teamId, { email, role: String(form.get('role')) as Role });
    setBusy(false);
    if (result.ok) {
      formElement.reset();
      setMessage({ kind: 'ok', text: `Invitation sent to ${email}.${outbox ? ' In this installation e-mail stays in the outbox.' : ''}` });
      setTimeout(() => location.reload(), 900);
    } else {
      setMessage({ kind: 'error', text: result.error.message });
    }
  }

  return (
    <form onSubmit={submit} className="grid grid-cols-[minmax(0,1fr)] gap-3 sm:grid-cols-[2fr_1fr_auto] sm:items-end">
      <div>
        <label className="label" htmlFor="invite-email">E-mail address</label>
        <input className="field" id="invite-email" name="email" type="email" required maxLength={320} placeholder="name@example.org" />
      </div>
      <div>
        <label className="label" htmlFor="invite-role">Role</label>
        <select className="field" id="invite-role" name="role" defaultValue="designer">
          {roles.map((role) => (
            <option key={role} value={role}>{roleLabels[role]}</option>
          ))}
        </select>
      </div>
      <button className="button" type="submit" disabled={busy}>{busy ? 'Sending…' : 'Send invitation'}</button>
      {message && (
        <p className={`sm:col-span-3 text-sm ${message.kind === 'error' ? 'error-text' : 'text-spruce-700'}`} role={message.kind === 'error' ? 'alert' : 'status'}>
          {message.text}
        </p>
      )}
    </form>
  );
}
