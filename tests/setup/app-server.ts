/**
 * Global setup of the `app` test project: a temporary folder with its own SQLite file and upload
 * folder, migrated and seeded with the demo; the built server (dist/server/entry.mjs) started on
 * a free loopback port with MAIL_TRANSPORT=outbox; stopped and cleaned after the run.
 * Tests read the address with `inject('baseUrl')`.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { createWriteStream, existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import type { TestProject } from 'vitest/node';
import { openDatabase } from '../../src/db/client';
import { seedDemo } from '../../src/db/seed';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    databasePath: string;
  }
}

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

async function waitForHealth(baseUrl: string, child: ChildProcess, deadlineMs: number): Promise<void> {
  const started = Date.now();
  while (Date.now() - started < deadlineMs) {
    if (child.exitCode !== null) throw new Error(`the test server exited early with code ${child.exitCode}`);
    try {
      const response = await fetch(`${baseUrl}/api/health`);
      if (response.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`the test server did not answer ${baseUrl}/api/health within ${deadlineMs} ms`);
}

/** A running test server. */
export interface TestServer {
  baseUrl: string;
  databasePath: string;
  stop: () => Promise<void>;
}

/**
 * Starts the built server on a free loopback port with its own temporary database.
 * @param options seed: whether to seed the demo first (the first-run test starts empty, DEMO_SEED=0).
 * @param options logName: file name of the server's log under test-results/.
 * @returns the address, the database path and a stop function that also removes the folder.
 */
export async function startTestServer(options: { seed: boolean; logName: string }): Promise<TestServer> {
  const root = resolve(import.meta.dirname, '..', '..');
  const entry = join(root, 'dist', 'server', 'entry.mjs');
  if (!existsSync(entry)) throw new Error('No build in dist/: run `npm test` (it builds) or `npm run build` first.');
  const folder = mkdtempSync(join(tmpdir(), 'paredown-app-test-'));
  const databasePath = join(folder, 'paredown.sqlite');
  const uploadDir = join(folder, 'uploads');
  const db = openDatabase(databasePath);
  if (options.seed) {
    const outcome = await seedDemo(db, { enabled: true, uploadDir, fixturesDir: join(root, 'fixtures', 'demo') });
    if (!outcome.seeded) throw new Error(`the test database was not seeded: ${outcome.reason}`);
  }
  db.$client.close();

  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  mkdirSync(join(root, 'test-results'), { recursive: true });
  const log = createWriteStream(join(root, 'test-results', options.logName));
  const child = spawn(process.execPath, [entry], {
    cwd: root,
    env: {
      ...process.env,
      PAREDOWN_MODE: 'test',
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      PUBLIC_URL: baseUrl,
      DATABASE_PATH: databasePath,
      UPLOAD_DIR: uploadDir,
      AUTH_SECRET: randomBytes(32).toString('hex'),
      MAIL_TRANSPORT: 'outbox',
      DEMO_SEED: options.seed ? '1' : '0',
      // Lets the rate-limit test speak for different client addresses.
      TRUST_PROXY: '1',
      ASTRO_TELEMETRY_DISABLED: '1',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout?.pipe(log);
  child.stderr?.pipe(log);
  try {
    await waitForHealth(baseUrl, child, 30_000);
  } catch (error) {
    child.kill('SIGTERM');
    throw new Error(`${(error as Error).message}; see test-results/${options.logName}`);
  }
  const stop = async () => {
    await new Promise<void>((resolveExit) => {
      if (child.exitCode !== null) return resolveExit();
      const timer = setTimeout(() => {
        child.kill('SIGKILL');
        resolveExit();
      }, 5_000);
      child.once('exit', () => {
        clearTimeout(timer);
        resolveExit();
      });
      child.kill('SIGTERM');
    });
    log.end();
    rmSync(folder, { recursive: true, force: true });
  };
  return { baseUrl, databasePath, stop };
}

export default async function setup(project: TestProject) {
  const server = await startTestServer({ seed: true, logName: 'app-server.log' });
  project.provide('baseUrl', server.baseUrl);
  project.provide('databasePath', server.databasePath);
  return server.stop;
}
