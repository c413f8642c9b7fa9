/** `# key = value` comment lines of the IOB column format (the CoNLL-U comment convention). */

export interface CommentPair {
  key: string;
  value: string;
}

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

/**
 * Parse `# key = value`; null for comments in any other form (skipped by readers). One space after
 * `=` belongs to the syntax, the rest of the line is the value, so leading or trailing spaces survive.
 */
export function commentParse(text: string, start: number, end: number): CommentPair | null {
  let keyStart = start + 1;
  while (keyStart < end && charIsSeparator(text.charCodeAt(keyStart))) keyStart++;
  const equals = text.indexOf('=', keyStart);
  if (equals < 0 || equals >= end) return null;
  let keyEnd = equals;
  while (keyEnd > keyStart && charIsSeparator(text.charCodeAt(keyEnd - 1))) keyEnd--;
  if (keyEnd === keyStart) return null;
  const key = text.slice(keyStart, keyEnd);
  // "# call back = later" is prose that happens to hold an equals sign, not a pair.
  if (key.includes(' ') || key.includes('\t')) return null;
  let valueStart = equals + 1;
  if (valueStart < end && text.charCodeAt(valueStart) === SPACE) valueStart++;
  return { key, value: text.slice(valueStart, end) };
}

/** A key the writer may emit and the reader will give back unchanged. */
export function commentKeyIsWritable(key: string): boolean {
  return /^[^\s=]+$/u.test(key) && !COMMENT_KEYS_RESERVED.includes(key);
}
