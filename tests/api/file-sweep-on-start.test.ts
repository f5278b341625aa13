/**
 * The file store's sweep runs when the server starts (its first request of any kind,
 * src/middleware.ts; docs/decisions/007-one-way-in-for-waves.md): after /api/health alone, files no
 * record names and half-written files are gone whatever their age (a young one is what a kill -9
 * between writing a file and committing its record leaves), while the seeded demo's files stay.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, utimesSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDatabase, startServerOn, type RunningServer, type TestDatabase } from '../setup/app-server';

let database: TestDatabase;
let server: RunningServer | null = null;
const hashOf = (text: string) => createHash('sha256').update(text).digest('hex');
const oldOrphan = hashOf('left behind by an upload cut off before its commit');
const youngOrphan = hashOf('an upload cut off a moment ago, between its file and its record');
const day = 24 * 60 * 60 * 1000;
const at = (hash: string, suffix = '') => join(hash.slice(0, 2), hash + suffix);
let seeded: string[] = [];

function plant(relative: string, ageMs: number): void {
  const path = join(database.uploadDir, relative);
  mkdirSync(join(path, '..'), { recursive: true });
  writeFileSync(path, 'x');
  const seconds = (Date.now() - ageMs) / 1000;
  utimesSync(path, seconds, seconds);
}

beforeAll(async () => {
  database = await createTestDatabase({ seed: true });
  seeded = readdirSync(database.uploadDir, { recursive: true, withFileTypes: true }).filter((entry) => entry.isFile()).map((entry) => entry.name);
  plant(at(oldOrphan), day);
  plant(at(oldOrphan, '.partial-1'), day);
  plant(at(youngOrphan), 0);
  plant(at(youngOrphan, '.partial-2'), 0);
});

afterAll(async () => {
  await server?.stop();
  database?.remove();
});

describe('the orphan sweep at start', () => {
  it('has removed orphans of any age once the started server answered /api/health, and kept the rest', async () => {
    expect(seeded).toHaveLength(4); // the responses and codebooks of the demo's two waves (src/lib/server/demo-seed.ts)
    expect(existsSync(join(database.uploadDir, at(oldOrphan)))).toBe(true);
    // startServerOn waits until GET /api/health answers: the only requests the server has seen.
    server = await startServerOn(database, { logName: 'file-sweep-on-start.log' });
    expect(existsSync(join(database.uploadDir, at(oldOrphan)))).toBe(false);
    expect(existsSync(join(database.uploadDir, at(oldOrphan, '.partial-1')))).toBe(false);
    expect(existsSync(join(database.uploadDir, at(youngOrphan)))).toBe(false);
    expect(existsSync(join(database.uploadDir, at(youngOrphan, '.partial-2')))).toBe(false);
    for (const name of seeded) expect(existsSync(join(database.uploadDir, name.slice(0, 2), name)), name).toBe(true);
  });
});
