import { describe, expect, it } from 'vitest';
import { contentHash } from '../../src/lib/ingest';

describe('contentHash', () => {
  it('is SHA-256 in hex (FIPS 180-4 example "abc"; empty message)', () => {
    // NIST FIPS 180-4 / CSRC example values for SHA-256.
    expect(contentHash(new TextEncoder().encode('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(contentHash(new Uint8Array(0))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });
});
