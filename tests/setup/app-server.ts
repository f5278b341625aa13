/**
 * Global setup of the `app` test project: a temporary folder with its own SQLite file and upload
 * folder, migrated and seeded with the demo; the built server (dist/server/entry.mjs) started on
 * a free loopback port with MAIL_TRANSPORT=outbox; stopped and cleaned after the run.
 * Tests read the address with `inject('baseUrl')`. Tests that need a server of their own start
 * one with `startTestServer`, or with `createTestDatabase` and `startServerOn` to restart servers
 * on one database.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { createWriteStream, existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import type { TestProject } from 'vitest/node';
import { openDatabase } from '../../src/db/client';
import { seedDemo } from '../../src/lib/server/demo-seed';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    databasePath: string;
  }
}

const root = resolve(import.meta.dirname, '..', '..');

function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const server = createServer();
    server.unref();
    server.on('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => resolvePort(port));
    });
  });
}

/** A migrated database in a temporary folder of its own, with the folder for uploaded files. */
export interface TestDatabase {
  folder: string;
  databasePath: string;
  uploadDir: string;
  /** Deletes the folder with the database and the uploads. */
  remove: () => void;
}

/**
 * Creates a temporary folder with a migrated database, seeded with the demo unless asked not to.
 * @param options seed: whether to seed the demo (the first-run test starts empty).
 * @throws Error when the demo could not be seeded.
 * @returns the folder, its database and upload paths, and a function that removes them.
 */
export async function createTestDatabase(options: { seed: boolean }): Promise<TestDatabase> {
  const folder = mkdtempSync(join(tmpdir(), 'paredown-app-test-'));
  const databasePath = join(folder, 'paredown.sqlite');
  const uploadDir = join(folder, 'uploads');
  const remove = () => rmSync(folder, { recursive: true, force: true });
  const db = openDatabase(databasePath);
  try {
    if (options.seed) {
      const outcome = await seedDemo(db, { enabled: true, uploadDir, fixturesDir: join(root, 'fixtures', 'demo') });
      if (!outcome.seeded) throw new Error(`the test database was not seeded: ${outcome.reason}`);
    }
  } finally {
    db.$client.close();
  }
  return { folder, databasePath, uploadDir, remove };
}

/** A running server on a test database. */
export interface RunningServer {
  baseUrl: string;
  child: ChildProcess;
  /** Ends the process with a signal (SIGKILL after 5 s if it is still running) and waits for it to exit. */
  stop: (signal?: NodeJS.Signals) => Promise<void>;
}

/**
 * Starts the built server (dist/server/entry.mjs) on a free loopback port and a test database,
 * and waits until /api/health answers.
 * @param database the database (not removed when the server stops; several servers may use it in turn).
 * @param options logName: file name of the server's log under test-results/.
 * @param options appendLog: append to the log rather than start it afresh (servers restarted on one database).
 * @param options environment: variables set on top of the test defaults (DEMO_SEED=0, MAIL_TRANSPORT=outbox, ...).
 * @throws Error when there is no build, or the server exits or does not answer within 30 s.
 * @returns the address, the child process and a stop function.
 */
export async function startServerOn(
  database: TestDatabase,
  options: { logName: string; appendLog?: boolean; environment?: Record<string, string> },
): Promise<RunningServer> {
  const entry = join(root, 'dist', 'server', 'entry.mjs');
  if (!existsSync(entry)) throw new Error('No build in dist/: run `npm test` (it builds) or `npm run build` first.');
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  mkdirSync(join(root, 'test-results'), { recursive: true });
  const log = createWriteStream(join(root, 'test-results', options.logName), { flags: options.appendLog ? 'a' : 'w' });
  const child = spawn(process.execPath, [entry], {
    cwd: root,
    env: {
      ...process.env,
      PAREDOWN_MODE: 'test',
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      PUBLIC_URL: baseUrl,
      DATABASE_PATH: database.databasePath,
      UPLOAD_DIR: database.uploadDir,
      AUTH_SECRET: randomBytes(32).toString('hex'),
      MAIL_TRANSPORT: 'outbox',
      DEMO_SEED: '0',
      ASTRO_TELEMETRY_DISABLED: '1',
      ...options.environment,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout?.pipe(log, { end: false });
  child.stderr?.pipe(log, { end: false });
  const exited = new Promise<void>((resolveExit) => child.once('exit', () => resolveExit()));
  const stop = async (signal: NodeJS.Signals = 'SIGTERM') => {
    if (child.exitCode === null && child.signalCode === null) {
      child.kill(signal);
      const timer = setTimeout(() => child.kill('SIGKILL'), 5_000);
      await exited;
      clearTimeout(timer);
    }
    log.end();
  };
  const deadlineMs = 30_000;
  const started = Date.now();
  while (Date.now() - started < deadlineMs) {
    if (child.exitCode !== null) {
      log.end();
      throw new Error(`the test server exited early with code ${child.exitCode}; see test-results/${options.logName}`);
    }
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) return { baseUrl, child, stop };
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  await stop('SIGKILL');
  throw new Error(`the test server did not answer ${baseUrl}/api/health within ${deadlineMs} ms; see test-results/${options.logName}`);
}

/** A running test server on a database of its own. */
export interface TestServer {
  baseUrl: string;
  databasePath: string;
  uploadDir: string;
  /** The server's process id (its peak memory, a kill -9). */
  pid: number;
  /** Stops the server and removes its database folder. */
  stop: () => Promise<void>;
}

/**
 * Starts the built server on a free loopback port with its own temporary database.
 * @param options seed: whether to seed the demo first (the first-run test starts empty, DEMO_SEED=0).
 * @param options logName: file name of the server's log under test-results/.
 * @param options environment: variables set on top of the test defaults (limits, TRUST_PROXY=0, ...).
 * @throws Error when there is no build, or the server does not start.
 * @returns the address, the database and upload paths, the process id and a stop function that also removes the folder.
 */
export async function startTestServer(options: { seed: boolean; logName: string; environment?: Record<string, string> }): Promise<TestServer> {
  const database = await createTestDatabase({ seed: options.seed });
  let server: RunningServer;
  try {
    server = await startServerOn(database, {
      logName: options.logName,
      environment: {
        DEMO_SEED: options.seed ? '1' : '0',
        // Lets the rate-limit test speak for different client addresses.
        TRUST_PROXY: '1',
        ...options.environment,
      },
    });
  } catch (error) {
    database.remove();
    throw error;
  }
  const stop = async () => {
    await server.stop();
    database.remove();
  };
  return { baseUrl: server.baseUrl, databasePath: database.databasePath, uploadDir: database.uploadDir, pid: server.child.pid ?? 0, stop };
}

export default async function setup(project: TestProject) {
  // The shared server serves one team's many test files one after another: the per-team share of
  // the audit threads (docs/decisions/016) is tested on its own servers (audits-fair.test.ts), so
  // here the demo team may use every thread, as a one-team installation would.
  const server = await startTestServer({ seed: true, logName: 'app-server.log', environment: { AUDIT_WORKERS: '2', AUDIT_WORKERS_PER_TEAM: '2' } });
  project.provide('baseUrl', server.baseUrl);
  project.provide('databasePath', server.databasePath);
  return server.stop;
}
