import { useState, type FormEvent } from 'react';
import { signIn } from '../lib/api/auth';
import { meApi } from '../lib/api/me';

/** Changes the password, then signs in again with it (older sessions stop working). */
export default function PasswordForm({ email }: { email: string }) {
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ kind: 'ok' | 'error'; text: string } | null>(null);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const form = new FormData(formElement);
    const newPassword = String(form.get('newPassword') ?? '');
    if (newPassword !== String(form.get('repeat') ?? '')) {
      setMessage({ kind: 'error', text: 'The two new passwords differ.' });
      return;
    }
    setBusy(true);
    setMessage(null);
    const revokeTokens = form.get('revokeTokens') === 'on';
    const result = await meApi.changePassword({ currentPassword: String(form.get('currentPassword') ?? ''), newPassword, revokeTokens });
    if (!result.ok) {
      setBusy(false);
      setMessage({ kind: 'error', text: result.error.message });
      return;
    }
    const again = await signIn(email, newPassword, '/account');
    setBusy(false);
    formElement.reset();
    const revoked = result.data.tokensRevoked;
    const tokens = revoked > 0 ? ` ${revoked} API ${revoked === 1 ? 'token was' : 'tokens were'} revoked.` : '';
    setMessage(again.ok ? { kind: 'ok', text: `Password changed. Other sessions have been signed out.${tokens}` } : { kind: 'error', text: `Password changed; sign in again with it.${tokens}` });
  }

  return (
    <form onSubmit={submit} className="space-y-3">
      <input type="hidden" name="username" autoComplete="username" value={email} />
      <div>
        <label className="label" htmlFor="current-password">Present password</label>
        <input className="field" id="current-password" name="currentPassword" type="password" autoComplete="current-password" required />
      </div>
      <div>
        <label className="label" htmlFor="new-password">New password (at least 10 characters)</label>
        <input className="field" id="new-password" name="newPassword" type="password" autoComplete="new-password" minLength={10} required />
      </div>
      <div>
        <label className="label" htmlFor="repeat-password">New password again</label>
        <input className="field" id="repeat-password" name="repeat" type="password" autoComplete="new-password" minLength={10} required />
      </div>
      <label className="flex items-start gap-2 text-sm text-ink" htmlFor="revoke-tokens">
        <input id="revoke-tokens" name="revokeTokens" type="checkbox" className="mt-1" data-testid="revoke-tokens" />
        <span>Also revoke my API tokens (scripts using them stop working)</span>
      </label>
      <button className="button" type="submit" disabled={busy}>{busy ? 'Changing…' : 'Change password'}</button>
      {message && (
        <p className={message.kind === 'error' ? 'error-text' : 'text-sm text-spruce-700'} role={message.kind === 'error' ? 'alert' : 'status'}>
          {message.text}
        </p>
      )}
    </form>
  );
}
