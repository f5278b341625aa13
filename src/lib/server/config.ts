/**
 * Server configuration, read from the environment and validated once (zod) on first use.
 * Secrets stay here, on the server: nothing in this module is imported by an island.
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';
import { availableParallelism } from 'node:os';
import { z } from 'zod';
import { DEFAULT_READ_LIMITS } from '../ingest/read-limits';
import { MAX_RESAMPLE_THREADS } from '../audit/resample-threads';

/** How outgoing e-mail leaves the server. */
export type MailTransportKind = 'outbox' | 'smtp';

/** The validated configuration the server runs with. */
export interface ServerConfig {
  readonly mode: 'development' | 'demo' | 'test' | 'production';
  readonly databasePath: string;
  readonly uploadDir: string;
  readonly authSecret: string;
  readonly host: string;
  readonly port: number;
  /** Where people reach the server (links in e-mails, secure cookies when https). */
  readonly publicUrl: string;
  readonly secureCookies: boolean;
  readonly mailTransport: MailTransportKind;
  readonly smtpUrl: string | null;
  readonly mailFrom: string;
  readonly demoSeed: boolean;
  /** Use the first X-Forwarded-For address as the client address (behind a known proxy only). */
  readonly trustProxy: boolean;
  readonly limits: {
    readonly uploadBytes: number;
    readonly rows: number;
    readonly columns: number;
    /** Heap the isolated workbook reader may use, in MB. */
    readonly workbookMemoryMb: number;
    /** Seconds the isolated workbook reader may take. */
    readonly workbookSeconds: number;
    /** Wave readers (threads reading an upload) at once; all of them together use at most this × workbookMemoryMb of heap. */
    readonly readers: number;
    /** Uploads and confirmations that may wait for a reader; past this they are refused with 503. */
    readonly readerQueue: number;
  };
  /** Audits that may run at once, each in its own worker thread (1 to 64). */
  readonly auditWorkers: number;
  /**
   * Audits one team may run at once (1 to auditWorkers); by default one fewer than auditWorkers
   * (at least 1), so a thread stays free for another team. docs/decisions/016-fair-audits.md.
   */
  readonly auditWorkersPerTeam: number;
  /** Seconds an audit may run in its thread before it is stopped and fails. */
  readonly auditMaxSeconds: number;
  /** Requests the web thread starts per turn of its event loop, the others waiting in order (docs/decisions/025-reader-latency.md). */
  readonly requestsPerTurn: number;
  /**
   * Threads that decide one audit's bootstrap resamples (0 to MAX_RESAMPLE_THREADS): 0 keeps them
   * on the audit's own thread. The audit's thread waits meanwhile. docs/decisions/021, addendum.
   */
  readonly resampleThreads: number;
  readonly signIn: {
    /** Failed attempts per e-mail address within the window before 429. */
    readonly maxFailuresPerEmail: number;
    /** Failed attempts per client address within the window before 429. */
    readonly maxFailuresPerAddress: number;
    readonly windowMinutes: number;
  };
}

/** Wave readers at once by default: two keeps a core for the web thread on a 2-core machine (docs/decisions/018-workbook-worker.md). */
export const DEFAULT_UPLOAD_READERS = 2;
/** Requests started per turn of the event loop by default: 2 lost throughput, 4 and 8 were alike, 4 kept health faster (docs/decisions/025-reader-latency.md). */
export const DEFAULT_REQUESTS_PER_TURN = 4;
/** Uploads and confirmations that may wait for a reader by default. */
export const DEFAULT_UPLOAD_READER_QUEUE = 16;

const booleanText = z
  .enum(['1', '0', 'true', 'false', 'yes', 'no', 'on', 'off'])
  .transform((value) => ['1', 'true', 'yes', 'on'].includes(value));

const positiveInteger = z.coerce.number().int().positive();

const environmentSchema = z.object({
  PAREDOWN_MODE: z.enum(['development', 'demo', 'test', 'production']).optional(),
  NODE_ENV: z.string().optional(),
  DATABASE_PATH: z.string().min(1).default('data/paredown.sqlite'),
  UPLOAD_DIR: z.string().min(1).default('data/uploads'),
  AUTH_SECRET: z.string().min(32, 'AUTH_SECRET must be at least 32 characters').optional(),
  HOST: z.string().min(1).default('127.0.0.1'),
  PORT: z.coerce.number().int().min(1).max(65535).default(4321),
  PUBLIC_URL: z.url().optional(),
  MAIL_TRANSPORT: z.enum(['outbox', 'smtp']).optional(),
  SMTP_URL: z.string().min(1).optional(),
  MAIL_FROM: z.string().min(3).default('Paredown <no-reply@paredown.test>'),
  DEMO_SEED: booleanText.default(true),
  TRUST_PROXY: booleanText.default(false),
  UPLOAD_MAX_BYTES: positiveInteger.default(50 * 1024 * 1024),
  UPLOAD_MAX_ROWS: positiveInteger.default(200_000),
  UPLOAD_MAX_COLUMNS: positiveInteger.default(2_000),
  UPLOAD_MAX_WORKBOOK_MEMORY_MB: positiveInteger.default(DEFAULT_READ_LIMITS.maxWorkbookMemoryMb),
  UPLOAD_MAX_WORKBOOK_SECONDS: positiveInteger.default(DEFAULT_READ_LIMITS.maxWorkbookSeconds),
  UPLOAD_READERS: z.coerce.number().int().min(1).max(64).default(DEFAULT_UPLOAD_READERS),
  UPLOAD_READER_QUEUE: z.coerce.number().int().min(0).max(1000).default(DEFAULT_UPLOAD_READER_QUEUE),
  AUDIT_WORKERS: z.coerce.number().int().min(1).max(64).optional(),
  AUDIT_WORKERS_PER_TEAM: z.coerce.number().int().min(1).max(64).optional(),
  // A day at most: beyond that a limit protects nothing (and setTimeout holds up to 24.8 days).
  AUDIT_MAX_SECONDS: z.coerce.number().int().min(1).max(86_400).default(600),
  REQUESTS_PER_TURN: z.coerce.number().int().min(1).max(1000).default(DEFAULT_REQUESTS_PER_TURN),
  RESAMPLE_THREADS: z.coerce.number().int().min(0).max(MAX_RESAMPLE_THREADS).optional(),
  SIGNIN_MAX_FAILURES_PER_EMAIL: positiveInteger.default(5),
  SIGNIN_MAX_FAILURES_PER_ADDRESS: positiveInteger.default(30),
  SIGNIN_WINDOW_MINUTES: positiveInteger.default(15),
});

/** Environment variables that are set but empty count as unset. */
function withoutEmptyValues(environment: NodeJS.ProcessEnv): Record<string, string> {
  const entries = Object.entries(environment).filter(
    (entry): entry is [string, string] => typeof entry[1] === 'string' && entry[1].trim() !== '',
  );
  return Object.fromEntries(entries);
}

/**
 * Reads the secret kept beside the database for development and demo use, creating it once.
 * @param databasePath path of the SQLite file; the secret lives in the same folder.
 * @returns the secret (64 hex characters).
 */
function localAuthSecret(databasePath: string): string {
  const file = resolve(dirname(databasePath), '.auth-secret');
  if (existsSync(file)) {
    const kept = readFileSync(file, 'utf8').trim();
    if (kept.length >= 32) return kept;
  }
  mkdirSync(dirname(file), { recursive: true });
  const secret = randomBytes(32).toString('hex');
  writeFileSync(file, secret + '\n', { mode: 0o600 });
  return secret;
}

/**
 * Validates an environment into a configuration.
 * @param environment the variables to read (process.env by default).
 * @throws Error naming every invalid variable, or AUTH_SECRET missing in production.
 * @returns the configuration.
 */
export function parseConfig(environment: NodeJS.ProcessEnv = process.env): ServerConfig {
  const parsed = environmentSchema.safeParse(withoutEmptyValues(environment));
  if (!parsed.success) {
    const problems = parsed.error.issues.map((issue) => `${issue.path.join('.')}: ${issue.message}`);
    throw new Error(`parseConfig: invalid configuration (${problems.join('; ')})`);
  }
  const env = parsed.data;
  const mode = env.PAREDOWN_MODE ?? (env.NODE_ENV === 'production' ? 'production' : 'development');
  const databasePath = resolve(env.DATABASE_PATH);
  if (mode === 'production' && !env.AUTH_SECRET) {
    throw new Error('parseConfig: AUTH_SECRET is required in production (at least 32 random characters)');
  }
  const mailTransport = env.MAIL_TRANSPORT ?? (mode === 'production' ? 'smtp' : 'outbox');
  if (mailTransport === 'smtp' && !env.SMTP_URL) {
    throw new Error('parseConfig: SMTP_URL is required when MAIL_TRANSPORT is smtp');
  }
  const publicUrl = (env.PUBLIC_URL ?? `http://${env.HOST}:${env.PORT}`).replace(/\/+$/, '');
  const auditWorkers = env.AUDIT_WORKERS ?? Math.max(1, Math.min(64, availableParallelism()));
  return {
    mode,
    databasePath,
    uploadDir: resolve(env.UPLOAD_DIR),
    authSecret: env.AUTH_SECRET ?? localAuthSecret(databasePath),
    host: env.HOST,
    port: env.PORT,
    publicUrl,
    secureCookies: publicUrl.startsWith('https://'),
    mailTransport,
    smtpUrl: env.SMTP_URL ?? null,
    mailFrom: env.MAIL_FROM,
    demoSeed: env.DEMO_SEED,
    trustProxy: env.TRUST_PROXY,
    limits: {
      uploadBytes: env.UPLOAD_MAX_BYTES,
      rows: env.UPLOAD_MAX_ROWS,
      columns: env.UPLOAD_MAX_COLUMNS,
      workbookMemoryMb: env.UPLOAD_MAX_WORKBOOK_MEMORY_MB,
      workbookSeconds: env.UPLOAD_MAX_WORKBOOK_SECONDS,
      readers: env.UPLOAD_READERS,
      readerQueue: env.UPLOAD_READER_QUEUE,
    },
    auditWorkers,
    // More per team than in the whole pool means no per-team limit: the pool's size bounds it.
    auditWorkersPerTeam: Math.min(auditWorkers, env.AUDIT_WORKERS_PER_TEAM ?? Math.max(1, auditWorkers - 1)),
    auditMaxSeconds: env.AUDIT_MAX_SECONDS,
    requestsPerTurn: env.REQUESTS_PER_TURN,
    resampleThreads: env.RESAMPLE_THREADS ?? Math.min(MAX_RESAMPLE_THREADS, availableParallelism()),
    signIn: {
      maxFailuresPerEmail: env.SIGNIN_MAX_FAILURES_PER_EMAIL,
      maxFailuresPerAddress: env.SIGNIN_MAX_FAILURES_PER_ADDRESS,
      windowMinutes: env.SIGNIN_WINDOW_MINUTES,
    },
  };
}

/**
 * Where the data lives (DATABASE_PATH, UPLOAD_DIR with their defaults), read without the rest of
 * the configuration and without side effects: what `npm run backup` and `restore` need.
 * @param environment the variables to read (process.env by default).
 * @returns both paths, absolute.
 */
export function storageLocations(environment: NodeJS.ProcessEnv = process.env): { databasePath: string; uploadDir: string } {
  const env = environmentSchema.pick({ DATABASE_PATH: true, UPLOAD_DIR: true }).parse(withoutEmptyValues(environment));
  return { databasePath: resolve(env.DATABASE_PATH), uploadDir: resolve(env.UPLOAD_DIR) };
}

let current: ServerConfig | null = null;

/**
 * The configuration of this process, validated on first call and kept.
 * @throws Error when the environment is invalid (see parseConfig).
 * @returns the configuration.
 */
export function getConfig(): ServerConfig {
  current ??= parseConfig(process.env);
  return current;
}
