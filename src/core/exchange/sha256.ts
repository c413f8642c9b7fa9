/**
 * SHA-256 (FIPS 180-4) through the Web Crypto API, which browsers, workers and Node 20 all provide as
 * `globalThis.crypto.subtle`; no hashing code of our own to get wrong.
 */

const HEX = Array.from({ length: 256 }, (_, i) => i.toString(16).padStart(2, '0'));

export function bytesHex(bytes: Uint8Array): string {
  let out = '';
  for (const b of bytes) out += HEX[b] as string;
  return out;
}

/** Lowercase hex SHA-256 of the UTF-8 bytes of `text`. */
export async function sha256Hex(text: string): Promise<string> {
  const digest = await globalThis.crypto.subtle.digest('SHA-256', new TextEncoder().encode(text));
  return bytesHex(new Uint8Array(digest));
}

/** A fresh random id of 128 bits as hex (crypto.getRandomValues, Web Crypto API). */
export function uidRandom(): string {
  return bytesHex(globalThis.crypto.getRandomValues(new Uint8Array(16)));
}
