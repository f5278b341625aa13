import { useState } from 'react';
import { studiesApi } from '../lib/api/studies';

/** Deletes a study after the owner types its name. */
export default function DeleteStudyButton({ studyId, studyName }: { studyId: string; studyName: string }) {
  const [open, setOpen] = useState(false);
  const [typed, setTyped] = useState('');
  const [error, setError] = useState('');
  const [busy, setBusy] = useState(false);

  async function remove() {
    setBusy(true);
    const result = await studiesApi.delete(studyId);
    if (result.ok) {
      location.assign('/');
      return;
    }
    setError(result.error.message);
    setBusy(false);
  }

  if (!open) {
    return (
      <button type="button" className="button button-danger" onClick={() => setOpen(true)}>
        Delete study…
      </button>
    );
  }
  return (
    <div className="panel space-y-2 p-4">
      <p className="text-sm">
        This deletes the study with its waves, uploads, audits, decisions and comments. It cannot be undone. Type the study's name to confirm.
      </p>
      <input className="field" aria-label="Study name to confirm" value={typed} onChange={(e) => setTyped(e.target.value)} />
      <div className="flex gap-2">
        <button type="button" className="button button-danger" disabled={busy || typed !== studyName} onClick={remove}>
          Delete for good
        </button>
        <button type="button" className="button button-quiet" onClick={() => setOpen(false)}>
          Keep it
        </button>
      </div>
      {error && <p className="error-text" role="alert">{error}</p>}
    </div>
  );
}
