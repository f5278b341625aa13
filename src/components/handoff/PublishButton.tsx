import { useState } from 'react';
import type { PublishResponse } from '../../lib/api/handoff';
import { diffChangeWords, listPhrase } from '../../lib/words/handoff';
import { callApi } from '../../lib/api/client';

/**
 * Publishes the current decisions as the next version (owner, designer). Shows the server's
 * refusal as it is (it names the undecided items), or the new version with what changed.
 */
export default function PublishButton({ studyId, undecided, latestVersion }: { studyId: string; undecided: number; latestVersion: number | null }) {
  const [note, setNote] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState('');
  const [done, setDone] = useState<PublishResponse | null>(null);

  async function publish() {
    setBusy(true);
    setError('');
    const result = await callApi<PublishResponse>('POST', `/api/studies/${studyId}/cut-list/publish`, { note });
    setBusy(false);
    if (result.ok) {
      // The published list (with what changed) is the next thing the designer checks; the study
      // page's panel would otherwise still say nothing is published.
      setDone(result.data);
      location.assign(`/studies/${studyId}/field-list?published=${result.data.version.number}`);
    } else setError(result.error.message);
  }

  if (done) {
    const { version, notified } = done;
    const changed = version.diff.entries;
    return (
      <div className="space-y-2 text-sm" role="status" data-testid="publish-result">
        <p className="font-semibold">Version {version.number} is published.</p>
        <p>
          {version.diff.against === null
            ? 'This is the first version.'
            : changed.length === 0
              ? `Nothing differs from version ${version.diff.against}.`
              : `Against version ${version.diff.against}: ${changed.length} ${changed.length === 1 ? 'item' : 'items'} differ (${listPhrase(changed.map((entry) => `${entry.itemId}: ${diffChangeWords[entry.change].toLowerCase()}`), 6)}).`}
        </p>
        <p className="text-ink-soft">{notified.length > 0 ? `E-mailed ${listPhrase(notified, 6)}.` : 'Nobody else in the team to e-mail.'}</p>
        <a className="button button-quiet py-1" href={`/studies/${studyId}/field-list`}>See the published list</a>
      </div>
    );
  }
  return (
    <div className="space-y-2">
      <label className="label block text-sm" htmlFor="publish-note">
        Note for the field manager and the client (optional)
      </label>
      <textarea id="publish-note" className="field w-full" rows={2} maxLength={2000} value={note} onChange={(event) => setNote(event.target.value)} />
      <button type="button" className="button" disabled={busy} onClick={publish} data-testid="publish-button">
        {busy ? 'Publishing…' : latestVersion === null ? 'Publish the cut list' : `Publish version ${latestVersion + 1}`}
      </button>
      {undecided > 0 && !error && (
        <p className="text-xs text-ink-faint">
          {undecided} {undecided === 1 ? 'item is' : 'items are'} still undecided; publishing needs a decision for every item.
        </p>
      )}
      {error && (
        <p className="error-text" role="alert" data-testid="publish-error">
          {error}
        </p>
      )}
    </div>
  );
}
