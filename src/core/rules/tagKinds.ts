/**
 * Tag reading for the validators, straight from the characters: no substring, no object, no map
 * lookup per token (a map keyed by freshly read strings costs several times the validation itself).
 * Agrees with `tagParse` on every string (tested).
 */

export const KIND_O = 0;
export const KIND_B = 1;
export const KIND_I = 2;
export const KIND_E = 3;
export const KIND_S = 4;
export const KIND_MALFORMED = 5;
/** The utterance boundaries, as pseudo-kinds. */
export const KIND_START = 6;
export const KIND_END = 7;

const HYPHEN = 45;

// The characters JavaScript's /\s/u matches (ECMA-262 WhiteSpace and LineTerminator).
function isWhitespace(c: number): boolean {
  if (c <= 0x20) return c === 0x20 || (c >= 0x09 && c <= 0x0d);
  if (c < 0xa0) return false;
  return (
    c === 0xa0 || c === 0x1680 || (c >= 0x2000 && c <= 0x200a) || c === 0x2028 || c === 0x2029 ||
    c === 0x202f || c === 0x205f || c === 0x3000 || c === 0xfeff
  );
}

export function tagKind(tag: string): number {
  const length = tag.length;
  if (length === 1 && tag.charCodeAt(0) === 79 /* O */) return KIND_O;
  if (length < 3 || tag.charCodeAt(1) !== HYPHEN) return KIND_MALFORMED;
  let kind: number;
  switch (tag.charCodeAt(0)) {
    case 66 /* B */:
      kind = KIND_B;
      break;
    case 73 /* I */:
      kind = KIND_I;
      break;
    case 69 /* E */:
      kind = KIND_E;
      break;
    case 83 /* S */:
      kind = KIND_S;
      break;
    default:
      return KIND_MALFORMED;
  }
  for (let i = 2; i < length; i++) if (isWhitespace(tag.charCodeAt(i))) return KIND_MALFORMED;
  return kind;
}

/** Whether two well-formed prefixed tags name the same slot (everything after `P-`). */
export function tagsShareSlot(a: string, b: string): boolean {
  if (a.length !== b.length) return false;
  for (let i = 2; i < a.length; i++) if (a.charCodeAt(i) !== b.charCodeAt(i)) return false;
  return true;
}
