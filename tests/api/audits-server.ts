/**
 * For the audit tests that need a server of their own: a seeded database in a temporary folder
 * that outlives one server, and the built server (dist/server/entry.mjs) started on it, stopped
 * or killed, and started again on the same file. Mirrors tests/setup/app-server.ts.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { createWriteStream, existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { openDatabase } from '../../src/db/client';
import { seedDemo } from '../../src/db/seed';

const root = resolve(import.meta.dirname, '..', '..');

/** A seeded database in its own folder. */
export interface TestDatabase {
  folder: string;
  databasePath: string;
  uploadDir: string;
  remove: () => void;
}

/** Creates a temporary folder with a migrated database holding the demo. */
export async function seededDatabase(): Promise<TestDatabase> {
  const folder = mkdtempSync(join(tmpdir(), 'paredown-audit-test-'));
  const databasePath = join(folder, 'paredown.sqlite');
  const uploadDir = join(folder, 'uploads');
  const db = openDatabase(databasePath);
  const outcome = await seedDemo(db, { enabled: true, uploadDir, fixturesDir: join(root, 'fixtures', 'demo') });
  db.$client.close();
  if (!outcome.seeded) throw new Error(`the audit test database was not seeded: ${outcome.reason}`);
  return { folder, databasePath, uploadDir, remove: () => rmSync(folder, { recursive: true, force: true }) };
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

/** A running server on a test database. */
export interface RunningServer {
  baseUrl: string;
  child: ChildProcess;
  /** Ends the process with a signal and waits for it to exit. */
  stop: (signal?: NodeJS.Signals) => Promise<void>;
}

/**
 * Starts the built server on a database and waits until /api/health answers.
 * @param database the database (not removed when the server stops).
 * @param logName file name of the server's log under test-results/.
 * @param environment extra variables (e.g. AUDIT_WORKERS).
 */
export async function startServerOn(database: TestDatabase, logName: string, environment: Record<string, string> = {}): Promise<RunningServer> {
  const entry = join(root, 'dist', 'server', 'entry.mjs');
  if (!existsSync(entry)) throw new Error('No build in dist/: run `npm run build` first.');
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  mkdirSync(join(root, 'test-results'), { recursive: true });
  const log = createWriteStream(join(root, 'test-results', logName), { flags: 'a' });
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
      ...environment,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout?.pipe(log, { end: false });
  child.stderr?.pipe(log, { end: false });
  const exited = new Promise<void>((resolveExit) => child.once('exit', () => resolveExit()));
  const stop = async (signal: NodeJS.Signals = 'SIGTERM') => {
    if (child.exitCode === null && child.signalCode === null) child.kill(signal);
    await exited;
    log.end();
  };
  for (let attempt = 0; attempt < 300; attempt++) {
    if (child.exitCode !== null) throw new Error(`the audit test server exited early (code ${child.exitCode}); see test-results/${logName}`);
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) return { baseUrl, child, stop };
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  await stop('SIGKILL');
  throw new Error(`the audit test server did not answer within 30 s; see test-results/${logName}`);
}
