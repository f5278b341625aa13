/**
 * The original-file store (src/lib/server/file-store.ts) on a temporary database and folder:
 * writes undone when the transaction rolls back, files no wave uses forgotten after a commit,
 * orphans swept, the listing for a backup, and the one path check. Hashes: sha256 of the bytes
 * (FIPS 180-4), recomputed here with node:crypto.
 */
import { createHash } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openDatabase, type Db } from '../../src/db/client';
import { storedFiles, studies, teams, waves } from '../../src/db/schema';
import { FileStore } from '../../src/lib/server/file-store';
import { sha256Hex } from '../../src/lib/server/ids';

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');
const bytesOf = (text: string) => new TextEncoder().encode(text);

let folder: string;
let db: Db;
let store: FileStore;

beforeEach(() => {
  folder = mkdtempSync(join(tmpdir(), 'paredown-file-store-'));
  db = openDatabase(join(folder, 'db.sqlite'));
  store = new FileStore(join(folder, 'uploads'));
  db.insert(teams).values({ id: 't', name: 'Team' }).run();
  db.insert(studies).values({ id: 's', teamId: 't', name: 'Study' }).run();
});

afterEach(() => {
  db.$client.close();
  rmSync(folder, { recursive: true, force: true });
});

function addWave(id: string, fileHash: string, codebookHash: string | null = null): void {
  db.insert(waves).values({ id, studyId: 's', label: id, fileHash, codebookHash, format: 'csv' }).run();
}

const eqId = (id: string) => eq(waves.id, id);
const records = () => db.select({ hash: storedFiles.hash }).from(storedFiles).all().map((row) => row.hash).sort();
const onDisk = (hash: string) => existsSync(join(store.root, hash.slice(0, 2), hash));

describe('writing', () => {
  it('keeps the bytes under their sha256 with a record, once per content, and reads them back', () => {
    const bytes = bytesOf('a,b\n1,2\n');
    const record = store.transaction(db, (_tx, files) => {
      files.write(bytes, 'first.csv', 'text/csv');
      return files.write(bytes, 'again.csv', 'text/csv');
    });
    expect(record).toEqual({ hash: sha256(bytes), size: bytes.byteLength, storagePath: join(sha256(bytes).slice(0, 2), sha256(bytes)) });
    expect(records()).toEqual([sha256(bytes)]);
    expect(store.read(db, record.hash)).toEqual({ bytes, originalName: 'first.csv', mediaType: 'text/csv' });
    expect(() => store.read(db, sha256(bytesOf('never stored')))).toThrow(/no stored file/);
  });

  it('leaves neither a record nor a file when the transaction rolls back', () => {
    const bytes = bytesOf('rolled back\n');
    expect(() => store.transaction(db, (_tx, files) => {
      files.write(bytes, 'x.csv', 'text/csv');
      expect(onDisk(sha256(bytes))).toBe(true); // written inside the transaction, so the undo has something to do
      throw new Error('forced failure');
    })).toThrow('forced failure');
    expect(records()).toEqual([]);
    expect(onDisk(sha256(bytes))).toBe(false);
  });

  it('keeps a file another record already held when a later transaction that wrote it again rolls back', () => {
    const bytes = bytesOf('shared\n');
    store.transaction(db, (_tx, files) => files.write(bytes, 'x.csv', 'text/csv'));
    expect(() => store.transaction(db, (_tx, files) => {
      files.write(bytes, 'y.csv', 'text/csv');
      throw new Error('forced failure');
    })).toThrow();
    expect(records()).toEqual([sha256(bytes)]);
    expect(onDisk(sha256(bytes))).toBe(true);
  });

  it('refuses a hash that is not a sha256', () => {
    expect(() => store.transaction(db, (_tx, files) => files.write(bytesOf('x'), 'x.csv', null, '../../escape'))).toThrow(/not a sha256/);
  });
});

describe('files no wave uses', () => {
  it('forgets their records in the transaction and removes their bytes once it commits, and keeps files still used', () => {
    const [used, unused, codebook] = ['used\n', 'unused\n', 'codebook\n'].map(bytesOf);
    store.transaction(db, (_tx, files) => [used, unused, codebook].forEach((bytes, k) => files.write(bytes, `${k}.csv`, 'text/csv')));
    addWave('w1', sha256(used), sha256(codebook));
    addWave('w2', sha256(unused));
    const ask = [sha256(used), sha256(unused), sha256(codebook)];

    // A rollback keeps both the records and the bytes.
    expect(() => store.transaction(db, (tx, files) => {
      tx.delete(waves).where(eqId('w2')).run();
      expect(files.forgetUnused(ask)).toBe(1);
      throw new Error('forced failure');
    })).toThrow();
    expect(records()).toHaveLength(3);
    expect(onDisk(sha256(unused))).toBe(true);

    const forgotten = store.transaction(db, (tx, files) => {
      tx.delete(waves).where(eqId('w2')).run();
      return files.forgetUnused(ask);
    });
    expect(forgotten).toBe(1);
    expect(records()).toEqual([sha256(used), sha256(codebook)].sort());
    expect(onDisk(sha256(unused))).toBe(false);
    expect(onDisk(sha256(used))).toBe(true);
    expect(onDisk(sha256(codebook))).toBe(true); // used as a codebook
  });
});

describe('the sweep at start', () => {
  it('removes orphans of any age and half-written files, forgets unused records, and leaves foreign names alone', () => {
    const kept = bytesOf('kept\n');
    const unusedRecord = bytesOf('recorded but unused\n');
    store.transaction(db, (_tx, files) => {
      files.write(kept, 'kept.csv', 'text/csv');
      files.write(unusedRecord, 'unused.csv', 'text/csv');
    });
    addWave('w', sha256(kept));
    const plant = (relative: string, ageMs: number) => {
      const path = join(store.root, relative);
      mkdirSync(join(path, '..'), { recursive: true });
      writeFileSync(path, 'x');
      const seconds = (Date.now() - ageMs) / 1000;
      utimesSync(path, seconds, seconds);
    };
    const day = 24 * 60 * 60 * 1000;
    const old = sha256(bytesOf('old orphan'));
    const young = sha256(bytesOf('young orphan: what a kill -9 between writing and committing leaves'));
    plant(join(old.slice(0, 2), old), day);
    plant(join(young.slice(0, 2), young), 0);
    plant(join(old.slice(0, 2), `${old}.partial-123`), 0);
    plant(join('zz', 'notes.txt'), day);
    plant('README', day);

    const outcome = store.sweepOrphans(db);
    expect(outcome.unusedRecords).toBe(1);
    expect(outcome.orphanFiles).toEqual([join(old.slice(0, 2), old), join(old.slice(0, 2), `${old}.partial-123`), join(young.slice(0, 2), young)].sort());
    expect(records()).toEqual([sha256(kept)]);
    expect(onDisk(sha256(kept))).toBe(true);
    expect(onDisk(sha256(unusedRecord))).toBe(false);
    expect(onDisk(old)).toBe(false);
    expect(onDisk(young)).toBe(false);
    expect(existsSync(join(store.root, 'zz', 'notes.txt'))).toBe(true);
    expect(existsSync(join(store.root, 'README'))).toBe(true);
  });
});

describe('the listing for a backup', () => {
  it('names every record with where its bytes are and whether they are there', () => {
    const [a, b] = ['a\n', 'b\n'].map(bytesOf);
    store.transaction(db, (_tx, files) => [a, b].forEach((bytes, k) => files.write(bytes, `${k}.csv`, 'text/csv')));
    rmSync(join(store.root, sha256(b).slice(0, 2), sha256(b)));
    const listed = store.list(db);
    expect(listed.map((entry) => [entry.hash, entry.present]).sort()).toEqual([[sha256(a), true], [sha256(b), false]].sort());
    const first = listed.find((entry) => entry.hash === sha256(a))!;
    expect(readFileSync(first.path)).toEqual(Buffer.from(a));
  });
});

describe('the path check', () => {
  it('refuses paths that leave the folder, absolute paths and empty ones', () => {
    expect(store.pathOf(join('ab', 'cd'))).toBe(join(store.root, 'ab', 'cd'));
    for (const path of ['../outside', join('ab', '..', '..', 'outside'), '/etc/passwd', '', 'ab\0cd', '.']) {
      expect(() => store.pathOf(path), JSON.stringify(path)).toThrow(/not a path inside/);
    }
  });

  it('refuses to read a record whose stored path was tampered with', () => {
    writeFileSync(join(folder, 'secret.txt'), 'outside the folder');
    const hash = sha256(bytesOf('tampered'));
    db.insert(storedFiles).values({ hash, size: 1, originalName: 'x.csv', mediaType: null, storagePath: '../secret.txt' }).run();
    expect(() => store.read(db, hash)).toThrow(/not a path inside/);
    expect(() => store.list(db)).toThrow(/not a path inside/);
  });
});

describe('the API-token hash', () => {
  it('is sha256 of the UTF-8 text', () => {
    // FIPS 180-4 / NIST example "abc": ba7816bf 8f01cfea 414140de 5dae2223 b00361a3 96177a9c b410ff61 f20015ad.
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });
});
