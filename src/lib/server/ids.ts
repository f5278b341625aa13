/** Random identifiers and token hashing. */
import { createHash, randomBytes } from 'node:crypto';

/** A new random id (16 url-safe characters, 96 bits). */
export function newId(): string {
  return randomBytes(12).toString('base64url');
}

/**
 * A new secret token (256 bits) with a readable prefix.
 * @param prefix e.g. `pd_` for API tokens.
 * @returns the token.
 */
export function newSecretToken(prefix = ''): string {
  return prefix + randomBytes(32).toString('base64url');
}

/** sha256 of a text, hex. */
export function sha256Hex(text: string | Buffer): string {
  return createHash('sha256').update(text).digest('hex');
}
