/** Random identifiers and token hashing. */
import { randomBytes } from 'node:crypto';
import { contentHash } from '../ingest/content-hash';

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

/** sha256 of a text (UTF-8) or bytes, hex (contentHash of the bytes). */
export function sha256Hex(text: string | Buffer): string {
  return contentHash(typeof text === 'string' ? Buffer.from(text, 'utf8') : text);
}
