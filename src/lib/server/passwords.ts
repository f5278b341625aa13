/** Password hashing with bcrypt (bcryptjs, pure JavaScript). */
import bcrypt from 'bcryptjs';
import { z } from 'zod';

const cost = 10;

/** A password policy the forms and the API share: 10 to 200 characters. */
export const passwordSchema = z
  .string()
  .min(10, 'The password needs at least 10 characters.')
  .max(200, 'The password may have at most 200 characters.');

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
