/**
 * `npm run backup [-- --out DIR]`: a consistent copy of DATABASE_PATH (SQLite's online backup,
 * safe while the server runs) with the uploaded files under UPLOAD_DIR that it names and a
 * manifest (time, migration level, row counts, every file's sha256), in DIR or
 * `backups/paredown-<UTC time>`. Exit codes: 0 written, 2 refused (one sentence on standard
 * error), 1 written with files missing or damaged under UPLOAD_DIR (named), or an internal fault.
 */
import { parseArgs } from 'node:util';
import { BackupRefusal, createBackup, defaultBackupFolder } from '../lib/server/backup/create-backup';
import { storageLocations } from '../lib/server/config';

const USAGE = 'usage: npm run backup [-- --out DIR]   (reads DATABASE_PATH and UPLOAD_DIR)';

async function main(): Promise<number> {
  let out: string | undefined;
  try {
    const { values } = parseArgs({ options: { out: { type: 'string' }, help: { type: 'boolean' } }, allowPositionals: false });
    if (values.help) {
      console.log(USAGE);
      return 0;
    }
    out = values.out;
  } catch (error) {
    console.error(`${(error as Error).message}. ${USAGE}`);
    return 2;
  }
  const now = new Date();
  const { databasePath, uploadDir } = storageLocations();
  const { outDir, manifest } = await createBackup({ databasePath, uploadDir, outDir: out ?? defaultBackupFolder(now), now });
  const rows = Object.values(manifest.database.tables).reduce((sum, n) => sum + n, 0);
  console.log(`Backup written to ${outDir}: the database (${rows} rows, ${manifest.database.migrations.applied} migrations) and ${manifest.files.length} uploaded files.`);
  if (manifest.problems.length > 0) {
    console.error(`${manifest.problems.length} uploaded files the database names were missing or damaged under ${uploadDir} and are not in the backup: ${manifest.problems.map((p) => `${p.storagePath} (${p.problem})`).join(', ')}.`);
    return 1;
  }
  return 0;
}

main().then(
  (code) => {
    process.exitCode = code;
  },
  (error: unknown) => {
    if (error instanceof BackupRefusal) {
      console.error(error.message);
      process.exitCode = 2;
    } else {
      console.error(`Backup failed: ${(error as Error).message}`);
      process.exitCode = 1;
    }
  },
);
