import { describe, expect, it } from 'vitest';
import { sha256Hex, uidRandom } from '../../../src/core/exchange/sha256';

describe('sha256Hex (FIPS 180-4 SHA-256 via Web Crypto)', () => {
  it('matches the published test vectors', async () => {
    // FIPS 180-2 Appendix B.1 (one-block message "abc"); value from memory, also in NIST's SHA examples.
    expect(await sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    // FIPS 180-2 Appendix B.2 (two-block message); from memory.
    expect(await sha256Hex('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe('248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1');
    // The empty message, common practice test vector; from memory.
    expect(await sha256Hex('')).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  it('hashes the UTF-8 bytes of the text', async () => {
    // "é" as UTF-8 is C3 A9: hashing the code units as Latin-1 would give another digest.
    const viaBytes = await globalThis.crypto.subtle.digest('SHA-256', new Uint8Array([0xc3, 0xa9]));
    const hex = [...new Uint8Array(viaBytes)].map((b) => b.toString(16).padStart(2, '0')).join('');
    expect(await sha256Hex('é')).toBe(hex);
  });

  it('makes 128-bit random uids as 32 hex digits, different each time', () => {
    const a = uidRandom();
    expect(a).toMatch(/^[0-9a-f]{32}$/);
    expect(uidRandom()).not.toBe(a);
  });
});
