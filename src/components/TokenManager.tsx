import { useState, type FormEvent } from 'react';
import { tokensApi, type ApiTokenView } from '../lib/api/tokens';
import { formatDay } from './date-words';


/** Lists, creates and revokes personal API tokens; a new token's secret is shown once. */
export default function TokenManager({ initialTokens }: { initialTokens: ApiTokenView[] }) {
  const [tokens, setTokens] = useState(initialTokens);
  const [secret, setSecret] = useState<string | null>(null);
  const [error, setError] = useState('');
  const [busy, setBusy] = useState(false);

  async function create(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const name = String(new FormData(formElement).get('name') ?? '');
    setBusy(true);
    setError('');
    const result = await tokensApi.create({ name });
    setBusy(false);
    if (!result.ok) {
      setError(result.error.message);
      return;
    }
    formElement.reset();
    setTokens([result.data.token, ...tokens]);
    setSecret(result.data.secret);
  }

  async function revoke(token: ApiTokenView) {
    if (!confirm(`Revoke "${token.name}"? Scripts using it stop working at once.`)) return;
    const result = await tokensApi.revoke(token.id);
    if (result.ok) setTokens(tokens.filter((t) => t.id !== token.id));
    else setError(result.error.message);
  }

  return (
    <div className="space-y-4">
      <form onSubmit={create} className="flex flex-wrap items-end gap-2">
        <div className="min-w-56 flex-1">
          <label className="label" htmlFor="token-name">New token for</label>
          <input className="field" id="token-name" name="name" required maxLength={100} placeholder="e.g. nightly export script" />
        </div>
        <button className="button" type="submit" disabled={busy}>Create token</button>
      </form>
      {secret && (
        <div className="notice space-y-1" role="status">
          <p className="font-semibold">Copy the token now: it is shown this once.</p>
          <code className="block break-all rounded bg-card px-2 py-1 font-mono text-sm" data-testid="new-token">{secret}</code>
          <p className="text-sm">Send it in the header <code className="font-mono">Authorization: Bearer pd_…</code>; it acts with your roles, nothing more.</p>
        </div>
      )}
      {error && <p className="error-text" role="alert">{error}</p>}
      {tokens.length === 0 ? (
        <p className="empty-state">No tokens. Scripts that call the API need one.</p>
      ) : (
        <div className="relative overflow-x-auto">
          <table className="dense-table">
            <thead>
              <tr>
                <th scope="col">Name</th>
                <th scope="col">Starts with</th>
                <th scope="col" className="num">Created</th>
                <th scope="col" className="num">Last used</th>
                <th scope="col"><span className="sr-only">Revoke</span></th>
              </tr>
            </thead>
            <tbody>
              {tokens.map((token) => (
                <tr key={token.id}>
                  <td className="font-semibold">{token.name}</td>
                  <td><code className="font-mono text-sm">{token.prefix}…</code></td>
                  <td className="num">{formatDay(token.createdAt)}</td>
                  <td className="num text-ink-soft">{token.lastUsedAt ? formatDay(token.lastUsedAt) : 'never'}</td>
                  <td className="text-right">
                    <button type="button" className="text-sm font-semibold text-brick-700 hover:underline" onClick={() => void revoke(token)}>Revoke</button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
