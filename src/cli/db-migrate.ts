/** `npm run db:migrate`: validates the configuration and applies pending migrations. */
import { getConfig } from '../lib/server/config';
import { getDb } from '../lib/server/db';

try {
  const config = getConfig();
  getDb();
  console.log(`Database ready: ${config.databasePath}`);
} catch (error) {
  console.error(`Start-up check failed: ${(error as Error).message}`);
  process.exit(1);
}
