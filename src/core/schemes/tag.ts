/** Tag strings: `O`, or a one-letter prefix, a hyphen and a slot name (`B-day`). */

export type TagPrefix = 'B' | 'I' | 'E' | 'S';

export interface ParsedTag {
  prefix: TagPrefix | 'O';
  slot: string;
}

const OUTSIDE: ParsedTag = { prefix: 'O', slot: '' };

/** Prefixes each scheme's grammar allows besides `O`. */
export const SCHEME_PREFIXES = {
  iob1: 'BI',
  iob2: 'BI',
  bioes: 'BIES',
} as const;

/** A slot name: non-empty, no whitespace (common practice, no source: column files split on whitespace). */
export function slotNameIsValid(slot: string): boolean {
  return slot.length > 0 && !/\s/u.test(slot);
}

/**
 * Parse a tag; returns null when it is outside every scheme's grammar (`B-`, `Q-day`, `b-day`).
 * Whether the prefix suits a particular scheme is checked by `tagIsInScheme`.
 */
export function tagParse(tag: string): ParsedTag | null {
  if (tag === 'O') return OUTSIDE;
  if (tag.length < 3 || tag.charCodeAt(1) !== 45 /* - */) return null;
  const prefix = tag[0];
  if (prefix !== 'B' && prefix !== 'I' && prefix !== 'E' && prefix !== 'S') return null;
  const slot = tag.slice(2);
  if (!slotNameIsValid(slot)) return null;
  return { prefix, slot };
}

export function tagIsInScheme(parsed: ParsedTag, scheme: keyof typeof SCHEME_PREFIXES): boolean {
  return parsed.prefix === 'O' || SCHEME_PREFIXES[scheme].includes(parsed.prefix);
}

export function tagFormat(prefix: TagPrefix, slot: string): string {
  return `${prefix}-${slot}`;
}
