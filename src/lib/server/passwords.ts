/** Password hashing with bcrypt (bcryptjs, pure JavaScript). */
import bcrypt from 'bcryptjs';

const cost = 10;

/** The password policy lives with the API's contracts, where the forms read it too. */
export { passwordSchema } from '../api/schemas/me';

/** Hashes a password. */
export async function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, cost);
}

/** Checks a password against a stored hash. */
export async function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

/** A fixed hash compared against when the e-mail is unknown, so both paths take the same time. */
export const unknownUserHash = bcrypt.hashSync('paredown: no such user', cost);
