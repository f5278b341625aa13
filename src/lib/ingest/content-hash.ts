/**
 * The content address of an uploaded file, so the original is stored once under its hash and
 * the same file uploaded twice is recognised. Uses node:crypto (allowed in this module).
 */
import { createHash } from 'node:crypto';

/**
 * SHA-256 of the bytes as lower-case hex.
 * @param bytes any bytes.
 * @returns 64 hex characters.
 * References: NIST 2015, FIPS PUB 180-4 "Secure Hash Standard (SHS)", §6.2 SHA-256.
 */
export function contentHash(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}
