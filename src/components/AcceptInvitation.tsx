import { useState, type FormEvent } from 'react';
import { callApi, signIn } from './api-client';

/**
 * Accepts an invitation: either joins as the signed-in user, or creates the account (name and
 * password) and signs in.
 */
export default function AcceptInvitation({ token, email, mode, teamName }: { token: string; email: string; mode: 'join' | 'create'; teamName: string }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState('');

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setBusy(true);
    setError('');
    const password = String(form.get('password') ?? '');
    if (mode === 'create' && password !== String(form.get('repeat') ?? '')) {
      setBusy(false);
      setError('The two passwords differ.');
      return;
    }
    const body = mode === 'create' ? { name: String(form.get('name') ?? ''), password } : {};
    const result = await callApi('POST', `/api/invitations/${encodeURIComponent(token)}/accept`, body);
    if (!result.ok) {
      setBusy(false);
      setError(result.message);
      return;
    }
    if (mode === 'create') {
      const signedIn = await signIn(email, password, '/');
      location.assign(signedIn.ok ? '/' : '/signin');
    } else {
      location.assign('/');
    }
  }

  return (
    <form onSubmit={submit} className="space-y-3">
      {mode === 'create' && (
        <>
          <input type="hidden" name="username" autoComplete="username" value={email} />
          <div>
            <label className="label" htmlFor="name">Your name</label>
            <input className="field" id="name" name="name" required maxLength={200} autoComplete="name" autoFocus />
          </div>
          <div>
            <label className="label" htmlFor="password">Choose a password (at least 10 characters)</label>
            <input className="field" id="password" name="password" type="password" minLength={10} required autoComplete="new-password" />
          </div>
          <div>
            <label className="label" htmlFor="repeat">Password again</label>
            <input className="field" id="repeat" name="repeat" type="password" minLength={10} required autoComplete="new-password" />
          </div>
        </>
      )}
      {error && <p className="error-text" role="alert">{error}</p>}
      <button className="button w-full justify-center" type="submit" disabled={busy}>
        {busy ? 'Joining…' : mode === 'create' ? 'Create account and join' : `Join ${teamName}`}
      </button>
    </form>
  );
}
