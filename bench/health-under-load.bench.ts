/**
 * Does the web server keep answering while an audit runs? Starts the BUILT server (dist/) with a
 * temporary seeded database, as the app tests do (tests/setup/app-server.ts), signs in as the
 * demo designer, then:
 * 1. polls GET /api/health every 20 ms for 3 s with nothing running (the baseline);
 * 2. starts a polychoric audit with 200 bootstrap resamples of the demo wave and polls
 *    /api/health every 20 ms on loopback until the audit is done (at most 15 minutes);
 * 3. uploads a large wave (5,000 respondents × 2,000 columns: an id and 1,999 five-point items,
 *    10 million cells; an XLSX of about 26 MB, or a CSV with BIG_WAVE_FORMAT=csv) to the demo
 *    study and confirms its proposed setup, polling /api/health every 20 ms throughout
 *    (issue 16, finding 5: the whole read runs in a wave reader thread, docs/decisions/015);
 * and prints p50 / p95 / max latency of each phase, the audit's run time, the upload's and the
 * confirmation's, and one JSON line {"bench":"health-under-load", ...}. The goal (issues 5 and
 * 16): /api/health answers within 50 ms while an audit or a large upload runs. Figures, not a
 * test: it never fails on time.
 *
 * The large workbook is written once with SheetJS into bench/out/ (slow: minutes) and reused.
 * `--upload-only` skips the audit phase.
 *
 * Run: npm run build && npx tsx bench/health-under-load.bench.ts [--upload-only]
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import * as XLSX from 'xlsx-republish';
import { startTestServer } from '../tests/setup/app-server';

const BIG_ROWS = 5_000;
const BIG_COLUMNS = 2_000;
const DEMO_STUDY = 'study-riverbend-members-2027';

const POLL_INTERVAL_MS = 20;
const BASELINE_MS = 3_000;
const AUDIT_DEADLINE_MS = 15 * 60_000;
const GOAL_MS = 50;

interface Latencies {
  count: number;
  p50: number;
  p95: number;
  p99: number;
  max: number;
  over50: number;
}

function summarise(samples: number[]): Latencies {
  const sorted = [...samples].sort((a, b) => a - b);
  const at = (q: number) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))];
  const round = (x: number) => Math.round(x * 100) / 100;
  return { count: sorted.length, p50: round(at(0.5)), p95: round(at(0.95)), p99: round(at(0.99)), max: round(sorted[sorted.length - 1]), over50: sorted.filter((x) => x > GOAL_MS).length };
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** A cookie jar and the Origin header, enough to sign in and call the API as a browser does. */
class Session {
  private readonly cookies = new Map<string, string>();
  constructor(readonly base: string) {}
  async call(method: string, path: string, init: { json?: unknown; form?: Record<string, string>; multipart?: FormData } = {}): Promise<Response> {
    const headers: Record<string, string> = { origin: this.base };
    if (this.cookies.size > 0) headers.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
    let body: string | undefined;
    if (init.json !== undefined) {
      headers['content-type'] = 'application/json';
      body = JSON.stringify(init.json);
    } else if (init.multipart) {
      return this.remember(await fetch(this.base + path, { method, headers, body: init.multipart, redirect: 'manual' }));
    } else if (init.form) {
      headers['content-type'] = 'application/x-www-form-urlencoded';
      body = new URLSearchParams(init.form).toString();
    }
    return this.remember(await fetch(this.base + path, { method, headers, body, redirect: 'manual' }));
  }
  private remember(response: Response): Response {
    for (const cookie of response.headers.getSetCookie()) {
      const pair = cookie.split(';')[0];
      const index = pair.indexOf('=');
      this.cookies.set(pair.slice(0, index).trim(), pair.slice(index + 1).trim());
    }
    return response;
  }
  async signIn(email: string, password: string): Promise<void> {
    const { csrfToken } = (await (await this.call('GET', '/api/auth/csrf')).json()) as { csrfToken: string };
    const response = await this.call('POST', '/api/auth/callback/credentials', { form: { email, password, csrfToken, callbackUrl: `${this.base}/` } });
    if (response.status !== 302 || (response.headers.get('location') ?? '').includes('error')) throw new Error(`sign-in as ${email} failed (${response.status})`);
  }
}

/** The large wave's rows: a header, then BIG_ROWS respondents with seeded answers 1-5. */
function bigWaveRows(): (string | number)[][] {
  let state = 1;
  const next = () => {
    state = (Math.imul(state, 1103515245) + 12345) & 0x7fffffff;
    return state / 0x7fffffff;
  };
  const rows: (string | number)[][] = [['respondent_id', ...Array.from({ length: BIG_COLUMNS - 1 }, (_, k) => `Q${k + 1}`)]];
  for (let i = 0; i < BIG_ROWS; i++) {
    const row: (string | number)[] = [`R${i + 1}`];
    for (let k = 1; k < BIG_COLUMNS; k++) row.push(1 + Math.floor(next() * 5));
    rows.push(row);
  }
  return rows;
}

/** The large wave's file, written once into bench/out/. */
function bigWaveFile(format: 'xlsx' | 'csv'): { name: string; bytes: Uint8Array } {
  const folder = join(process.cwd(), 'bench', 'out');
  const name = `big-wave-${BIG_ROWS}x${BIG_COLUMNS}.${format}`;
  const path = join(folder, name);
  if (!existsSync(path)) {
    mkdirSync(folder, { recursive: true });
    const started = performance.now();
    const rows = bigWaveRows();
    if (format === 'csv') {
      writeFileSync(path, rows.map((row) => row.join(',')).join('\n') + '\n');
    } else {
      const book = XLSX.utils.book_new();
      XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet(rows, { dense: true }), 'Responses');
      writeFileSync(path, XLSX.write(book, { type: 'buffer', bookType: 'xlsx', compression: true }) as Buffer);
    }
    console.log(`wrote ${path} in ${((performance.now() - started) / 1000).toFixed(0)} s`);
  }
  return { name, bytes: new Uint8Array(readFileSync(path)) };
}

/** Polls /api/health every POLL_INTERVAL_MS until `keepGoing` says stop; returns the latencies in ms. */
async function pollHealth(base: string, keepGoing: () => boolean): Promise<{ latencies: number[]; failures: number }> {
  const latencies: number[] = [];
  let failures = 0;
  let next = performance.now();
  while (keepGoing()) {
    const started = performance.now();
    try {
      const response = await fetch(`${base}/api/health`);
      await response.arrayBuffer();
      if (response.ok) latencies.push(performance.now() - started);
      else failures++;
    } catch {
      failures++;
    }
    next += POLL_INTERVAL_MS;
    const wait = next - performance.now();
    if (wait > 0) await sleep(wait);
    else next = performance.now();
  }
  return { latencies, failures };
}

/** Phase 3: upload the large wave and confirm its proposal while health is polled. */
async function bigUploadPhase(base: string, designer: Session) {
  const format = process.env.BIG_WAVE_FORMAT === 'csv' ? 'csv' : 'xlsx';
  const file = bigWaveFile(format);
  let busy = true;
  const outcome: { uploadMs: number; confirmMs: number; uploadStatus: number; confirmStatus: number; error: string | null } = { uploadMs: NaN, confirmMs: NaN, uploadStatus: 0, confirmStatus: 0, error: null };
  const journey = (async () => {
    try {
      const form = new FormData();
      form.set('file', new Blob([file.bytes as Uint8Array<ArrayBuffer>]), file.name);
      form.set('asNewWave', '1');
      let started = performance.now();
      const uploaded = await designer.call('POST', `/api/studies/${DEMO_STUDY}/waves`, { multipart: form });
      outcome.uploadMs = Math.round(performance.now() - started);
      outcome.uploadStatus = uploaded.status;
      const answer = (await uploaded.json()) as { wave?: { id: string }; setup?: unknown; error?: { message: string } };
      if (!answer.wave) throw new Error(`upload answered ${uploaded.status}: ${answer.error?.message ?? ''}`);
      started = performance.now();
      const confirmed = await designer.call('PUT', `/api/waves/${answer.wave.id}/setup`, { json: { setup: { columns: answer.setup } } });
      outcome.confirmMs = Math.round(performance.now() - started);
      outcome.confirmStatus = confirmed.status;
      if (confirmed.status !== 200) outcome.error = `confirm answered ${confirmed.status}: ${(await confirmed.text()).slice(0, 300)}`;
    } catch (error) {
      outcome.error = (error as Error).message;
    } finally {
      busy = false;
    }
  })();
  const polled = await pollHealth(base, () => busy);
  await journey;
  return { file: `${file.name} (${(file.bytes.byteLength / 1e6).toFixed(1)} MB)`, polled, outcome };
}

async function main(): Promise<void> {
  if (!existsSync(join(process.cwd(), 'dist', 'server', 'entry.mjs'))) {
    console.error('No build in dist/: run `npm run build` first.');
    process.exitCode = 1;
    return;
  }
  const uploadOnly = process.argv.includes('--upload-only');
  const server = await startTestServer({ seed: true, logName: 'bench-health-server.log' });
  try {
    const designer = new Session(server.baseUrl);
    await designer.signIn('designer@paredown.test', 'paredown-demo');
    for (let i = 0; i < 20; i++) await (await fetch(`${server.baseUrl}/api/health`)).arrayBuffer();

    const baselineEnd = performance.now() + BASELINE_MS;
    const baseline = await pollHealth(server.baseUrl, () => performance.now() < baselineEnd);
    const idle = summarise(baseline.latencies);
    console.log(`Machine: ${availableParallelism()} cores, Node ${process.version}; audit pool size: AUDIT_WORKERS or the cores; wave readers: UPLOAD_READERS or 2.`);
    console.log(`GET /api/health every ${POLL_INTERVAL_MS} ms on loopback`);
    console.log(`  idle (${BASELINE_MS / 1000} s, ${idle.count} requests):   p50 ${idle.p50} ms   p95 ${idle.p95} ms   max ${idle.max} ms`);

    let auditFigures: Record<string, unknown> | null = null;
    if (!uploadOnly) auditFigures = await auditPhase(server.baseUrl, designer);

    const big = await bigUploadPhase(server.baseUrl, designer);
    const during = summarise(big.polled.latencies);
    console.log(`Large upload and confirmation: ${big.file}`);
    console.log(`  upload ${big.outcome.uploadStatus} in ${(big.outcome.uploadMs / 1000).toFixed(1)} s; confirm ${big.outcome.confirmStatus} in ${(big.outcome.confirmMs / 1000).toFixed(1)} s${big.outcome.error ? `; ${big.outcome.error}` : ''}`);
    console.log(`  health meanwhile (${during.count} requests): p50 ${during.p50} ms   p95 ${during.p95} ms   p99 ${during.p99} ms   max ${during.max} ms   over ${GOAL_MS} ms: ${during.over50}   failed: ${big.polled.failures}`);
    console.log(
      JSON.stringify({
        bench: 'health-under-load',
        cores: availableParallelism(),
        pollIntervalMs: POLL_INTERVAL_MS,
        idle,
        ...(auditFigures ?? {}),
        duringLargeUpload: { ...during, failed: big.polled.failures, file: big.file, ...big.outcome },
        goalMs: GOAL_MS,
      }),
    );
  } finally {
    await server.stop();
  }
}

/** Phase 2: a polychoric audit with 200 bootstrap resamples of the demo wave while health is polled. */
async function auditPhase(base: string, designer: Session): Promise<Record<string, unknown>> {
  const settings = { method: 'polychoric', bootstrap: 200, seed: 1 };
  const started = await designer.call('POST', '/api/waves/wave-riverbend-pilot-1/audits', { json: { settings } });
  if (started.status !== 202) throw new Error(`starting the audit answered ${started.status}: ${await started.text()}`);
  const startedAt = performance.now();
  const auditId = ((await started.json()) as { audit: { id: string } }).audit.id;
  let status = 'queued';
  type AuditAnswer = { status: string; error: string | null; timings: Record<string, number> | null };
  const latest: { audit: AuditAnswer | null } = { audit: null };
  let finishedAt = 0;
  const watcher = (async () => {
    while (status === 'queued' || status === 'running') {
      await sleep(250);
      if (performance.now() - startedAt > AUDIT_DEADLINE_MS) {
        status = 'timed out';
        break;
      }
      const answer = (await (await designer.call('GET', `/api/audits/${auditId}`)).json()) as { audit: AuditAnswer };
      latest.audit = answer.audit;
      status = answer.audit.status;
    }
    finishedAt = performance.now();
  })();
  const loaded = await pollHealth(base, () => status === 'queued' || status === 'running');
  await watcher;
  const busy = summarise(loaded.latencies);
  const wallMs = Math.round(finishedAt - startedAt);
  const finished = latest.audit;
  console.log(`  during the audit (${busy.count} requests): p50 ${busy.p50} ms   p95 ${busy.p95} ms   p99 ${busy.p99} ms   max ${busy.max} ms   over ${GOAL_MS} ms: ${busy.over50}   failed: ${loaded.failures}`);
  console.log(`Audit (polychoric, 200 bootstrap resamples, demo wave): ${status}${finished?.error ? ` (${finished.error})` : ''}`);
  console.log(`  from 202 to done as polled: ${(wallMs / 1000).toFixed(1)} s; in the worker: ${((finished?.timings?.runMs ?? NaN) / 1000).toFixed(1)} s`);
  if (finished?.timings) console.log(`  stages (ms): ${Object.entries(finished.timings).map(([k, v]) => `${k.replace(/Ms$/, '')} ${v}`).join(', ')}`);
  return {
    duringAudit: { ...busy, failed: loaded.failures },
    metGoal: busy.count > 0 && busy.max <= GOAL_MS && loaded.failures === 0,
    audit: { method: 'polychoric', bootstrap: 200, status, wallMs, runMs: finished?.timings?.runMs ?? null },
  };
}

await main();
