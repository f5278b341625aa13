import { useState, type FormEvent } from 'react';
import { safeNext, signIn } from '../lib/api/auth';

/** The sign-in form: e-mail and password, one message that never says which part was wrong. */
export default function SignInForm({ next, initialError }: { next: string; initialError?: string }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState(initialError ?? '');

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setBusy(true);
    setError('');
    const result = await signIn(String(form.get('email') ?? ''), String(form.get('password') ?? ''), safeNext(next));
    if (result.ok) {
      location.assign(result.url);
      return;
    }
    setError(result.message);
    setBusy(false);
  }

  return (
    <form onSubmit={submit} className="space-y-4" noValidate>
      <div>
        <label className="label" htmlFor="email">E-mail</label>
        <input className="field" id="email" name="email" type="email" autoComplete="username" required autoFocus />
      </div>
      <div>
        <label className="label" htmlFor="password">Password</label>
        <input className="field" id="password" name="password" type="password" autoComplete="current-password" required />
      </div>
      {error && (
        <p className="error-text" role="alert" data-testid="signin-error">
          {error}
        </p>
      )}
      <button className="button w-full justify-center" type="submit" disabled={busy}>
        {busy ? 'Signing in…' : 'Sign in'}
      </button>
    </form>
  );
}
