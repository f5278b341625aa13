/** Part of `npm start`: prints the demo accounts when the demo is seeded (src/lib/server/demo-accounts.ts). */
import { getConfig } from '../lib/server/config';
import { getDb } from '../lib/server/db';
import { shownDemoAccounts } from '../lib/server/demo-accounts';

const shown = shownDemoAccounts(getDb(), getConfig().demoSeed);
if (shown) {
  console.log(`Demo accounts (password ${shown.password}):`);
  for (const account of shown.accounts) console.log(`  ${account.email.padEnd(26)} ${account.role}, ${account.team}`);
}
