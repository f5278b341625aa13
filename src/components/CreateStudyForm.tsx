import { useState } from 'react';
import { studiesApi } from '../lib/api/studies';
import { useFormSubmit } from './use-form-submit';

/** Creates a study in one team, then opens it. */
export default function CreateStudyForm({ teamId }: { teamId: string }) {
  const [open, setOpen] = useState(false);
  const { busy, error, onSubmit } = useFormSubmit(async (form) => {
    const result = await studiesApi.create({
      teamId,
      name: String(form.get('name') ?? ''),
      description: String(form.get('description') ?? ''),
    });
    if (!result.ok) return result.error.message;
    location.assign(`/studies/${result.data.study.id}`);
  });

  if (!open) {
    return (
      <button type="button" className="button button-quiet" onClick={() => setOpen(true)} data-testid={`new-study-${teamId}`}>
        + New study
      </button>
    );
  }
  return (
    <form onSubmit={onSubmit} className="panel mt-3 grid gap-3 p-4 sm:grid-cols-[1fr_2fr_auto] sm:items-end">
      <div>
        <label className="label" htmlFor={`study-name-${teamId}`}>Study name</label>
        <input className="field" id={`study-name-${teamId}`} name="name" required maxLength={200} autoFocus placeholder="e.g. Staff survey 2027" />
      </div>
      <div>
        <label className="label" htmlFor={`study-description-${teamId}`}>What the questionnaire is for (optional)</label>
        <input className="field" id={`study-description-${teamId}`} name="description" maxLength={4000} />
      </div>
      <div className="flex gap-2">
        <button className="button" type="submit" disabled={busy}>{busy ? 'Creating…' : 'Create'}</button>
        <button className="button button-quiet" type="button" onClick={() => setOpen(false)}>Cancel</button>
      </div>
      {error && <p className="error-text sm:col-span-3" role="alert">{error}</p>}
    </form>
  );
}
