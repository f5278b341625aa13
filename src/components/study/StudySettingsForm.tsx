import { useState, type FormEvent } from 'react';
import type { StudySettingsRequest } from '../../lib/api/cut-list';
import { callApi } from '../../lib/api/client';

interface Props {
  studyId: string;
  name: string;
  description: string;
  lockedItems: string[];
  minItemsPerScale: number | null;
  alphaFloor: number | null;
  /** Items that can be locked (the latest confirmed wave's), with their wording. */
  items: { id: string; scale: string | null; text: string | null }[];
}

/**
 * The study's name, description and default constraints (locked items, minimum items per scale,
 * alpha floor): audits started later take them where their own settings are silent, and the
 * decisions workspace shows them where decisions are made.
 */
export default function StudySettingsForm(props: Props) {
  const [open, setOpen] = useState(false);
  const [name, setName] = useState(props.name);
  const [description, setDescription] = useState(props.description);
  const [locked, setLocked] = useState(new Set(props.lockedItems));
  const [minItems, setMinItems] = useState(props.minItemsPerScale === null ? '' : String(props.minItemsPerScale));
  const [alphaFloor, setAlphaFloor] = useState(props.alphaFloor === null ? '' : String(props.alphaFloor));
  const [error, setError] = useState('');
  const [busy, setBusy] = useState(false);

  async function save(event: FormEvent) {
    event.preventDefault();
    const request: StudySettingsRequest = {
      name,
      description,
      settings: {
        lockedItems: [...locked],
        minItemsPerScale: minItems.trim() === '' ? null : Number(minItems),
        alphaFloor: alphaFloor.trim() === '' ? null : Number(alphaFloor),
      },
    };
    setBusy(true);
    const result = await callApi('PATCH', `/api/studies/${props.studyId}`, request);
    if (result.ok) {
      location.reload();
      return;
    }
    setBusy(false);
    setError(result.error.message);
  }

  if (!open) {
    return (
      <button type="button" className="button button-quiet py-1 text-sm" onClick={() => setOpen(true)} data-testid="edit-study">
        Edit study settings
      </button>
    );
  }
  const toggle = (id: string, on: boolean) => {
    const next = new Set(locked);
    if (on) next.add(id);
    else next.delete(id);
    setLocked(next);
  };
  return (
    <form onSubmit={save} className="panel mt-3 space-y-4 p-4" data-testid="study-settings-form">
      <div className="grid grid-cols-[minmax(0,1fr)] gap-4 md:grid-cols-2">
        <div>
          <label className="label" htmlFor="study-name">Name</label>
          <input id="study-name" className="field" value={name} required maxLength={200} onChange={(e) => setName(e.target.value)} />
        </div>
        <div className="grid grid-cols-2 gap-3">
          <div>
            <label className="label" htmlFor="study-min-items">Items per scale, at least</label>
            <input id="study-min-items" className="field" type="number" min={1} step={1} value={minItems} onChange={(e) => setMinItems(e.target.value)} placeholder="engine default" />
          </div>
          <div>
            <label className="label" htmlFor="study-alpha-floor">Scale alpha, at least</label>
            <input id="study-alpha-floor" className="field" type="number" min={0} max={1} step={0.01} value={alphaFloor} onChange={(e) => setAlphaFloor(e.target.value)} placeholder="engine default" />
          </div>
        </div>
        <div className="md:col-span-2">
          <label className="label" htmlFor="study-description">Description</label>
          <textarea id="study-description" className="field" rows={2} maxLength={2000} value={description} onChange={(e) => setDescription(e.target.value)} />
        </div>
      </div>
      <fieldset>
        <legend className="label">Locked items <span className="font-normal text-ink-faint">(trend, mandated or validated: never proposed for cutting, never dropped or merged)</span></legend>
        {props.items.length === 0 ? (
          <p className="text-sm text-ink-faint">Items can be locked once a wave's column setup is confirmed.</p>
        ) : (
          <div className="max-h-56 overflow-auto rounded border border-rule p-2">
            <ul className="grid gap-x-4 gap-y-0.5 text-sm sm:grid-cols-2">
              {props.items.map((item) => (
                <li key={item.id}>
                  <label className="flex items-baseline gap-2" title={item.text ?? undefined}>
                    <input type="checkbox" className="h-4 w-4 accent-spruce-700" checked={locked.has(item.id)} onChange={(e) => toggle(item.id, e.target.checked)} />
                    <code>{item.id}</code>
                    <span className="truncate text-ink-soft">{item.text}</span>
                  </label>
                </li>
              ))}
            </ul>
          </div>
        )}
      </fieldset>
      {error && <p className="error-text" role="alert">{error}</p>}
      <div className="flex gap-2">
        <button type="submit" className="button" disabled={busy}>{busy ? 'Saving…' : 'Save settings'}</button>
        <button type="button" className="button button-quiet" onClick={() => setOpen(false)}>Cancel</button>
      </div>
    </form>
  );
}
