import { useCallback, useState, type FormEvent } from 'react';
import { wavesApi, type UploadWaveResponse, type WaveView } from '../../lib/api/waves';
import { formatMebibytes } from '../../lib/words/formats';
import DropZone from './DropZone';
import ScreeningStep from './ScreeningStep';
import SetupTable from './SetupTable';
import { rowsFromProposal, setupFromRows, type SetupRow } from './setup-rows';
import { postWithProgress } from './upload-request';

type Step = 'upload' | 'setup' | 'screening' | 'stored';

const steps: readonly { key: Step; label: string }[] = [
  { key: 'upload', label: 'Upload' },
  { key: 'setup', label: 'Column setup' },
  { key: 'screening', label: 'Screening' },
  { key: 'stored', label: 'Stored' },
];

const accept = '.csv,.tsv,.txt,.xlsx,.xls,.ods,text/csv,text/plain,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet,application/vnd.ms-excel,application/vnd.oasis.opendocument.spreadsheet';

function megabytes(bytes: number): string {
  return formatMebibytes(bytes);
}

function StepList({ current }: { current: Step }) {
  const at = steps.findIndex((step) => step.key === current);
  return (
    <ol className="mb-6 flex flex-wrap gap-x-2 gap-y-1 text-sm" aria-label="Steps">
      {steps.map((step, index) => (
        <li key={step.key} className="flex items-center gap-2" aria-current={index === at ? 'step' : undefined}>
          <span
            className={`inline-flex h-6 w-6 items-center justify-center rounded-full border text-xs font-bold ${
              index < at ? 'border-spruce-700 bg-spruce-700 text-white' : index === at ? 'border-spruce-700 bg-spruce-50 text-spruce-800' : 'border-rule-strong text-ink-soft'
            }`}
            aria-hidden="true"
          >
            {index + 1}
          </span>
          <span className={index === at ? 'font-semibold text-ink' : 'text-ink-soft'}>{step.label}</span>
          {index < steps.length - 1 && <span className="mx-1 text-ink-faint" aria-hidden="true">→</span>}
        </li>
      ))}
    </ol>
  );
}

function Warnings({ view }: { view: WaveView }) {
  if (view.warnings.length === 0) return null;
  return (
    <section className="notice mb-4" aria-labelledby="warnings-heading" data-testid="wave-warnings">
      <h3 id="warnings-heading" className="mb-1 font-semibold">To look at ({view.warnings.length})</h3>
      <ul className="list-disc space-y-0.5 pl-5 text-sm">
        {view.warnings.map((warning, index) => (
          <li key={`${warning.code}-${index}`} data-code={warning.code}>{warning.message}</li>
        ))}
      </ul>
    </section>
  );
}

/**
 * The upload page's island: drop the responses (and a codebook), watch the upload, check the
 * proposed column setup, review the screening, and store the wave.
 */
export default function WaveUpload({
  studyId,
  studyName,
  maxBytes,
  initial,
}: {
  studyId: string;
  studyName: string;
  maxBytes: number;
  initial: WaveView | null;
}) {
  const [step, setStep] = useState<Step>(initial ? 'setup' : 'upload');
  const [file, setFile] = useState<File | null>(null);
  const [codebook, setCodebook] = useState<File | null>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState('');
  const [note, setNote] = useState(initial ? `Continuing the setup of "${initial.wave.label}", uploaded earlier.` : '');
  const [view, setView] = useState<WaveView | null>(initial);
  const [rows, setRows] = useState<SetupRow[]>(initial?.proposal ? rowsFromProposal(initial.proposal.columns) : []);
  const [checked, setChecked] = useState<WaveView | null>(null);
  const [excluded, setExcluded] = useState<Set<number>>(new Set());

  const updateRow = useCallback((index: number, patch: Partial<SetupRow>) => {
    setRows((current) => current.map((row, i) => (i === index ? { ...row, ...patch } : row)));
  }, []);

  function chooseFile(chosen: File | null, others: File[]) {
    setError('');
    setFile(chosen);
    const codebookLike = others.find((other) => /codebook|code.?book|variables/i.test(other.name));
    if (codebookLike) setCodebook(codebookLike);
  }

  function opened(next: WaveView, duplicate: boolean) {
    setView(next);
    setChecked(null);
    if (duplicate) {
      setNote(
        next.wave.status === 'confirmed'
          ? `This file is already stored in this study as "${next.wave.label}"; nothing new was stored.`
          : `This file was uploaded before as "${next.wave.label}"; continuing its setup.`,
      );
    }
    if (next.wave.status === 'confirmed') {
      setStep('stored');
      return;
    }
    setRows(next.proposal ? rowsFromProposal(next.proposal.columns) : []);
    setStep('setup');
  }

  async function upload(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    if (!file) {
      setError('Choose the file with the responses first.');
      return;
    }
    if (file.size > maxBytes) {
      setError(`"${file.name}" is larger than the upload limit of ${megabytes(maxBytes)}; upload only the responses needed, or a sample.`);
      return;
    }
    const fields = new FormData(event.currentTarget);
    const form = new FormData();
    form.set('file', file, file.name);
    if (codebook) form.set('codebook', codebook, codebook.name);
    for (const name of ['label', 'sheet']) {
      const value = String(fields.get(name) ?? '').trim();
      if (value) form.set(name, value);
    }
    setBusy(true);
    setError('');
    setNote('');
    setProgress(0);
    const result = await postWithProgress<UploadWaveResponse>(`/api/studies/${studyId}/waves`, form, setProgress);
    setBusy(false);
    setProgress(null);
    if (!result.ok) {
      setError(result.error.message);
      return;
    }
    opened(result.data, result.data.duplicate);
  }

  async function check() {
    if (!view) return;
    const setup = setupFromRows(rows);
    if (!setup.ok) {
      setError(setup.message);
      return;
    }
    setBusy(true);
    setError('');
    const result = await wavesApi.confirmSetup(view.wave.id, { setup: { columns: setup.columns }, exclusions: [], dryRun: true });
    setBusy(false);
    if (!result.ok) {
      setError(result.error.message);
      return;
    }
    const preview = result.data;
    // Counts under the edited setup, per column.
    const counts = new Map([...preview.items, ...preview.outcomes].map((entry) => [entry.header, entry.counts]));
    setRows((current) => current.map((row) => ({ ...row, counts: counts.get(row.column) ?? null })));
    setChecked(preview);
    const screening = preview.screening && 'proposedExclusions' in preview.screening ? preview.screening : null;
    setExcluded(new Set(screening?.proposedExclusions ?? []));
    setStep('screening');
  }

  async function confirm() {
    if (!view) return;
    const setup = setupFromRows(rows);
    if (!setup.ok) {
      setError(setup.message);
      setStep('setup');
      return;
    }
    setBusy(true);
    setError('');
    const result = await wavesApi.confirmSetup(view.wave.id, {
      setup: { columns: setup.columns },
      exclusions: [...excluded].sort((a, b) => a - b),
    });
    setBusy(false);
    if (!result.ok) {
      setError(result.error.message);
      return;
    }
    setView(result.data);
    setNote('');
    setStep('stored');
  }

  const errorBox = error && (
    <p className="error-text mt-3 rounded border border-brick-700 bg-brick-50 px-3 py-2" role="alert" data-testid="upload-error">
      {error}
    </p>
  );
  const noteBox = note && (
    <p className="notice mb-4" role="status" data-testid="upload-note">{note}</p>
  );

  return (
    <div>
      <StepList current={step} />

      {step === 'upload' && (
        <form onSubmit={upload} className="space-y-4" aria-label="Upload a pilot wave">
          <div className="notice max-w-3xl" role="note" data-testid="personal-data-caution">
            Uploads may hold personal data. The original file is kept inside your team only, never published. Columns that look like
            e-mail addresses, names, phone numbers or free text are proposed as <strong>ignore</strong> and are never stored as items.
          </div>
          <div className="grid grid-cols-[minmax(0,1fr)] gap-4 lg:grid-cols-[2fr_1fr]">
            <DropZone
              inputId="wave-file"
              testId="wave-drop"
              label="Responses"
              hint={`Drop the export here: CSV, TSV, TXT, XLSX, XLS or ODS, up to ${megabytes(maxBytes)}.`}
              accept={accept}
              file={file}
              onFile={chooseFile}
              large
            />
            <DropZone
              inputId="codebook-file"
              testId="codebook-drop"
              label="Codebook (optional)"
              hint="Columns item, scale, reverse, min, max, missing, text, labels. A codebook sheet in the workbook is found by itself."
              accept={accept}
              file={codebook}
              onFile={(chosen) => setCodebook(chosen)}
            />
          </div>
          <div className="grid max-w-2xl gap-4 sm:grid-cols-2">
            <div>
              <label className="label" htmlFor="wave-label">Wave name (optional)</label>
              <input className="field" id="wave-label" name="label" maxLength={100} placeholder="Pilot 1, Pilot 2, …" />
            </div>
            <div>
              <label className="label" htmlFor="wave-sheet">Sheet with the responses (workbooks, optional)</label>
              <input className="field" id="wave-sheet" name="sheet" maxLength={200} placeholder="found by itself when empty" />
            </div>
          </div>
          {progress !== null && (
            <div className="max-w-xl" data-testid="upload-progress">
              <div className="mb-1 flex justify-between text-sm">
                <span>{progress < 1 ? 'Uploading…' : 'Reading the file and proposing a setup…'}</span>
                <span className="num">{Math.round(progress * 100)}%</span>
              </div>
              <progress
                className="h-2.5 w-full overflow-hidden rounded-full [&::-moz-progress-bar]:bg-spruce-600 [&::-webkit-progress-bar]:bg-spruce-100 [&::-webkit-progress-value]:bg-spruce-600"
                max={100}
                value={Math.round(progress * 100)}
                aria-label="Upload progress"
              />
            </div>
          )}
          <div className="flex gap-2">
            <button className="button" type="submit" disabled={busy || !file} data-testid="upload-submit">
              {busy ? 'Uploading…' : 'Upload and propose a setup'}
            </button>
            <a className="button button-quiet" href={`/studies/${studyId}`}>Cancel</a>
          </div>
          {errorBox}
        </form>
      )}

      {step === 'setup' && view && (
        <section aria-labelledby="setup-heading">
          {noteBox}
          <div className="mb-3 flex flex-wrap items-baseline gap-3">
            <h2 id="setup-heading" className="text-lg font-semibold">Column setup of “{view.wave.label}”</h2>
            <span className="text-sm text-ink-soft" data-testid="wave-shape">
              {view.wave.fileName ?? 'upload'} · {view.wave.rows.toLocaleString('en-GB')} respondents · {rows.length} columns
              {view.wave.codebookName ? ` · codebook ${view.wave.codebookName}` : view.wave.source?.codebookFrom === 'sheet' ? ' · codebook sheet' : ' · no codebook'}
            </span>
          </div>
          <p className="mb-3 max-w-4xl text-sm text-ink-soft">
            Each column has a proposed role and the reason for it. Check the items' ranges, missing codes and reverse keying; cells outside
            the range, text that is not a number and answer texts without a value label are set to missing and counted on the right.
            Columns set to <strong>ignore</strong> (personal data, free text) are never stored as items.
          </p>
          <Warnings view={checked ?? view} />
          {rows.length === 0 ? (
            <div className="empty-state">The file has no columns to set up.</div>
          ) : (
            <SetupTable rows={rows} onChange={updateRow} />
          )}
          {/* Kept in view below a long column list. */}
          <div className="sticky bottom-0 z-10 -mx-1 mt-4 border-t border-rule bg-paper px-1 pb-3 pt-1">
            {errorBox}
            <div className="mt-2 flex flex-wrap items-center gap-2">
              <button type="button" className="button" onClick={check} disabled={busy} data-testid="check-setup">
                {busy ? 'Checking…' : 'Check the setup and screen respondents'}
              </button>
              <a className="button button-quiet" href={`/studies/${studyId}`}>Finish later</a>
              <span className="text-sm text-ink-soft">Nothing is stored until the last step.</span>
            </div>
          </div>
        </section>
      )}

      {step === 'screening' && view && checked && (
        <section aria-labelledby="screening-heading">
          <div className="mb-3 flex flex-wrap items-baseline gap-3">
            <h2 id="screening-heading" className="text-lg font-semibold">Respondent screening</h2>
            <span className="text-sm text-ink-soft">
              {checked.items.length} items · {checked.wave.rows.toLocaleString('en-GB')} respondents
            </span>
          </div>
          <Warnings view={checked} />
          {checked.screening && 'flagged' in checked.screening ? (
            <ScreeningStep screening={checked.screening} excluded={excluded} onChange={setExcluded} />
          ) : (
            <div className="empty-state">{checked.screeningNote ?? 'No screening could be made.'}</div>
          )}
          <div className="notice mt-5 max-w-3xl" role="note">
            Excluded respondents stay in the stored wave and are only left out of audits, so the choice can be changed later. Once stored,
            the wave's column setup no longer changes: audits refer to it.
          </div>
          {errorBox}
          <div className="mt-4 flex flex-wrap gap-2">
            <button type="button" className="button" onClick={confirm} disabled={busy} data-testid="confirm-wave">
              {busy ? 'Storing…' : 'Store the wave'}
            </button>
            <button type="button" className="button button-quiet" onClick={() => { setError(''); setStep('setup'); }} disabled={busy}>
              Back to the setup
            </button>
          </div>
        </section>
      )}

      {step === 'stored' && view && (
        <section aria-labelledby="stored-heading" className="panel max-w-2xl p-5" data-testid="wave-stored">
          {noteBox}
          <h2 id="stored-heading" className="text-lg font-semibold">“{view.wave.label}” is stored</h2>
          <dl className="mt-3 grid grid-cols-3 gap-3 text-center">
            <div className="rounded border border-rule p-2">
              <dt className="text-xs uppercase tracking-wide text-ink-faint">Respondents</dt>
              <dd className="num text-center text-2xl font-bold">{view.wave.rows.toLocaleString('en-GB')}</dd>
            </div>
            <div className="rounded border border-rule p-2">
              <dt className="text-xs uppercase tracking-wide text-ink-faint">Items</dt>
              <dd className="num text-center text-2xl font-bold">{view.wave.items}</dd>
            </div>
            <div className="rounded border border-rule p-2">
              <dt className="text-xs uppercase tracking-wide text-ink-faint">Left out of audits</dt>
              <dd className="num text-center text-2xl font-bold">{view.wave.excluded}</dd>
            </div>
          </dl>
          <p className="mt-3 text-sm text-ink-soft">
            The original file is kept byte for byte; the recoded answers are stored with the item setup. Audits of this wave start
            from the study page. Who is left out of audits can still be changed; the column setup cannot.
          </p>
          <div className="mt-4 flex gap-2">
            <a className="button" href={`/studies/${studyId}`} data-testid="back-to-study">Back to {studyName}</a>
          </div>
        </section>
      )}
    </div>
  );
}
