/** Stored token offsets: one Int32Array of start,end pairs per utterance (see schema.ts). */
import type { Token } from '../core/types';

export function tokensPack(tokens: readonly Token[]): Int32Array {
  const packed = new Int32Array(tokens.length * 2);
  tokens.forEach((t, i) => {
    packed[2 * i] = t.start;
    packed[2 * i + 1] = t.end;
  });
  return packed;
}

export function tokensUnpack(packed: ArrayLike<number>): Token[] {
  const tokens: Token[] = [];
  for (let i = 0; i + 1 < packed.length; i += 2) tokens.push({ start: packed[i] as number, end: packed[i + 1] as number });
  return tokens;
}

export function tokensCount(packed: ArrayLike<number>): number {
  return packed.length >> 1;
}

/** Null when the tokens are sound: inside the text, in order, none empty or overlapping. */
export function tokensProblem(tokens: readonly Token[], textLength: number): string | null {
  let free = 0;
  for (const [i, t] of tokens.entries()) {
    if (!Number.isSafeInteger(t.start) || !Number.isSafeInteger(t.end) || t.start < free || t.end <= t.start || t.end > textLength) {
      return `token ${i + 1} [${t.start}, ${t.end}) is not inside the text after the previous token`;
    }
    free = t.end;
  }
  return null;
}
