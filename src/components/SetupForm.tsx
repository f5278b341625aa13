import { signIn } from '../lib/api/auth';
import { setupApi } from '../lib/api/setup';
import { useFormSubmit } from './use-form-submit';

/** First run: creates the first owner and their team, then signs in. */
export default function SetupForm() {
  const { busy, error, onSubmit } = useFormSubmit(async (form) => {
    const email = String(form.get('email') ?? '').trim();
    const password = String(form.get('password') ?? '');
    if (password !== String(form.get('repeat') ?? '')) return 'The two passwords differ.';
    const result = await setupApi.setUp({ teamName: String(form.get('teamName') ?? ''), name: String(form.get('name') ?? ''), email, password });
    if (!result.ok) return result.error.message;
    const signedIn = await signIn(email, password, '/');
    location.assign(signedIn.ok ? '/' : '/signin');
  });

  return (
    <form onSubmit={onSubmit} className="space-y-3">
      <div>
        <label className="label" htmlFor="team-name">Team name</label>
        <input className="field" id="team-name" name="teamName" required maxLength={200} autoFocus placeholder="e.g. Survey Methods Unit" />
      </div>
      <div>
        <label className="label" htmlFor="name">Your name</label>
        <input className="field" id="name" name="name" required maxLength={200} autoComplete="name" />
      </div>
      <div>
        <label className="label" htmlFor="email">E-mail</label>
        <input className="field" id="email" name="email" type="email" required maxLength={320} autoComplete="username" />
      </div>
      <div>
        <label className="label" htmlFor="password">Password (at least 10 characters)</label>
        <input className="field" id="password" name="password" type="password" minLength={10} required autoComplete="new-password" />
      </div>
      <div>
        <label className="label" htmlFor="repeat">Password again</label>
        <input className="field" id="repeat" name="repeat" type="password" minLength={10} required autoComplete="new-password" />
      </div>
      {error && <p className="error-text" role="alert">{error}</p>}
      <button className="button w-full justify-center" type="submit" disabled={busy}>{busy ? 'Setting up…' : 'Create team and sign in'}</button>
    </form>
  );
}
