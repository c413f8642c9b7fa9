/**
 * Conversions between UTF-16 offsets (JavaScript string indices, what `Token` holds) and code-point
 * offsets (what Python's `str` slicing uses, so what the JSON Lines files hold).
 *
 * A code point is a well-formed surrogate pair or any other single code unit, lone surrogates
 * included: the same reading as `[...text]` in JavaScript and `len(text)` in Python.
 *
 * Invalid offsets are reported as -1, never thrown: an offset that is not an integer, lies outside
 * [0, length], or (UTF-16 only) falls between the two halves of a surrogate pair. Readers turn -1
 * into a `ReadError`; `offsetSplitsSurrogatePair` tells the last case apart for a precise message.
 */

function unitIsHigh(code: number): boolean {
  return code >= 0xd800 && code <= 0xdbff;
}

function unitIsLow(code: number): boolean {
  return code >= 0xdc00 && code <= 0xdfff;
}

/** True when text[offset - 1] and text[offset] are the two halves of one surrogate pair. */
export function offsetSplitsSurrogatePair(text: string, offset: number): boolean {
  return offset > 0 && offset < text.length && unitIsHigh(text.charCodeAt(offset - 1)) && unitIsLow(text.charCodeAt(offset));
}

/** Number of code points, as Python's `len(text)`. */
export function codePointCount(text: string): number {
  let count = 0;
  for (let i = 0; i < text.length; i++) {
    if (!offsetSplitsSurrogatePair(text, i + 1)) count++;
  }
  return count;
}

/** UTF-16 offset → code-point offset; -1 when invalid (see the file comment). */
export function offsetToCodePoints(text: string, offset: number): number {
  if (!Number.isInteger(offset) || offset < 0 || offset > text.length) return -1;
  if (offsetSplitsSurrogatePair(text, offset)) return -1;
  let count = 0;
  for (let i = 0; i < offset; i++) {
    if (!offsetSplitsSurrogatePair(text, i + 1)) count++;
  }
  return count;
}

/** Code-point offset → UTF-16 offset; -1 when not an integer in [0, codePointCount(text)]. */
export function offsetFromCodePoints(text: string, codePoints: number): number {
  if (!Number.isInteger(codePoints) || codePoints < 0 || codePoints > text.length) return -1;
  let offset = 0;
  for (let seen = 0; seen < codePoints; seen++) {
    if (offset >= text.length) return -1;
    offset += offsetSplitsSurrogatePair(text, offset + 1) ? 2 : 1;
  }
  return offset;
}

/**
 * Code-point offset of every UTF-16 index 0..text.length, -1 inside surrogate pairs. One pass over
 * the text; each lookup after it is O(1).
 */
function codePointsByOffset(text: string): Int32Array {
  const table = new Int32Array(text.length + 1);
  let count = 0;
  for (let i = 0; i <= text.length; i++) {
    if (offsetSplitsSurrogatePair(text, i)) {
      table[i] = -1;
    } else {
      table[i] = count++;
    }
  }
  return table;
}

/** Many UTF-16 offsets of one text → code-point offsets, in one pass over the text; -1 where invalid. */
export function offsetsToCodePoints(text: string, offsets: readonly number[]): number[] {
  const table = codePointsByOffset(text);
  return offsets.map((offset) => (Number.isInteger(offset) ? (table[offset] ?? -1) : -1));
}

/** Many code-point offsets of one text → UTF-16 offsets, in one pass over the text; -1 where invalid. */
export function offsetsFromCodePoints(text: string, codePoints: readonly number[]): number[] {
  const table = codePointsByOffset(text);
  const offsetByCodePoint: number[] = [];
  table.forEach((codePoint, offset) => {
    if (codePoint >= 0) offsetByCodePoint[codePoint] = offset;
  });
  return codePoints.map((cp) => (Number.isInteger(cp) ? (offsetByCodePoint[cp] ?? -1) : -1));
}
