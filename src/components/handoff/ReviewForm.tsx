import { useState } from 'react';
import type { ReviewResponse, ReviewVerdict } from '../../lib/api/handoff';
import { listPhrase, reviewStateWords } from '../../lib/words/handoff';
import { callApi } from '../../lib/api/client';

/** Approve the latest version, or ask for changes with a comment (client reviewer, owner). */
export default function ReviewForm({ studyId, version }: { studyId: string; version: number }) {
  const [comment, setComment] = useState('');
  const [busy, setBusy] = useState<ReviewVerdict | null>(null);
  const [error, setError] = useState('');
  const [done, setDone] = useState<ReviewResponse | null>(null);

  async function send(verdict: ReviewVerdict) {
    setBusy(verdict);
    setError('');
    const result = await callApi<ReviewResponse>('POST', `/api/studies/${studyId}/review`, { verdict, comment });
    setBusy(null);
    if (result.ok) setDone(result.data);
    else setError(result.error.message);
  }

  if (done) {
    return (
      <div className="space-y-1 text-sm" role="status" data-testid="review-result">
        <p className="font-semibold">{reviewStateWords[done.state]} (version {done.latestVersion}).</p>
        {done.notified && done.notified.length > 0 && <p className="text-ink-soft">E-mailed {listPhrase(done.notified, 4)}.</p>}
        <button type="button" className="button button-quiet py-1" onClick={() => setDone(null)}>
          Review again
        </button>
      </div>
    );
  }
  return (
    <div className="space-y-2">
      <label className="label block text-sm" htmlFor="review-comment">
        Comment on version {version} (required when you ask for changes)
      </label>
      <textarea id="review-comment" className="field w-full" rows={3} maxLength={5000} value={comment} onChange={(event) => setComment(event.target.value)} />
      <div className="flex flex-wrap gap-2">
        <button type="button" className="button" disabled={busy !== null} onClick={() => send('approved')} data-testid="approve-button">
          {busy === 'approved' ? 'Sending…' : `Approve version ${version}`}
        </button>
        <button type="button" className="button button-quiet" disabled={busy !== null} onClick={() => send('changes_requested')} data-testid="request-changes-button">
          {busy === 'changes_requested' ? 'Sending…' : 'Ask for changes'}
        </button>
      </div>
      {error && (
        <p className="error-text" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}
