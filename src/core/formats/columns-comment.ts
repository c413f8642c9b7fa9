/** `# key = value` comment lines of the IOB column format (the CoNLL-U comment convention). */

/** Keys with a field of their own on `Utterance`; every other key goes to `meta`. */
export const COMMENT_KEYS_RESERVED: readonly string[] = ['id', 'intent', 'text'];

const SPACE = 32;
const TAB = 9;
const HASH = 35;

function charIsSeparator(code: number): boolean {
  return code === SPACE || code === TAB;
}

/**
 * A comment is `#` alone or `#` and a space at the start of a line. `#tag<TAB>O` and `#<TAB>O` stay
 * token lines, so hashtag tokens survive; the canonical writer never puts a space in a token.
 */
export function lineIsComment(text: string, start: number, end: number): boolean {
  return text.charCodeAt(start) === HASH && (end === start + 1 || text.charCodeAt(start + 1) === SPACE);
}

/** Where the key and value of a `# key = value` line lie; filled in place to spare an allocation per line. */
export interface CommentBounds {
  keyStart: number;
  keyEnd: number;
  valueStart: number;
}

/**
 * Locate `# key = value` in `text[start, end)`; false for comments in any other form (skipped by
 * readers). One space after `=` belongs to the syntax, the rest of the line is the value, so leading
 * or trailing spaces survive.
 */
export function commentBounds(text: string, start: number, end: number, out: CommentBounds): boolean {
  let keyStart = start + 1;
  while (keyStart < end && charIsSeparator(text.charCodeAt(keyStart))) keyStart++;
  const equals = text.indexOf('=', keyStart);
  if (equals < 0 || equals >= end) return false;
  let keyEnd = equals;
  while (keyEnd > keyStart && charIsSeparator(text.charCodeAt(keyEnd - 1))) keyEnd--;
  if (keyEnd === keyStart) return false;
  // "# call back = later" is prose that happens to hold an equals sign, not a pair.
  for (let i = keyStart; i < keyEnd; i++) if (charIsSeparator(text.charCodeAt(i))) return false;
  out.keyStart = keyStart;
  out.keyEnd = keyEnd;
  out.valueStart = equals + 1 < end && text.charCodeAt(equals + 1) === SPACE ? equals + 2 : equals + 1;
  return true;
}

/** A key the writer may emit and the reader will give back unchanged. */
export function commentKeyIsWritable(key: string): boolean {
  return /^[^\s=]+$/u.test(key) && !COMMENT_KEYS_RESERVED.includes(key);
}
