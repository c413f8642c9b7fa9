/**
 * Shortcut keys of slots. Values are `KeyboardEvent.key` strings (UI Events KeyboardEvent key Values,
 * W3C): named keys such as `ArrowLeft`, or the character a key types.
 */

/**
 * Keys the span editor keeps for itself; a slot may not take one. A lower-case letter here reserves
 * its upper-case form too (Shift extends the selection, and Caps Lock should not change what a key
 * does); an upper-case letter reserves only itself, for the editor's Shift+letter commands. Digits
 * choose intents and statuses; `/` opens the label search; `[`, `]`, Home and End move around.
 */
export const EDITOR_RESERVED_KEYS: readonly string[] = [
  'ArrowLeft',
  'ArrowRight',
  'ArrowUp',
  'ArrowDown',
  'Home',
  'End',
  'Escape',
  'Enter',
  'Backspace',
  'Delete',
  'Tab',
  ' ',
  '?',
  '/',
  '[',
  ']',
  'z',
  'y',
  'n',
  'p',
  'u',
  'A',
  'D',
  'F',
  'I',
  'N',
  'R',
  'S',
  'T',
  'X',
  '0',
  '1',
  '2',
  '3',
  '4',
  '5',
  '6',
  '7',
  '8',
  '9',
];

const RESERVED = new Set(EDITOR_RESERVED_KEYS);

// One code point that is neither a control, format, unassigned, private-use or surrogate code point (C)
// nor a separator (Z): a character that shows when typed (Unicode general categories, UAX #44).
const PRINTABLE_ONE = /^[^\p{C}\p{Z}\p{M}]$/u;

/** The form keys are compared in for uniqueness: lower case for letters, unchanged for named keys. */
export function keyNormalise(key: string): string {
  return [...key].length === 1 ? key.toLowerCase() : key;
}

export function keyIsReserved(key: string): boolean {
  return RESERVED.has(key) || RESERVED.has(keyNormalise(key));
}

/** Null when `key` can be a slot's shortcut, else the reason in words (uniqueness is checked by the schema). */
export function keyProblem(key: string): string | null {
  if (key === '') return null;
  if (!PRINTABLE_ONE.test(key)) return 'A shortcut is one visible character, such as a letter.';
  if (keyIsReserved(key)) return `“${key}” is kept for the labelling screen's own commands; choose another key.`;
  return null;
}

/** A human label for a key (the space bar has no visible character). */
export function keyLabel(key: string): string {
  return key === ' ' ? 'Space' : key;
}
