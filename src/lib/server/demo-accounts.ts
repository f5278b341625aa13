/**
 * The demo accounts to show: on the sign-in page and in `npm start`'s last lines, only when demo
 * seeding is on and the demo was actually seeded into this database (its accounts exist), so a
 * real installation never advertises them.
 */
import { inArray } from 'drizzle-orm';
import { users } from '../../db/schema';
import type { Db } from '../../db/client';
import { demoAccounts, demoPassword } from './demo-seed';
import { roleLabels } from '../permissions';

/** One demo account as shown. */
export interface ShownDemoAccount {
  email: string;
  role: string;
  team: string;
}

/**
 * The demo accounts present in the database.
 * @param db the database.
 * @param demoSeed whether demo seeding is on (DEMO_SEED).
 * @returns the accounts and their shared password, or null when there is nothing to show.
 */
export function shownDemoAccounts(db: Db, demoSeed: boolean): { password: string; accounts: ShownDemoAccount[] } | null {
  if (!demoSeed) return null;
  const present = new Set(
    db
      .select({ email: users.email })
      .from(users)
      .where(inArray(users.email, demoAccounts.map((account) => account.email)))
      .all()
      .map((row) => row.email),
  );
  const accounts = demoAccounts
    .filter((account) => present.has(account.email))
    .map((account) => ({ email: account.email, role: roleLabels[account.role], team: account.team === 'demo' ? 'demo team' : 'second team' }));
  return accounts.length === 0 ? null : { password: demoPassword, accounts };
}
