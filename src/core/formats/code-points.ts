import { offsetsFromCodePoints, offsetsToCodePoints } from '../tokenise';

const SURROGATE = /[\uD800-\uDFFF]/;

/** Without surrogates, code-point and UTF-16 offsets coincide: the common case skips the tables. */
export function textHasSurrogates(text: string): boolean {
  return SURROGATE.test(text);
}

/** Number of code points (Python's `len`); lone surrogates count one each, as in `[...text]`. */
export function codePointLength(text: string): number {
  if (!textHasSurrogates(text)) return text.length;
  let count = 0;
  for (const _ of text) count++;
  return count;
}

export function offsetsCodePointsToUtf16(text: string, offsets: readonly number[]): number[] {
  return textHasSurrogates(text) ? offsetsFromCodePoints(text, offsets) : [...offsets];
}

export function offsetsUtf16ToCodePoints(text: string, offsets: readonly number[]): number[] {
  return textHasSurrogates(text) ? offsetsToCodePoints(text, offsets) : [...offsets];
}
