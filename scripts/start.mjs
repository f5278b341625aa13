// `npm start`: install if needed, migrate, seed the demo into an empty database, build if
// needed, then serve on HOST:PORT (127.0.0.1:4321 by default).
import { ensureBuilt, ensureInstalled, root, runTs, step } from './lib/prepare.mjs';

process.chdir(root);
process.env.ASTRO_TELEMETRY_DISABLED = '1';
ensureInstalled();
step('Applying database migrations');
runTs('src/cli/db-migrate.ts');
step('Seeding the demo if the database is empty');
runTs('src/cli/db-seed.ts');
ensureBuilt();
// The demo accounts, when the demo is seeded: the last lines before the server's address.
runTs('src/cli/demo-accounts.ts');
await import('./serve.mjs');
