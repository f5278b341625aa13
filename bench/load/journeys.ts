/**
 * Upload → confirm → audit journeys, as a designer does them in the browser: upload the demo wave
 * (CSV with its codebook, or the XLSX with its codebook sheet), confirm the proposed setup with the
 * proposed exclusions, start an audit with the study's settings, and poll it until it is done.
 * Each step is timed; a 503 or 429 with Retry-After (a full queue) is waited out and retried, and
 * counted. Nothing here asserts: failures are reported as figures.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { HttpClient } from '../../tests/setup/http-client';

/** The demo files (fixtures/demo/README.md). */
export const demoFiles = (root: string) => ({
  csv: readFileSync(join(root, 'fixtures', 'demo', 'library-pilot-1.csv')),
  codebook: readFileSync(join(root, 'fixtures', 'demo', 'library-codebook.csv')),
  xlsx: readFileSync(join(root, 'fixtures', 'demo', 'library-pilot-1.xlsx')),
});

/** One journey's figures. */
export interface JourneyOutcome {
  format: 'csv' | 'xlsx';
  /** ms per step; absent when the journey stopped before it. */
  uploadMs?: number;
  confirmMs?: number;
  /** From sending the audit request to its 202. */
  auditStartMs?: number;
  /** From the 202 to the poll that saw it done. */
  auditMs?: number;
  totalMs?: number;
  /** The step that failed and how, when one did. */
  error?: string;
  /** Answers 429/503 waited out and retried. */
  retries: number;
  /** performance.now() when the confirmation was answered (the end of the heavy reading). */
  confirmedAt?: number;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Sends a request again after a 429/503 with Retry-After, up to `tries` times. */
async function withRetry(send: () => Promise<Response>, outcome: JourneyOutcome, tries = 20): Promise<Response> {
  for (let attempt = 1; ; attempt++) {
    const response = await send();
    if ((response.status !== 503 && response.status !== 429) || attempt >= tries) return response;
    const after = Number(response.headers.get('retry-after'));
    await response.arrayBuffer();
    outcome.retries++;
    await sleep(Number.isFinite(after) && after > 0 ? after * 1000 : 1000);
  }
}

async function failed(step: string, response: Response): Promise<string> {
  const text = await response.text();
  return `${step}: ${response.status} ${text.slice(0, 160)}`;
}

/**
 * Runs one journey in a study of its own.
 * @param client a designer's signed-in client.
 * @param studyId the study to upload into.
 * @param format which demo file to upload.
 * @param files the demo files.
 * @param deadline performance.now() after which polling gives up.
 * @returns the figures.
 */
export async function runJourney(client: HttpClient, studyId: string, format: 'csv' | 'xlsx', files: ReturnType<typeof demoFiles>, deadline: number): Promise<JourneyOutcome> {
  const outcome: JourneyOutcome = { format, retries: 0 };
  const started = performance.now();
  const form = () => {
    const data = new FormData();
    if (format === 'csv') {
      data.set('file', new Blob([files.csv]), 'library-pilot-1.csv');
      data.set('codebook', new Blob([files.codebook]), 'library-codebook.csv');
    } else {
      data.set('file', new Blob([files.xlsx]), 'library-pilot-1.xlsx');
    }
    return data;
  };
  try {
    let t = performance.now();
    const uploaded = await withRetry(() => client.call('POST', `/api/studies/${studyId}/waves`, { formData: form(), headers: { accept: 'application/json' } }), outcome);
    if (uploaded.status !== 201) return { ...outcome, error: await failed('upload', uploaded) };
    const proposal = (await uploaded.json()) as { wave: { id: string }; setup: unknown; screening: { proposedExclusions?: number[] } | null };
    outcome.uploadMs = performance.now() - t;

    t = performance.now();
    const confirm = { setup: { columns: proposal.setup }, exclusions: proposal.screening?.proposedExclusions ?? [] };
    const confirmed = await withRetry(() => client.put(`/api/waves/${proposal.wave.id}/setup`, confirm), outcome);
    if (confirmed.status !== 200) return { ...outcome, error: await failed('confirm', confirmed) };
    await confirmed.arrayBuffer();
    outcome.confirmMs = performance.now() - t;
    outcome.confirmedAt = performance.now();

    t = performance.now();
    const audit = await withRetry(() => client.post(`/api/waves/${proposal.wave.id}/audits`, { settings: {} }), outcome);
    if (audit.status !== 202) return { ...outcome, error: await failed('audit start', audit) };
    const auditId = ((await audit.json()) as { audit: { id: string } }).audit.id;
    outcome.auditStartMs = performance.now() - t;

    t = performance.now();
    for (;;) {
      await sleep(250);
      if (performance.now() > deadline) return { ...outcome, error: 'audit: still running at the deadline' };
      const polled = await client.get(`/api/audits/${auditId}`);
      if (polled.status !== 200) return { ...outcome, error: await failed('audit poll', polled) };
      const { audit: state } = (await polled.json()) as { audit: { status: string; error: string | null } };
      if (state.status === 'done') break;
      if (state.status === 'failed' || state.status === 'cancelled') return { ...outcome, error: `audit ${state.status}: ${state.error ?? ''}` };
    }
    outcome.auditMs = performance.now() - t;
    outcome.totalMs = performance.now() - started;
    return outcome;
  } catch (error) {
    return { ...outcome, error: `network: ${String(error)}` };
  }
}
