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

/**
 * sha256 of a text (UTF-8) or bytes, hex: the hash kept of API tokens, invitation tokens and
 * audit settings (node:crypto; the server's own, not the file reader's content hash).
 * @param text a text or bytes.
 * @returns 64 lower-case hex digits.
 * References: NIST 2015, FIPS PUB 180-4 "Secure Hash Standard (SHS)", §6.2 SHA-256.
 */
export function sha256Hex(text: string | Buffer): string {
  return createHash('sha256').update(typeof text === 'string' ? Buffer.from(text, 'utf8') : text).digest('hex');
}
