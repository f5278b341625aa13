/** Whether the database has any user yet (when not, the first visit goes to /setup). */
import { users } from '../../db/schema';
import { getDb } from './db';

let someoneExists = false;

/** True once at least one user exists (cached: users are never all removed while running). */
export function hasAnyUser(): boolean {
  if (someoneExists) return true;
  someoneExists = getDb().select({ id: users.id }).from(users).limit(1).get() !== undefined;
  return someoneExists;
}
