import { useEffect, useState } from 'react';
import type { ScreeningDetail } from '../../lib/api/waves';
import { callApi } from '../../lib/api/client';
import ScreeningStep from '../upload/ScreeningStep';

interface WaveAnswer {
  wave: { label: string; status: string };
  screening: ScreeningDetail | null;
  screeningNote: string | null;
  exclusions: number[] | null;
}

/**
 * Changes which respondents of a stored (confirmed) wave are left out of audits: the screening
 * flags and the flagged respondents, as at upload, then PUT /api/waves/{id}/setup with the
 * exclusions alone. Audits already run keep their own; the next audit uses the new set.
 */
export default function WaveExclusions({ waveId, studyId }: { waveId: string; studyId: string }) {
  const [wave, setWave] = useState<WaveAnswer | null>(null);
  const [excluded, setExcluded] = useState<Set<number>>(new Set());
  const [error, setError] = useState('');
  const [saved, setSaved] = useState('');
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    void callApi<WaveAnswer>('GET', `/api/waves/${encodeURIComponent(waveId)}`).then((result) => {
      if (!result.ok) {
        setError(result.error.message);
        return;
      }
      setWave(result.data);
      setExcluded(new Set(result.data.exclusions ?? []));
    });
  }, [waveId]);

  async function save() {
    setBusy(true);
    setSaved('');
    const result = await callApi('PUT', `/api/waves/${encodeURIComponent(waveId)}/setup`, { exclusions: [...excluded].sort((a, b) => a - b) });
    setBusy(false);
    if (!result.ok) {
      setError(result.error.message);
      return;
    }
    setError('');
    setSaved(`Saved: ${excluded.size} ${excluded.size === 1 ? 'respondent is' : 'respondents are'} left out of the next audits. Audits already run keep the respondents they used.`);
  }

  if (!wave) return error ? <p className="error-text" role="alert">{error}</p> : <p className="text-ink-soft">Loading the screening…</p>;
  if (!wave.screening) return <div className="empty-state">{wave.screeningNote ?? 'No screening has been made for this wave.'}</div>;
  return (
    <div className="space-y-4" data-testid="wave-exclusions">
      <ScreeningStep screening={wave.screening} excluded={excluded} onChange={setExcluded} headingLevel={2} />
      <div className="flex flex-wrap items-center gap-3">
        <button type="button" className="button" disabled={busy} onClick={save} data-testid="save-exclusions">{busy ? 'Saving…' : 'Save the exclusions'}</button>
        <a href={`/studies/${studyId}`}>Back to the study</a>
        {saved && <span className="text-sm text-spruce-800" role="status">{saved}</span>}
        {error && <span className="error-text" role="alert">{error}</span>}
      </div>
    </div>
  );
}
