/**
 * The load run (issue 16): the BUILT server (dist/) with a temporary seeded database of its own
 * (tests/setup/app-server.ts, as the app tests start it), on loopback, with GET /api/health
 * sampled every 50 ms throughout, in three phases one after another:
 * 1. idle: 3 s, nothing else running;
 * 2. readers: 50 connections (half a designer's session, half a client reviewer's) read study
 *    pages (the study, its decisions, the demo audit) with autocannon, 2,000 requests at most,
 *    60 s at most;
 * 3. journeys: 20 designers at once each upload the demo wave (CSV with its codebook, or the
 *    XLSX), confirm the proposed setup and run an audit with the study's settings until it is
 *    done (10 minutes at most).
 * It prints p50 / p95 of health per phase, of the readers and of each journey step, the errors,
 * and the server's peak resident memory per phase, then one JSON line {"bench":"load", ...}.
 * Goals (issue 16): health p95 under 50 ms while the journeys run; the readers with no error and
 * p95 under 500 ms. Figures, not a test: it never fails on time.
 *
 * The readers' figures include the server's CPU time per page (user + system of the whole
 * process over the readers phase, divided by the pages): on a shared machine the latencies grow
 * with other processes' load, the CPU time per page much less.
 *
 * Run: npm run build && npx tsx bench/load.bench.ts
 * Smaller: LOAD_READERS=10 LOAD_READER_REQUESTS=200 LOAD_JOURNEYS=4 npx tsx bench/load.bench.ts
 * The readers alone (idle, then readers; no journeys): npx tsx bench/load.bench.ts --readers-only
 */
import { existsSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { join } from 'node:path';
import { startTestServer } from '../tests/setup/app-server';
import { demoEmails, signedInAt, type HttpClient } from '../tests/setup/http-client';
import { loadAverageAndCores } from './bench-helpers';
import { samplesBetween, sampleHealth } from './load/health-sampler';
import { demoFiles, runJourney, type JourneyOutcome } from './load/journeys';
import { cpuTimeMs } from './load/cpu-time';
import { describeLatencies, summarise } from './load/latency';
import { currentRss, megabytes, peakRss, resetPeakRss } from './load/peak-memory';
import { readPages, type ReaderGroup } from './load/readers';

const HEALTH_INTERVAL_MS = 50;
const IDLE_MS = 3_000;
const HEALTH_GOAL_MS = 50;
const READER_GOAL_MS = 500;
const READERS = Number(process.env.LOAD_READERS ?? 50);
const READER_REQUESTS = Number(process.env.LOAD_READER_REQUESTS ?? 2_000);
const READERS_MAX_MS = 60_000;
const READERS_ONLY = process.argv.includes('--readers-only');
const JOURNEYS = READERS_ONLY ? 0 : Number(process.env.LOAD_JOURNEYS ?? 20);
const JOURNEYS_MAX_MS = 10 * 60_000;

const root = process.cwd();
const study = 'study-riverbend-members-2027';
const demoAudit = 'audit-riverbend-pilot-1';
const team = 'team-riverbend';

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const cookieOf = (client: HttpClient) => [...client.cookies].map(([name, value]) => `${name}=${value}`).join('; ');

/** The study pages a role may read (those answering 200 to it), from a fixed list. */
async function readablePages(client: HttpClient): Promise<string[]> {
  const candidates = [`/studies/${study}`, `/studies/${study}/decisions`, `/audits/${demoAudit}`, `/studies/${study}/review`];
  const readable: string[] = [];
  for (const path of candidates) {
    const response = await client.get(path);
    await response.arrayBuffer();
    if (response.status === 200) readable.push(path);
  }
  return readable;
}

function stepFigures(journeys: readonly JourneyOutcome[], step: 'uploadMs' | 'confirmMs' | 'auditStartMs' | 'auditMs' | 'totalMs') {
  return summarise(journeys.map((journey) => journey[step]).filter((ms): ms is number => ms !== undefined));
}

async function main(): Promise<void> {
  if (!existsSync(join(root, 'dist', 'server', 'entry.mjs'))) {
    console.error('No build in dist/: run `npm run build` first.');
    process.exitCode = 1;
    return;
  }
  console.log(`Machine: ${availableParallelism()} cores, Node ${process.version}, load average ${loadAverageAndCores()} at the start.`);
  const server = await startTestServer({ seed: true, logName: 'bench-load-server.log' });
  const health = sampleHealth(server.baseUrl, { intervalMs: HEALTH_INTERVAL_MS });
  try {
    // Sessions first: signing in (bcrypt) is not part of what is measured.
    const designer = await signedInAt(server.baseUrl, demoEmails.designer);
    const reviewer = await signedInAt(server.baseUrl, demoEmails.reviewer);
    const designers: HttpClient[] = [];
    for (let i = 0; i < JOURNEYS; i++) designers.push(await signedInAt(server.baseUrl, demoEmails.designer));
    const studies: string[] = [];
    for (let i = 0; i < JOURNEYS; i++) {
      const created = await designers[i].post('/api/studies', { teamId: team, name: `Load journey ${i + 1}` });
      if (created.status !== 201) throw new Error(`creating a study answered ${created.status}: ${await created.text()}`);
      studies.push(((await created.json()) as { study: { id: string } }).study.id);
    }
    const groups: ReaderGroup[] = [];
    for (const [role, client] of [['designer', designer], ['reviewer', reviewer]] as const) {
      const paths = await readablePages(client);
      const share = role === 'designer' ? Math.ceil(READERS / 2) : Math.floor(READERS / 2);
      if (share > 0) groups.push({ role, cookie: cookieOf(client), paths, connections: share, requests: Math.round((READER_REQUESTS * share) / READERS) });
    }
    for (const group of groups) console.log(`Readers as the ${group.role}: ${group.connections} connections over ${group.paths.join(', ')}`);

    // 1. idle
    const idleFrom = performance.now();
    await sleep(IDLE_MS);
    const idleTo = performance.now();
    const idleRss = currentRss(server.pid);

    // 2. readers
    resetPeakRss(server.pid);
    const readersCpuFrom = cpuTimeMs(server.pid);
    const readersFrom = performance.now();
    const readers = await readPages(server.baseUrl, groups, { timeoutSeconds: 10, maxMs: READERS_MAX_MS });
    const readersTo = performance.now();
    const readersCpuTo = cpuTimeMs(server.pid);
    const readersLoad = loadavg()[0];
    // The server's CPU time per page answered (health samples included: one every 50 ms, a few per cent).
    const cpuMsPerPage =
      readersCpuFrom === null || readersCpuTo === null || readers.latencies.length === 0 ? null : Math.round(((readersCpuTo - readersCpuFrom) / readers.latencies.length) * 100) / 100;
    const pagesPerSecond = Math.round((readers.latencies.length / (readers.durationMs / 1000)) * 10) / 10;
    const readersPeak = peakRss(server.pid);
    await sleep(500);

    // 3. journeys
    resetPeakRss(server.pid);
    const files = demoFiles(root);
    const journeysFrom = performance.now();
    const deadline = journeysFrom + JOURNEYS_MAX_MS;
    const journeys = await Promise.all(designers.map((client, i) => runJourney(client, studies[i], i % 2 === 0 ? 'csv' : 'xlsx', files, deadline)));
    const journeysTo = performance.now();
    const journeysPeak = peakRss(server.pid);
    // The first part of the journeys, until the last confirmation (the whole phase when none got that far).
    const confirmations = journeys.map((journey) => journey.confirmedAt).filter((at): at is number => at !== undefined);
    const readingTo = confirmations.length > 0 ? Math.max(...confirmations) : journeysTo;

    await health.stop();
    const idle = samplesBetween(health.samples, idleFrom, idleTo);
    const duringReaders = samplesBetween(health.samples, readersFrom, readersTo);
    const duringJourneys = samplesBetween(health.samples, journeysFrom, journeysTo);
    const duringUploads = samplesBetween(health.samples, journeysFrom, readingTo);
    const healthFigures = {
      idle: { ...summarise(idle.latencies, HEALTH_GOAL_MS), failed: idle.failed },
      readers: { ...summarise(duringReaders.latencies, HEALTH_GOAL_MS), failed: duringReaders.failed },
      journeys: { ...summarise(duringJourneys.latencies, HEALTH_GOAL_MS), failed: duringJourneys.failed },
      uploadsAndConfirmations: { ...summarise(duringUploads.latencies, HEALTH_GOAL_MS), failed: duringUploads.failed },
    };
    const readerFigures = summarise(readers.latencies, READER_GOAL_MS);
    const afterFirstFigures = summarise(readers.afterFirstPage, READER_GOAL_MS);
    const firstPageFigures = summarise(readers.firstPages, READER_GOAL_MS);
    const readersClean = readers.non2xx + readers.errors + readers.timeouts === 0;
    const steps = {
      upload: stepFigures(journeys, 'uploadMs'),
      confirm: stepFigures(journeys, 'confirmMs'),
      auditStart: stepFigures(journeys, 'auditStartMs'),
      audit: stepFigures(journeys, 'auditMs'),
      total: stepFigures(journeys, 'totalMs'),
    };
    const journeyErrors = journeys.filter((journey) => journey.error !== undefined);
    const retries = journeys.reduce((sum, journey) => sum + journey.retries, 0);

    console.log(`\nGET /api/health every ${HEALTH_INTERVAL_MS} ms on loopback (goal: p95 under ${HEALTH_GOAL_MS} ms during the journeys)`);
    for (const [phase, figures] of Object.entries(healthFigures)) {
      console.log(`  ${phase.padEnd(24)} ${describeLatencies(figures)}   over ${HEALTH_GOAL_MS} ms: ${figures.over}   failed: ${figures.failed}`);
    }
    console.log(`\nReaders: ${READERS} connections, ${readers.latencies.length} pages in ${(readers.durationMs / 1000).toFixed(1)} s (goal: no error, p95 under ${READER_GOAL_MS} ms)`);
    console.log(`  all pages                ${describeLatencies(readerFigures, 'pages')}`);
    console.log(`  after each first page    ${describeLatencies(afterFirstFigures, 'pages')}`);
    console.log(`  each connection's first  ${describeLatencies(firstPageFigures, 'pages')}  (opened at once: accepted one per event-loop turn)`);
    console.log(`  ${pagesPerSecond} pages/s; server CPU ${cpuMsPerPage ?? 'n/a'} ms per page; load average ${readersLoad.toFixed(2)} at the end of the phase`);
    console.log(`  statuses ${JSON.stringify(readers.statuses)}   non-2xx ${readers.non2xx}   errors ${readers.errors}   timeouts ${readers.timeouts}`);
    if (!READERS_ONLY) {
      console.log(`\nJourneys: ${JOURNEYS} at once (${journeys.filter((j) => j.format === 'csv').length} CSV + codebook, ${journeys.filter((j) => j.format === 'xlsx').length} XLSX), ${((journeysTo - journeysFrom) / 1000).toFixed(1)} s in all`);
      for (const [step, figures] of Object.entries(steps)) console.log(`  ${step.padEnd(11)} ${describeLatencies(figures, 'journeys')}`);
      console.log(`  errors ${journeyErrors.length}   429/503 waited out and retried: ${retries}`);
      for (const journey of journeyErrors.slice(0, 5)) console.log(`    ${journey.format}: ${journey.error}`);
    }
    console.log(`\nServer memory: idle ${megabytes(idleRss)} resident; peak during the readers ${megabytes(readersPeak)}, during the journeys ${megabytes(journeysPeak)}`);
    console.log(
      JSON.stringify({
        bench: 'load',
        cores: availableParallelism(),
        health: healthFigures,
        readers: { connections: READERS, ...readerFigures, afterFirstPage: afterFirstFigures, firstPages: firstPageFigures, pagesPerSecond, cpuMsPerPage, loadAverage: readersLoad, non2xx: readers.non2xx, errors: readers.errors, timeouts: readers.timeouts },
        journeys: { count: JOURNEYS, steps, errors: journeyErrors.length, retries },
        peakRssMB: { readers: readersPeak === null ? null : Math.round(readersPeak / 1e6), journeys: journeysPeak === null ? null : Math.round(journeysPeak / 1e6) },
        goals: {
          healthP95DuringJourneysMs: HEALTH_GOAL_MS,
          metHealth: healthFigures.journeys.count > 0 && healthFigures.journeys.p95 < HEALTH_GOAL_MS && healthFigures.journeys.failed === 0,
          readerP95Ms: READER_GOAL_MS,
          metReaders: readerFigures.count > 0 && readerFigures.p95 < READER_GOAL_MS && readersClean,
          metReadersAfterFirstPage: afterFirstFigures.count > 0 && afterFirstFigures.p95 < READER_GOAL_MS && readersClean,
        },
      }),
    );
  } finally {
    await health.stop();
    await server.stop();
  }
}

await main();
