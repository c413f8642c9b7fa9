/** The reserved comments (`# id`, `# intent`, `# text`) in the spelling the column writer uses. */

const SPACE = 32;

/** Comment lines with a field of their own, in the one spelling the fast path takes (others go the long way). */
export const RESERVED_PREFIXES = ['# id = ', '# intent = ', '# text = '] as const;
export const KEY_ID = 0;
export const KEY_INTENT = 1;
export const KEY_TEXT = 2;

/** Whether `text` holds `prefix` at `start`, compared code by code (a `startsWith` call per comment line cost more). */
function prefixAt(text: string, start: number, prefix: string): boolean {
  for (let i = 3; i < prefix.length; i++) if (text.charCodeAt(start + i) !== prefix.charCodeAt(i)) return false;
  return true;
}

/** Which of `RESERVED_PREFIXES` starts the line at `start` (known to start with '#'), or -1. */
export function reservedCommentKey(text: string, start: number): number {
  if (text.charCodeAt(start + 1) !== SPACE) return -1;
  const head = text.charCodeAt(start + 2);
  if (head === 116 /* t */) return prefixAt(text, start, RESERVED_PREFIXES[KEY_TEXT]) ? KEY_TEXT : -1;
  if (head !== 105 /* i */) return -1;
  if (prefixAt(text, start, RESERVED_PREFIXES[KEY_ID])) return KEY_ID;
  return prefixAt(text, start, RESERVED_PREFIXES[KEY_INTENT]) ? KEY_INTENT : -1;
}
