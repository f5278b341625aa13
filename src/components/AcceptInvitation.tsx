import { signIn } from '../lib/api/auth';
import { teamsApi } from '../lib/api/teams';
import { useFormSubmit } from './use-form-submit';

/**
 * Accepts an invitation: either joins as the signed-in user, or creates the account (name and
 * password) and signs in.
 */
export default function AcceptInvitation({ token, email, mode, teamName }: { token: string; email: string; mode: 'join' | 'create'; teamName: string }) {
  const { busy, error, onSubmit } = useFormSubmit(async (form) => {
    const password = String(form.get('password') ?? '');
    if (mode === 'create' && password !== String(form.get('repeat') ?? '')) return 'The two passwords differ.';
    const body = mode === 'create' ? { name: String(form.get('name') ?? ''), password } : {};
    const result = await teamsApi.acceptInvitation(token, body);
    if (!result.ok) return result.error.message;
    if (mode === 'create') {
      const signedIn = await signIn(email, password, '/');
      location.assign(signedIn.ok ? '/' : '/signin');
    } else {
      location.assign('/');
    }
  });

  return (
    <form onSubmit={onSubmit} className="space-y-3">
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
