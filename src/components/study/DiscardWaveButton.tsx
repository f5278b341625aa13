import { useState } from 'react';
import { callApi } from '../../lib/api/client';

/** Discards a wave whose column setup was never confirmed (after a second click). */
export default function DiscardWaveButton({ waveId, label }: { waveId: string; label: string }) {
  const [asking, setAsking] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState('');

  async function discard() {
    setBusy(true);
    const result = await callApi('DELETE', `/api/waves/${encodeURIComponent(waveId)}`);
    if (result.ok) {
      location.reload();
      return;
    }
    setBusy(false);
    setError(result.error.message);
  }

  if (!asking) {
    return (
      <button type="button" className="ml-2 text-sm font-semibold text-brick-700 underline-offset-2 hover:underline" onClick={() => setAsking(true)} data-testid="discard-wave">
        Discard
      </button>
    );
  }
  return (
    <span className="ml-2 inline-flex flex-wrap items-center gap-2 text-sm">
      <span>Discard “{label}” and its upload?</span>
      <button type="button" className="button button-danger py-0.5 text-sm" disabled={busy} onClick={discard} data-testid="discard-wave-confirm">Discard</button>
      <button type="button" className="button button-quiet py-0.5 text-sm" onClick={() => setAsking(false)}>Keep</button>
      {error && <span className="error-text" role="alert">{error}</span>}
    </span>
  );
}
