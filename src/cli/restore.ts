/**
 * `npm run restore -- DIR [--force]`: brings a backup written by `npm run backup` back into
 * DATABASE_PATH and UPLOAD_DIR (or `--database FILE --uploads DIR`). Verifies the backup first
 * (manifest, sha256 of the database copy and of every file, PRAGMA integrity_check, migration
 * level), refuses a target in use, and a target that is not empty unless --force (the old
 * database is then kept as `<file>.before-restore-<time>`). Exit codes: 0 restored, 2 refused
 * (one sentence on standard error; nothing written), 1 internal fault.
 */
import { parseArgs } from 'node:util';
import { RestoreRefusal, restoreBackup } from '../lib/server/backup/restore-backup';
import { storageLocations } from '../lib/server/config';

const USAGE = 'usage: npm run restore -- DIR [--database FILE] [--uploads DIR] [--force]   (defaults: DATABASE_PATH, UPLOAD_DIR)';

function main(): number {
  let parsed;
  try {
    parsed = parseArgs({
      options: { database: { type: 'string' }, uploads: { type: 'string' }, force: { type: 'boolean' }, help: { type: 'boolean' } },
      allowPositionals: true,
    });
  } catch (error) {
    console.error(`${(error as Error).message}. ${USAGE}`);
    return 2;
  }
  const { values, positionals } = parsed;
  if (values.help) {
    console.log(USAGE);
    return 0;
  }
  if (positionals.length !== 1) {
    console.error(`Name exactly one backup folder. ${USAGE}`);
    return 2;
  }
  const locations = storageLocations();
  const outcome = restoreBackup({
    from: positionals[0],
    databasePath: values.database ?? locations.databasePath,
    uploadDir: values.uploads ?? locations.uploadDir,
    force: values.force ?? false,
  });
  console.log(
    `Restored the backup of ${outcome.manifest.createdAt} into ${outcome.databasePath} and ${outcome.uploadDir} ` +
      `(${outcome.manifest.files.length} uploaded files, integrity check ok)` +
      (outcome.previousDatabase ? `; the previous database is kept as ${outcome.previousDatabase}.` : '.'),
  );
  return 0;
}

try {
  process.exitCode = main();
} catch (error) {
  if (error instanceof RestoreRefusal) {
    console.error(error.message);
    process.exitCode = 2;
  } else {
    console.error(`Restore failed: ${(error as Error).message}`);
    process.exitCode = 1;
  }
}
