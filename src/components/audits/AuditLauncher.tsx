import { useMemo, useState, type FormEvent, type ReactNode } from 'react';
import type { AuditFormWave } from '../../lib/server/audit-jobs/audit-form-data';
import type { AuditSummary } from '../../lib/server/audit-jobs/audit-jobs';
import type { EngineSettings } from '../../lib/engine/engine-settings';
import { callApi } from '../api-client';
import { AUDIT_STARTED_EVENT } from './AuditList';
import AuditStatusRow from './AuditStatusRow';

/** A number field of the form: its settings key, label, how it is shown (percent or not) and its limits. */
interface NumberField {
  key: keyof EngineSettings;
  label: string;
  hint: string;
  step: string;
  min: number;
  max?: number;
  /** Shown and typed as a percentage; sent as a share. */
  percent?: boolean;
}

const thresholdFields: NumberField[] = [
  { key: 'strongPairThreshold', label: 'Strong pair, |r| at least', hint: 'after reverse-keying', step: '0.01', min: 0.01, max: 1 },
  { key: 'conditionIndexThreshold', label: 'Near-dependency: condition index at least', hint: 'Belsley, Kuh & Welsch', step: '1', min: 1 },
  { key: 'varianceProportionThreshold', label: '…with variance proportions at least', hint: 'on two or more items', step: '0.05', min: 0, max: 1 },
  { key: 'stabilityThreshold', label: 'Stable when made in at least', hint: 'share of resamples', step: '1', min: 0, max: 100, percent: true },
];

const constraintFields: NumberField[] = [
  { key: 'minItemsPerScale', label: 'Items per scale, at least', hint: 'a scale never falls below', step: '1', min: 1 },
  { key: 'alphaFloor', label: "Scale alpha, at least", hint: 'after the cut', step: '0.01', min: 0, max: 1 },
  { key: 'maxAlphaDrop', label: 'Alpha may drop by at most', hint: 'per scale', step: '0.01', min: 0, max: 1 },
  { key: 'maxCutShare', label: 'Items cut, at most', hint: 'share of usable items', step: '1', min: 0, max: 100, percent: true },
  { key: 'secondsPerItem', label: 'Answering time per item, seconds', hint: 'for minutes saved', step: '0.5', min: 0.5 },
];

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
export default function AuditLauncher({ waves, engineDefaults }: { waves: AuditFormWave[]; engineDefaults: EngineSettings }) {
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

  function defaultHint(field: NumberField): string {
    const value = defaults[field.key] as number;
    const engine = engineDefaults[field.key] as number;
    const text = `${shown(value, field.percent)}${field.percent ? '%' : ''}`;
    return value === engine ? `${field.hint}; default ${text}` : `${field.hint}; this study's default ${text}`;
  }

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const settings: Record<string, unknown> = {
      method: String(form.get('method')),
      missing: String(form.get('missing')),
      outcome: form.get('outcome') ? String(form.get('outcome')) : null,
      locked: [...locked].sort(),
    };
    for (const name of ['bootstrap', 'seed']) {
      const text = String(form.get(name) ?? '').trim();
      if (text !== '') settings[name] = Number(text);
    }
    for (const field of [...thresholdFields, ...constraintFields]) {
      const text = String(form.get(field.key) ?? '').trim();
      if (text === '') continue;
      const value = Number(text);
      settings[field.key] = field.percent ? Math.round(value * 10) / 1000 : value;
    }
    setBusy(true);
    setError('');
    const answer = await callApi<{ audit: AuditSummary; reused: boolean }>('POST', `/api/waves/${encodeURIComponent(wave.id)}/audits`, { settings });
    setBusy(false);
    if (!answer.ok) {
      setError(answer.message);
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
      <div className="grid gap-5 md:grid-cols-3">
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
          <Field id="audit-method" label="Correlation" hint="polychoric suits ordinal answers; it takes longer">
            <select className="field" id="audit-method" name="method" defaultValue={defaults.method}>
              <option value="pearson">Pearson</option>
              <option value="spearman">Spearman (ranks)</option>
              <option value="polychoric">Polychoric</option>
            </select>
          </Field>
          <Field id="audit-missing" label="Missing answers" hint="pairwise keeps the most answers">
            <select className="field" id="audit-missing" name="missing" defaultValue={defaults.missing}>
              <option value="pairwise">Pairwise deletion</option>
              <option value="listwise">Listwise deletion</option>
            </select>
          </Field>
          <Field id="audit-outcome" label="Outcome for the driver model" hint={wave.outcomes.length ? 'optional' : 'this wave has no outcome column'}>
            <select className="field" id="audit-outcome" name="outcome" defaultValue="" disabled={wave.outcomes.length === 0}>
              <option value="">None</option>
              {wave.outcomes.map((outcome) => <option key={outcome.id} value={outcome.id}>{outcome.header}</option>)}
            </select>
          </Field>
        </fieldset>

        <fieldset className="grid content-start gap-3">
          <legend className="mb-2 text-xs font-semibold uppercase tracking-wide text-ink-faint">Overlap and stability</legend>
          {thresholdFields.map((field) => (
            <Field key={field.key} id={`audit-${field.key}`} label={field.label + (field.percent ? ' (%)' : '')} hint={defaultHint(field)}>
              <input className="field num w-32" id={`audit-${field.key}`} name={field.key} type="number" step={field.step} min={field.min} max={field.max} defaultValue={shown(defaults[field.key] as number, field.percent)} />
            </Field>
          ))}
          <div className="grid grid-cols-2 gap-3">
            <Field id="audit-bootstrap" label="Resamples" hint={`default ${defaults.bootstrap}; 0 skips`}>
              <input className="field num" id="audit-bootstrap" name="bootstrap" type="number" step="1" min={0} max={10000} defaultValue={defaults.bootstrap} />
            </Field>
            <Field id="audit-seed" label="Seed" hint={`default ${defaults.seed}`}>
              <input className="field num" id="audit-seed" name="seed" type="number" step="1" defaultValue={defaults.seed} />
            </Field>
          </div>
        </fieldset>

        <fieldset className="grid content-start gap-3">
          <legend className="mb-2 text-xs font-semibold uppercase tracking-wide text-ink-faint">Constraints on the cut</legend>
          {constraintFields.map((field) => (
            <Field key={field.key} id={`audit-${field.key}`} label={field.label + (field.percent ? ' (%)' : '')} hint={defaultHint(field)}>
              <input className="field num w-32" id={`audit-${field.key}`} name={field.key} type="number" step={field.step} min={field.min} max={field.max} defaultValue={shown(defaults[field.key] as number, field.percent)} />
            </Field>
          ))}
        </fieldset>
      </div>

      <details className="rounded border border-rule px-3 py-2">
        <summary className="cursor-pointer text-sm font-semibold">
          Locked items <span className="font-normal text-ink-soft">({locked.size === 0 ? 'none: every item may be proposed' : `${locked.size} never proposed for cutting`})</span>
        </summary>
        <p className="mt-2 text-xs text-ink-faint">Trend, mandated or licensed items: the audit still measures them but never proposes them for cutting or rewording.</p>
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
