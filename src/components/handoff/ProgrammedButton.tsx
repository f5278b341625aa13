import { useState } from 'react';
import type { ProgrammedResponse } from '../../lib/api/handoff';
import { listPhrase } from '../../lib/words/handoff';
import { callApi } from '../../lib/api/client';

/** Marks a published version as programmed (field manager, owner). */
export default function ProgrammedButton({ studyId, version }: { studyId: string; version: number }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState('');
  const [done, setDone] = useState<ProgrammedResponse | null>(null);

  async function mark() {
    setBusy(true);
    setError('');
    const result = await callApi<ProgrammedResponse>('POST', `/api/studies/${studyId}/cut-list/programmed`, { version });
    setBusy(false);
    if (result.ok) setDone(result.data);
    else setError(result.error.message);
  }

  if (done) {
    return (
      <p className="text-sm" role="status" data-testid="programmed-result">
        Version {done.version.number} is marked as programmed.{' '}
        {done.notified.length > 0 ? `E-mailed ${listPhrase(done.notified, 4)}.` : ''}
      </p>
    );
  }
  return (
    <div className="space-y-1">
      <button type="button" className="button" disabled={busy} onClick={mark} data-testid="programmed-button">
        {busy ? 'Marking…' : `Mark version ${version} as programmed`}
      </button>
      {error && (
        <p className="error-text" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}
