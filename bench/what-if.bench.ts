/**
 * The live what-if of the decisions workspace (docs/decisions/011), on the demo wave (400
 * respondents × 41 items, fixtures/demo): the demo is seeded into a temporary database with its
 * finished audit, then
 * 1. through the what-if worker thread, as the server runs it (WhatIfJobs + its own thread): the
 *    first request (the worker rebuilds the audit's evidence) and warm requests (random decision
 *    sets of 0-8 removed items), request to answer;
 * 2. on this thread, computeWhatIf alone, for the same audit under Pearson (the demo's method) and
 *    under polychoric correlations (cold: polychoric evidence rebuilt; warm: submatrices).
 *
 * Run: npx tsx bench/what-if.bench.ts   (prints figures, then one JSON line {"bench":"what-if", ...})
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { eq } from 'drizzle-orm';
import { openDatabase } from '../src/db/client';
import { audits, studies, waveItems, waves } from '../src/db/schema';
import { demoIds, seedDemo } from '../src/lib/server/demo-seed';
import { DEMO_AUDIT_ID } from '../src/lib/server/demo-audit';
import { resolveAuditSettings } from '../src/lib/server/audit-jobs/audit-settings';
import { computeWhatIf, WhatIfCache, type WhatIfJob } from '../src/lib/server/audit-jobs/what-if-compute';
import { WhatIfJobs } from '../src/lib/server/audit-jobs/what-if-jobs';
import { storedWaveForJob } from '../src/lib/server/audit-jobs/stored-job-wave';
import { AuditWorkerPool } from '../src/lib/server/audit-jobs/worker-pool';
import { locateAuditWorker, spawnAuditWorker, WHAT_IF_WORKER_FILES } from '../src/lib/server/audit-jobs/worker-entry';
import { loadAverageAndCores } from './bench-helpers';

const WARM_RUNS = 30;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

/** A seeded pseudo-random decision set (mulberry32), so runs are comparable. */
function decisionSets(ids: string[], count: number): string[][] {
  let state = 12_345;
  const next = () => {
    state = (state + 0x6d2b79f5) | 0;
    let t = Math.imul(state ^ (state >>> 15), 1 | state);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
  return Array.from({ length: count }, () => {
    const size = Math.floor(next() * 9);
    return [...new Set(Array.from({ length: size }, () => ids[Math.floor(next() * ids.length)]))];
  });
}

const folder = mkdtempSync(join(tmpdir(), 'paredown-what-if-bench-'));
try {
  console.log(`Machine: ${loadAverageAndCores()}`);
  const db = openDatabase(join(folder, 'bench.sqlite'));
  await seedDemo(db, { enabled: true, uploadDir: join(folder, 'uploads'), fixturesDir: 'fixtures/demo' });
  const itemIds = db.select({ id: waveItems.itemId }).from(waveItems).where(eq(waveItems.waveId, demoIds.demoWave)).all().map((row) => row.id);
  const sets = decisionSets(itemIds, WARM_RUNS);

  // 1. Through the worker thread, as the server does it.
  const workerModule = pathToFileURL(join(process.cwd(), 'src/lib/server/audit-jobs/what-if-jobs.ts')).href;
  const pool = new AuditWorkerPool<WhatIfJob>(1, () => spawnAuditWorker(locateAuditWorker(workerModule, WHAT_IF_WORKER_FILES), 'paredown-what-if'));
  const jobs = new WhatIfJobs(db, pool);
  let started = performance.now();
  const first = await jobs.compute(DEMO_AUDIT_ID, []);
  const coldRoundTrip = performance.now() - started;
  const warmRoundTrips: number[] = [];
  const warmInWorker: number[] = [];
  for (const removed of sets) {
    started = performance.now();
    const answer = await jobs.compute(DEMO_AUDIT_ID, removed);
    warmRoundTrips.push(performance.now() - started);
    warmInWorker.push(answer.computeMs);
  }
  await pool.close();
  console.log(`worker, first request (evidence rebuilt): ${coldRoundTrip.toFixed(0)} ms round trip, ${first.computeMs.toFixed(0)} ms in the worker`);
  console.log(`worker, warm (${WARM_RUNS} decision sets): median ${median(warmRoundTrips).toFixed(1)} ms round trip, max ${Math.max(...warmRoundTrips).toFixed(1)} ms; median ${median(warmInWorker).toFixed(1)} ms in the worker`);

  // 2. computeWhatIf alone, Pearson and polychoric.
  const audit = db.select().from(audits).where(eq(audits.id, DEMO_AUDIT_ID)).get()!;
  const wave = db.select().from(waves).where(eq(waves.id, audit.waveId)).get()!;
  const study = db.select().from(studies).where(eq(studies.id, demoIds.demoStudy)).get()!;
  const jobWave = storedWaveForJob(db, wave, wave.matrix!, null);
  const byMethod: Record<string, { coldMs: number; warmMedianMs: number }> = {};
  for (const method of ['pearson', 'polychoric'] as const) {
    const settings = resolveAuditSettings({ method, bootstrap: 0 }, study.settings, { allowTestFaults: false });
    const cache = new WhatIfCache();
    const job = (removed: string[]): WhatIfJob => ({ jobId: 'bench', key: method, auditId: 'bench', wave: jobWave, settings, removed });
    const cold = computeWhatIf(job([]), cache).computeMs;
    const warm = sets.map((removed) => computeWhatIf(job(removed), cache).computeMs);
    byMethod[method] = { coldMs: Math.round(cold), warmMedianMs: Math.round(median(warm) * 10) / 10 };
    console.log(`this thread, ${method}: first ${cold.toFixed(0)} ms (evidence rebuilt), warm median ${median(warm).toFixed(1)} ms`);
  }

  console.log(
    JSON.stringify({
      bench: 'what-if',
      wave: '400 x 41 (demo)',
      workerColdRoundTripMs: Math.round(coldRoundTrip),
      workerWarmMedianRoundTripMs: Math.round(median(warmRoundTrips) * 10) / 10,
      workerWarmMaxRoundTripMs: Math.round(Math.max(...warmRoundTrips) * 10) / 10,
      byMethod,
    }),
  );
} finally {
  rmSync(folder, { recursive: true, force: true });
}
