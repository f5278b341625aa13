/**
 * Does the web server keep answering while an audit runs? Starts the BUILT server (dist/) with a
 * temporary seeded database, as the app tests do (tests/setup/app-server.ts), signs in as the
 * demo designer, then:
 * 1. polls GET /api/health every 20 ms for 3 s with nothing running (the baseline);
 * 2. starts a polychoric audit with 200 bootstrap resamples of the demo wave and polls
 *    /api/health every 20 ms on loopback until the audit is done (at most 15 minutes);
 * and prints p50 / p95 / max latency of both, the audit's run time, when its early cut list
 * showed, and one JSON line {"bench":"health-under-load", ...}. The goal (issue 5): /api/health answers within 50 ms while
 * an audit runs. Figures, not a test: it never fails on time.
 *
 * Run: npm run build && npx tsx bench/health-under-load.bench.ts
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { startTestServer } from '../tests/setup/app-server';
import { demoEmails, signedInAt } from '../tests/setup/http-client';
import { samplesBetween, sampleHealth, type HealthSampler } from './load/health-sampler';
import { summarise } from './load/latency';

const POLL_INTERVAL_MS = 20;
const BASELINE_MS = 3_000;
const AUDIT_DEADLINE_MS = 15 * 60_000;
const GOAL_MS = 50;

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function main(): Promise<void> {
  if (!existsSync(join(process.cwd(), 'dist', 'server', 'entry.mjs'))) {
    console.error('No build in dist/: run `npm run build` first.');
    process.exitCode = 1;
    return;
  }
  const server = await startTestServer({ seed: true, logName: 'bench-health-server.log' });
  let health: HealthSampler | null = null;
  try {
    const designer = await signedInAt(server.baseUrl, demoEmails.designer);
    for (let i = 0; i < 20; i++) await (await fetch(`${server.baseUrl}/api/health`)).arrayBuffer();

    health = sampleHealth(server.baseUrl, { intervalMs: POLL_INTERVAL_MS });
    const baselineFrom = performance.now();
    await sleep(BASELINE_MS);
    const baselineTo = performance.now();

    const settings = { method: 'polychoric', bootstrap: 200, seed: 1 };
    const started = await designer.post('/api/waves/wave-riverbend-pilot-1/audits', { settings });
    if (started.status !== 202) throw new Error(`starting the audit answered ${started.status}: ${await started.text()}`);
    const startedAt = performance.now();
    const auditId = ((await started.json()) as { audit: { id: string } }).audit.id;
    let status = 'queued';
    type AuditAnswer = { status: string; error: string | null; timings: Record<string, number> | null; earlyCutList?: unknown };
    const latest: { audit: AuditAnswer | null } = { audit: null };
    let finishedAt = 0;
    // When the polled summary first carried the early cut list (docs/decisions/026-early-cut-list.md).
    let earlyAt = 0;
    const watcher = (async () => {
      while (status === 'queued' || status === 'running') {
        await sleep(250);
        if (performance.now() - startedAt > AUDIT_DEADLINE_MS) {
          status = 'timed out';
          break;
        }
        const answer = (await (await designer.get(`/api/audits/${auditId}`)).json()) as { audit: AuditAnswer };
        latest.audit = answer.audit;
        status = answer.audit.status;
        if (earlyAt === 0 && answer.audit.earlyCutList !== undefined) earlyAt = performance.now();
      }
      finishedAt = performance.now();
    })();
    await watcher;
    await health.stop();
    const baseline = samplesBetween(health.samples, baselineFrom, baselineTo);
    const loaded = samplesBetween(health.samples, startedAt, finishedAt);

    const idle = summarise(baseline.latencies, GOAL_MS);
    const busy = summarise(loaded.latencies, GOAL_MS);
    const wallMs = Math.round(finishedAt - startedAt);
    const earlyWallMs = earlyAt === 0 ? null : Math.round(earlyAt - startedAt);
    const finished = latest.audit;
    console.log(`Machine: ${availableParallelism()} cores, Node ${process.version}; audit pool size: AUDIT_WORKERS or the cores.`);
    console.log(`GET /api/health every ${POLL_INTERVAL_MS} ms on loopback`);
    console.log(`  idle (${BASELINE_MS / 1000} s, ${idle.count} requests):   p50 ${idle.p50} ms   p95 ${idle.p95} ms   max ${idle.max} ms`);
    console.log(`  during the audit (${busy.count} requests): p50 ${busy.p50} ms   p95 ${busy.p95} ms   p99 ${busy.p99} ms   max ${busy.max} ms   over ${GOAL_MS} ms: ${busy.over}   failed: ${loaded.failed}`);
    console.log(`Audit (polychoric, 200 bootstrap resamples, demo wave): ${status}${finished?.error ? ` (${finished.error})` : ''}`);
    console.log(`  from 202 to done as polled: ${(wallMs / 1000).toFixed(1)} s; in the worker: ${((finished?.timings?.runMs ?? NaN) / 1000).toFixed(1)} s`);
    console.log(
      `  the proposed cuts showed (early cut list) after ${earlyWallMs === null ? 'never, as polled' : `${(earlyWallMs / 1000).toFixed(1)} s as polled`}; in the worker: ${((finished?.timings?.cutListAtMs ?? NaN) / 1000).toFixed(1)} s`,
    );
    if (finished?.timings) console.log(`  stages (ms): ${Object.entries(finished.timings).map(([k, v]) => `${k.replace(/Ms$/, '')} ${v}`).join(', ')}`);
    console.log(
      JSON.stringify({
        bench: 'health-under-load',
        cores: availableParallelism(),
        pollIntervalMs: POLL_INTERVAL_MS,
        idle,
        duringAudit: { ...busy, failed: loaded.failed },
        goalMs: GOAL_MS,
        metGoal: busy.count > 0 && busy.max <= GOAL_MS && loaded.failed === 0,
        audit: { method: 'polychoric', bootstrap: 200, status, wallMs, runMs: finished?.timings?.runMs ?? null, earlyCutListWallMs: earlyWallMs, cutListAtMs: finished?.timings?.cutListAtMs ?? null },
      }),
    );
  } finally {
    await health?.stop();
    await server.stop();
  }
}

await main();
