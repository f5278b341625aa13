/**
 * Backups (src/lib/server/backup/): the demo seeded into a temporary database, backed up while
 * another process keeps writing to it, restored elsewhere, and compared: the same tables and row
 * counts as the manifest, every uploaded file with the same sha256 (FIPS 180-4, recomputed here
 * with node:crypto), SQLite's own PRAGMA integrity_check answering "ok". Then the refusals: a
 * target in use, a target not empty (and --force keeping the old database), a tampered backup,
 * each writing nothing; and the two command lines' exit codes.
 */
import Database from 'better-sqlite3';
import { execFileSync, spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { createHash } from 'node:crypto';
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../../src/db/client';
import { BackupRefusal, createBackup } from '../../src/lib/server/backup/create-backup';
import { RestoreRefusal, databaseInUse, restoreBackup } from '../../src/lib/server/backup/restore-backup';
import { seedDemo } from '../../src/lib/server/demo-seed';

const root = join(import.meta.dirname, '..', '..');
const sha256 = (path: string) => createHash('sha256').update(readFileSync(path)).digest('hex');

let folder: string;
let live: { databasePath: string; uploadDir: string };

/** Rows per table, straight from SQLite (not through the module under test). */
function countRows(path: string): Record<string, number> {
  const db = new Database(path, { readonly: true, fileMustExist: true });
  try {
    const names = (db.prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name").all() as { name: string }[]).map((r) => r.name);
    return Object.fromEntries(names.map((name) => [name, (db.prepare(`select count(*) as n from "${name}"`).get() as { n: number }).n]));
  } finally {
    db.close();
  }
}

function integrityCheck(path: string): string {
  const db = new Database(path, { readonly: true, fileMustExist: true });
  try {
    return db.pragma('integrity_check', { simple: true }) as string;
  } finally {
    db.close();
  }
}

/** Every file under a folder, by path relative to it, with its sha256. */
function hashesUnder(dir: string): Record<string, string> {
  if (!existsSync(dir)) return {};
  const out: Record<string, string> = {};
  for (const entry of readdirSync(dir, { recursive: true, withFileTypes: true })) {
    if (entry.isFile()) out[join(entry.parentPath, entry.name).slice(dir.length + 1)] = sha256(join(entry.parentPath, entry.name));
  }
  return out;
}

/** Another process writing to the live database as fast as it can (one activity row per statement) until killed. */
function startWriter(databasePath: string): Promise<ChildProcess> {
  const script = `
    const Database = require('better-sqlite3');
    const db = new Database(process.argv[1]);
    db.pragma('journal_mode = WAL'); db.pragma('busy_timeout = 5000');
    const insert = db.prepare("insert into activity_log (action, detail, at) values ('backup-test.write', '{}', ?)");
    let n = 0;
    const tick = () => { for (let i = 0; i < 20; i++) insert.run(Date.now()); n += 20; if (n === 200) process.stdout.write('ready\\n'); setImmediate(tick); };
    tick();`;
  const child = spawn(process.execPath, ['-e', script, databasePath], { cwd: root, stdio: ['ignore', 'pipe', 'inherit'] });
  return new Promise((resolve, reject) => {
    child.stdout!.on('data', (chunk: Buffer) => chunk.toString().includes('ready') && resolve(child));
    child.on('exit', (code) => reject(new Error(`the writer stopped early (${code})`)));
  });
}

beforeAll(async () => {
  folder = mkdtempSync(join(tmpdir(), 'paredown-backup-'));
  live = { databasePath: join(folder, 'live', 'paredown.sqlite'), uploadDir: join(folder, 'live', 'uploads') };
  const db = openDatabase(live.databasePath);
  const outcome = await seedDemo(db, { enabled: true, uploadDir: live.uploadDir, audit: false });
  db.$client.close();
  expect(outcome.seeded).toBe(true);
}, 120_000);

afterAll(() => {
  rmSync(folder, { recursive: true, force: true });
});

describe('backup and restore', () => {
  it('round-trips the demo while another process writes: same tables, rows as the copy, files by sha256, integrity ok', async () => {
    const before = countRows(live.databasePath);
    const writer = await startWriter(live.databasePath);
    let backup;
    try {
      backup = await createBackup({ ...live, outDir: join(folder, 'bk-1') });
    } finally {
      writer.kill('SIGKILL');
      await new Promise((resolve) => writer.once('exit', resolve));
    }
    const after = countRows(live.databasePath);
    const { manifest } = backup;
    const copy = join(folder, 'bk-1', 'paredown.sqlite');

    // The copy is one committed state: the writer's rows in it lie between before and after,
    // and every other table is as the demo left it.
    expect(manifest.database.tables).toEqual(countRows(copy));
    expect(manifest.database.tables.activity_log).toBeGreaterThanOrEqual(before.activity_log + 200);
    expect(manifest.database.tables.activity_log).toBeLessThanOrEqual(after.activity_log);
    expect(after.activity_log).toBeGreaterThan(before.activity_log + 200);
    expect({ ...manifest.database.tables, activity_log: 0 }).toEqual({ ...before, activity_log: 0 });
    expect(Object.keys(manifest.database.tables)).toEqual(Object.keys(before));
    expect(integrityCheck(copy)).toBe('ok');
    expect(manifest.database.sha256).toBe(sha256(copy));
    // The demo stores four files (each of its two waves and codebooks); the migration level is the journal's length.
    expect(manifest.files).toHaveLength(4);
    expect(manifest.problems).toEqual([]);
    const journal = JSON.parse(readFileSync(join(root, 'drizzle', 'meta', '_journal.json'), 'utf8')) as { entries: { tag: string }[] };
    expect(manifest.database.migrations.applied).toBe(journal.entries.length);
    expect(manifest.database.migrations.latest).toBe(journal.entries.at(-1)!.tag);

    const target = { databasePath: join(folder, 'restored', 'db', 'paredown.sqlite'), uploadDir: join(folder, 'restored', 'uploads') };
    const restored = restoreBackup({ from: join(folder, 'bk-1'), ...target });
    expect(restored.previousDatabase).toBeNull();
    expect(restored.filesWritten).toBe(4);
    expect(countRows(target.databasePath)).toEqual(manifest.database.tables);
    expect(integrityCheck(target.databasePath)).toBe('ok');
    // Files: the live store's four files, byte for byte, at the same paths.
    expect(hashesUnder(target.uploadDir)).toEqual(hashesUnder(live.uploadDir));
    for (const [path, hash] of Object.entries(hashesUnder(target.uploadDir))) expect(path.endsWith(hash)).toBe(true);
    // The server opens it (migrations already applied: nothing to do) and reads the demo.
    const db = openDatabase(target.databasePath);
    expect(db.$client.prepare('select name from studies order by name').all()).toHaveLength(3);
    db.$client.close();
  });

  it('refuses a target in use, even with force, and writes nothing', async () => {
    await createBackup({ ...live, outDir: join(folder, 'bk-2') });
    const target = { databasePath: join(folder, 'busy', 'paredown.sqlite'), uploadDir: join(folder, 'busy', 'uploads') };
    const holder = openDatabase(target.databasePath);
    holder.$client.prepare('select count(*) from users').get();
    try {
      expect(databaseInUse(target.databasePath)).toBe(true);
      expect(() => restoreBackup({ from: join(folder, 'bk-2'), ...target, force: true })).toThrow(/is in use .*stop it first/);
      expect(countRows(target.databasePath).users).toBe(0);
      expect(existsSync(target.uploadDir)).toBe(false);
    } finally {
      holder.$client.close();
    }
    expect(databaseInUse(target.databasePath)).toBe(false);
  });

  it('refuses a target that is not empty unless forced; forced, it keeps the old database beside the new one', () => {
    const target = { databasePath: join(folder, 'full', 'paredown.sqlite'), uploadDir: join(folder, 'full', 'uploads') };
    mkdirSync(join(folder, 'full'));
    const old = new Database(target.databasePath);
    old.exec("create table keep_me (x); insert into keep_me values ('old')");
    old.close();
    expect(() => restoreBackup({ from: join(folder, 'bk-2'), ...target })).toThrow(RestoreRefusal);
    expect(() => restoreBackup({ from: join(folder, 'bk-2'), ...target })).toThrow(/not empty .*--force/);
    expect(Object.keys(countRows(target.databasePath))).toEqual(['keep_me']);
    expect(existsSync(target.uploadDir)).toBe(false);

    const outcome = restoreBackup({ from: join(folder, 'bk-2'), ...target, force: true, now: new Date('2026-01-02T03:04:05Z') });
    expect(outcome.previousDatabase).toBe(`${target.databasePath}.before-restore-20260102T030405Z`);
    expect(Object.keys(countRows(outcome.previousDatabase!))).toEqual(['keep_me']);
    expect(countRows(target.databasePath)).toEqual(outcome.manifest.database.tables);
  });

  it('forced over a database left by a crash (its -wal uncheckpointed), keeps the old data whole and the restored one clean', () => {
    const target = { databasePath: join(folder, 'crashed', 'paredown.sqlite'), uploadDir: join(folder, 'crashed', 'uploads') };
    mkdirSync(join(folder, 'crashed'));
    // A process that writes in WAL mode and dies without closing leaves its -wal (uncheckpointed pages) behind.
    const script = `
      const db = new (require('better-sqlite3'))(process.argv[1]);
      db.pragma('journal_mode = WAL'); db.pragma('wal_autocheckpoint = 0');
      db.exec("create table old_rows (x); insert into old_rows values ('a'), ('b')");
      for (let i = 0; i < 50; i++) db.exec("insert into old_rows values (randomblob(4000))");
      process.kill(process.pid, 'SIGKILL');`;
    spawnSync(process.execPath, ['-e', script, target.databasePath], { cwd: root });
    expect(existsSync(`${target.databasePath}-wal`)).toBe(true);
    const outcome = restoreBackup({ from: join(folder, 'bk-2'), ...target, force: true, now: new Date('2026-01-02T03:04:05Z') });
    expect(existsSync(`${target.databasePath}-wal`)).toBe(false);
    expect(integrityCheck(target.databasePath)).toBe('ok');
    expect(countRows(target.databasePath)).toEqual(outcome.manifest.database.tables);
    // The old database, with what its log held (SQLite recovers the log when the restore checks for users), still reads as it was.
    expect(countRows(outcome.previousDatabase!)).toEqual({ old_rows: 52 });
  });

  it('refuses a tampered or incomplete backup before writing anything', () => {
    const target = { databasePath: join(folder, 'never', 'paredown.sqlite'), uploadDir: join(folder, 'never', 'uploads') };
    const tamper = (name: string, change: (dir: string) => void) => {
      const dir = join(folder, name);
      cpSync(join(folder, 'bk-2'), dir, { recursive: true });
      change(dir);
      return dir;
    };
    const manifest = JSON.parse(readFileSync(join(folder, 'bk-2', 'manifest.json'), 'utf8')) as { files: { storagePath: string }[] };
    const file = manifest.files[0].storagePath;
    const changedFile = tamper('bk-file', (dir) => writeFileSync(join(dir, 'uploads', file), 'not the original'));
    const lostFile = tamper('bk-lost', (dir) => rmSync(join(dir, 'uploads', file)));
    const changedDb = tamper('bk-db', (dir) => {
      const db = new Database(join(dir, 'paredown.sqlite'));
      db.exec("update teams set name = 'changed'");
      db.close();
    });
    const escaping = tamper('bk-escape', (dir) => {
      const text = readFileSync(join(dir, 'manifest.json'), 'utf8').replace(`"storagePath": "${file}"`, '"storagePath": "../../../etc/passwd"');
      writeFileSync(join(dir, 'manifest.json'), text);
    });
    const newer = tamper('bk-newer', (dir) => {
      const text = readFileSync(join(dir, 'manifest.json'), 'utf8').replace(/"applied": \d+/, '"applied": 999');
      writeFileSync(join(dir, 'manifest.json'), text);
    });
    expect(() => restoreBackup({ from: changedFile, ...target })).toThrow(/does not match its sha256/);
    expect(() => restoreBackup({ from: lostFile, ...target })).toThrow(/lacks the uploaded file/);
    expect(() => restoreBackup({ from: changedDb, ...target })).toThrow(/does not match the sha256 in its manifest/);
    expect(() => restoreBackup({ from: escaping, ...target })).toThrow(/outside its folder/);
    expect(() => restoreBackup({ from: newer, ...target })).toThrow(/newer than this Paredown/);
    expect(() => restoreBackup({ from: join(folder, 'live'), ...target })).toThrow(/holds no manifest.json/);
    expect(existsSync(join(folder, 'never'))).toBe(false);
  });

  it('refuses to write a backup into a folder that is not empty', async () => {
    mkdirSync(join(folder, 'occupied'));
    writeFileSync(join(folder, 'occupied', 'x'), 'x');
    await expect(createBackup({ ...live, outDir: join(folder, 'occupied') })).rejects.toThrow(BackupRefusal);
    await expect(createBackup({ ...live, databasePath: join(folder, 'nothing.sqlite'), outDir: join(folder, 'bk-none') })).rejects.toThrow(/no database at/);
    expect(existsSync(join(folder, 'bk-none'))).toBe(false);
  });

  it('runs as npm run backup and npm run restore (exit 0, then 2 with one sentence for a target not empty)', () => {
    const tsx = join(root, 'node_modules', '.bin', 'tsx');
    const env = { ...process.env, DATABASE_PATH: live.databasePath, UPLOAD_DIR: live.uploadDir };
    const out = execFileSync(tsx, ['src/cli/backup.ts', '--out', join(folder, 'bk-cli')], { cwd: root, env, encoding: 'utf8' });
    expect(out).toMatch(/^Backup written to .*bk-cli: the database \(\d+ rows, \d+ migrations\) and 4 uploaded files\.\n$/);
    const refused = spawnSync(tsx, ['src/cli/restore.ts', join(folder, 'bk-cli')], { cwd: root, env, encoding: 'utf8' });
    expect(refused.status).toBe(2);
    expect(refused.stderr.trim().split('\n')).toHaveLength(1);
    expect(refused.stderr).toMatch(/not empty/);
  });
});
