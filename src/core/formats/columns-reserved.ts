/** The reserved comments (`# id`, `# intent`, `# text`) in the spelling the column writer uses. */

const SPACE = 32;

/** Comment lines with a field of their own, in the one spelling the fast path takes (others go the long way). */
export const RESERVED_PREFIXES = ['# id = ', '# intent = ', '# text = '] as const;
export const KEY_ID = 0;
export const KEY_INTENT = 1;
export const KEY_TEXT = 2;

/** Which of `RESERVED_PREFIXES` starts the line at `start`, or -1. */
export function reservedCommentKey(text: string, start: number): number {
  if (text.charCodeAt(start + 1) !== SPACE) return -1;
  const head = text.charCodeAt(start + 2);
  if (head === 116 /* t */) return text.startsWith(RESERVED_PREFIXES[KEY_TEXT], start) ? KEY_TEXT : -1;
  if (head !== 105 /* i */) return -1;
  if (text.startsWith(RESERVED_PREFIXES[KEY_ID], start)) return KEY_ID;
  return text.startsWith(RESERVED_PREFIXES[KEY_INTENT], start) ? KEY_INTENT : -1;
}
