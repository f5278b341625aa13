import { useMemo, useState, type FormEvent, type ReactNode } from 'react';
import { auditsApi, type AuditFormWave, type AuditSummary } from '../../lib/api/audits';
import { AUDIT_SETTINGS, DEFAULT_AUDIT_SETTINGS, formFieldProblem, formFieldValue, type FormPlacement, type SettingDescriptor } from '../../lib/audit/settings-table';
import { AUDIT_STARTED_EVENT } from './AuditList';
import AuditStatusRow from './AuditStatusRow';

/** A field of the form, generated from the settings table (src/lib/audit/settings-table.ts). */
type FormField = SettingDescriptor & { form: FormPlacement };

const formFields = AUDIT_SETTINGS.filter((setting): setting is FormField => setting.form !== null && !setting.testOnly);
const fieldsOf = (group: FormPlacement['group']): FormField[] => formFields.filter((field) => field.form.group === group);
const choiceFields = formFields.filter((field) => field.domain.kind === 'choice');
const numberFields = formFields.filter((field) => field.domain.kind === 'number');

const outcomeSetting = AUDIT_SETTINGS.find((setting) => setting.name === 'outcome')!;
const lockedSetting = AUDIT_SETTINGS.find((setting) => setting.name === 'locked')!;

/** The bounds an input shows: an open bound moves in by one step (e.g. above 0 with step 0.01 → 0.01). */
function inputBounds(field: FormField): { min?: number; max?: number } {
  if (field.domain.kind !== 'number') return {};
  const scale = field.form.percent ? 100 : 1;
  const step = Number(field.form.step ?? '1');
  const min = field.domain.off !== undefined ? Math.min(field.domain.off, field.domain.min) * scale : field.domain.min * scale + (field.domain.minOpen ? step : 0);
  const max = field.domain.max * scale - (field.domain.maxOpen ? step : 0);
  return { min: Math.round(min * 1e6) / 1e6, max: Math.round(max * 1e6) / 1e6 };
}

function shown(value: number, percent?: boolean): string {
  return percent ? String(Math.round(value * 1000) / 10) : String(value);
}

function Field({ id, label, hint, children }: { id: string; label: string; hint: string; children: ReactNode }) {
  return (
    <div>
      <label className="label" htmlFor={id}>{label}</label>
      {children}
      <p className="mt-0.5 text-xs text-ink-faint">{hint}</p>
    </div>
  );
}

/**
 * The form that starts an audit of a confirmed wave: method, missing-data policy, outcome,
 * bootstrap size and seed, the main thresholds and constraints (each showing its default), and
 * the locked items. After starting, the audit's progress shows below the form until it is done,
 * then a link to its page.
 */
export default function AuditLauncher({ waves }: { waves: AuditFormWave[] }) {
  const [waveId, setWaveId] = useState(waves[waves.length - 1]?.id ?? '');
  const wave = waves.find((entry) => entry.id === waveId) ?? waves[0];
  const defaults = wave.defaults;
  const [locked, setLocked] = useState<Set<string>>(() => new Set(defaults.locked));
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState('');
  const [started, setStarted] = useState<{ audit: AuditSummary; reused: boolean } | null>(null);

  const scales = useMemo(() => {
    const groups = new Map<string, AuditFormWave['items']>();
    for (const item of wave.items) {
      const name = item.scale ?? 'Without a scale';
      groups.set(name, [...(groups.get(name) ?? []), item]);
    }
    return [...groups.entries()];
  }, [wave]);

  function defaultHint(field: FormField): string {
    const value = (defaults as unknown as Record<string, unknown>)[field.name];
    const engine = (DEFAULT_AUDIT_SETTINGS as unknown as Record<string, unknown>)[field.name];
    const text = typeof value === 'number' ? `${shown(value, field.form.percent)}${field.form.percent ? '%' : ''}` : String(value);
    return `${field.help} ${value === engine ? 'Default' : "This study's default"} ${text}.`;
  }

  function numberInput(field: FormField) {
    const id = `audit-${field.name}`;
    const value = (defaults as unknown as Record<string, unknown>)[field.name] as number;
    return (
      <Field key={field.name} id={id} label={field.label + (field.form.percent ? ' (%)' : '')} hint={defaultHint(field)}>
        <input className="field num w-32" id={id} name={field.name} type="number" step={field.form.step} {...inputBounds(field)} defaultValue={shown(value, field.form.percent)} />
      </Field>
    );
  }

  function choiceInput(field: FormField) {
    const id = `audit-${field.name}`;
    const choices = field.domain.kind === 'choice' ? field.domain.choices : [];
    return (
      <Field key={field.name} id={id} label={field.label} hint={field.help}>
        <select className="field" id={id} name={field.name} defaultValue={String((defaults as unknown as Record<string, unknown>)[field.name])}>
          {choices.map((choice) => <option key={choice} value={choice}>{field.form.choices?.[choice] ?? choice}</option>)}
        </select>
      </Field>
    );
  }

  const input = (field: FormField) => (field.domain.kind === 'choice' ? choiceInput(field) : numberInput(field));

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const settings: Record<string, unknown> = {
      outcome: form.get('outcome') ? String(form.get('outcome')) : null,
      locked: [...locked].sort(),
    };
    for (const field of choiceFields) settings[field.name] = String(form.get(field.name));
    const problems: string[] = [];
    for (const field of numberFields) {
      const text = String(form.get(field.name) ?? '').trim();
      if (text === '') continue;
      const problem = formFieldProblem(field, text);
      if (problem !== null) problems.push(problem);
      settings[field.name] = formFieldValue(field, text);
    }
    // Said here in the form's words; the server refuses the same values (naming the API's keys).
    if (problems.length > 0) {
      setError(problems.join(' '));
      return;
    }
    setBusy(true);
    setError('');
    const answer = await auditsApi.start(wave.id, { settings });
    setBusy(false);
    if (!answer.ok) {
      setError(answer.error.message);
      return;
    }
    setStarted(answer.data);
    window.dispatchEvent(new CustomEvent(AUDIT_STARTED_EVENT, { detail: answer.data.audit }));
  }

  function toggle(id: string) {
    setLocked((current) => {
      const next = new Set(current);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  }

  return (
    <form onSubmit={submit} className="grid gap-5" data-testid="audit-form" key={wave.id}>
      <div className="grid grid-cols-[minmax(0,1fr)] gap-5 md:grid-cols-3">
        <fieldset className="grid content-start gap-3">
          <legend className="mb-2 text-xs font-semibold uppercase tracking-wide text-ink-faint">Data</legend>
          {waves.length > 1 && (
            <Field id="audit-wave" label="Wave" hint={`${wave.respondents - wave.excluded} respondents after screening`}>
              <select
                className="field"
                id="audit-wave"
                value={wave.id}
                onChange={(event) => {
                  const next = waves.find((entry) => entry.id === event.target.value);
                  setWaveId(event.target.value);
                  setLocked(new Set(next?.defaults.locked ?? []));
                }}
              >
                {waves.map((entry) => <option key={entry.id} value={entry.id}>{entry.label}</option>)}
              </select>
            </Field>
          )}
          {fieldsOf('data').map(input)}
          <Field id="audit-outcome" label={outcomeSetting.label} hint={wave.outcomes.length ? outcomeSetting.help : 'This wave has no outcome column.'}>
            <select className="field" id="audit-outcome" name="outcome" defaultValue="" disabled={wave.outcomes.length === 0}>
              <option value="">None</option>
              {wave.outcomes.map((outcome) => <option key={outcome.id} value={outcome.id}>{outcome.header}</option>)}
            </select>
          </Field>
        </fieldset>

        <fieldset className="grid content-start gap-3">
          <legend className="mb-2 text-xs font-semibold uppercase tracking-wide text-ink-faint">Overlap and stability</legend>
          {fieldsOf('overlap').map(input)}
        </fieldset>

        <fieldset className="grid content-start gap-3">
          <legend className="mb-2 text-xs font-semibold uppercase tracking-wide text-ink-faint">Constraints on the cut</legend>
          {fieldsOf('constraints').map(input)}
        </fieldset>
      </div>

      <details className="rounded border border-rule px-3 py-2" data-testid="audit-more-settings">
        <summary className="cursor-pointer text-sm font-semibold">Further thresholds <span className="font-normal text-ink-soft">(merge, reword, near-dependency VIF, interval, parallel analysis)</span></summary>
        <div className="mt-2 grid gap-3 sm:grid-cols-2 lg:grid-cols-3">{fieldsOf('more').map(input)}</div>
      </details>

      <details className="rounded border border-rule px-3 py-2">
        <summary className="cursor-pointer text-sm font-semibold">
          Locked items <span className="font-normal text-ink-soft">({locked.size === 0 ? 'none: every item may be proposed' : `${locked.size} never proposed for cutting`})</span>
        </summary>
        <p className="mt-2 text-xs text-ink-faint">{lockedSetting.help}</p>
        <div className="mt-2 grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {scales.map(([scale, items]) => (
            <fieldset key={scale}>
              <legend className="text-xs font-semibold text-ink-soft">{scale}</legend>
              {items.map((item) => (
                <label key={item.id} className="flex items-start gap-2 py-0.5 text-sm" title={item.text ?? undefined}>
                  <input type="checkbox" className="mt-1" checked={locked.has(item.id)} onChange={() => toggle(item.id)} />
                  <span><span className="font-semibold">{item.id}</span>{item.text ? <span className="text-ink-soft"> · {item.text}</span> : null}</span>
                </label>
              ))}
            </fieldset>
          ))}
        </div>
      </details>

      <div className="flex flex-wrap items-center gap-3">
        <button className="button" type="submit" disabled={busy}>{busy ? 'Starting…' : 'Start audit'}</button>
        <span className="text-sm text-ink-soft">
          {wave.label}: {wave.respondents - wave.excluded} respondents ({wave.excluded} set aside by screening), {wave.items.length} items. The audit runs in the background; you may leave this page.
        </span>
      </div>
      {error && <p className="error-text" role="alert" data-testid="audit-form-error">{error}</p>}
      {started && (
        <div className="rounded border border-rule bg-paper px-3" aria-live="polite">
          {started.reused && <p className="pt-2 text-sm text-ink-soft" data-testid="audit-reused">An audit of this wave with exactly these settings exists already; here it is.</p>}
          <ul>
            <AuditStatusRow key={started.audit.id + started.audit.createdAt + started.audit.status} initial={started.audit} canRun />
          </ul>
        </div>
      )}
    </form>
  );
}
