/** `npm run db:seed`: seeds the demo into the configured database when it is empty and DEMO_SEED is on. */
import { getConfig } from '../lib/server/config';
import { getDb } from '../lib/server/db';
import { seedDemo } from '../lib/server/demo-seed';

try {
  const config = getConfig();
  const outcome = await seedDemo(getDb(), { enabled: config.demoSeed, uploadDir: config.uploadDir });
  console.log(outcome.seeded ? `Demo seeded into ${config.databasePath}.` : `Demo not seeded: ${outcome.reason}.`);
} catch (error) {
  console.error(`Seeding failed: ${(error as Error).message}`);
  process.exit(1);
}
