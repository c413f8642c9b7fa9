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

/** Bits of a tag code (see `tagCode`) holding the kind; the slot number sits above them. */
export const TAG_CODE_KIND_BITS = 3;
const KIND_MASK = (1 << TAG_CODE_KIND_BITS) - 1;
/** Bound on remembered tags and slots: callers passing endless fresh strings must not grow memory without end. */
const REMEMBERED_MAX = 4096;

const codes = new Map<string, number>();
const RECENT_SIZE = 256;
const recentTags = new Array<string>(RECENT_SIZE).fill('');
const recentCodes = new Int32Array(RECENT_SIZE);
// Never cleared, so a slot number never comes to mean another slot; past the bound new slots get 0.
const slotNumbers = new Map<string, number>();

/**
 * `tagKind` with a slot number above it (`slot << TAG_CODE_KIND_BITS | kind`): two tags with equal
 * non-zero numbers share their slot, different non-zero numbers mean different slots, and 0 (for
 * `O`, malformed tags, and slots past the bound) means "compare the strings". Remembered per tag
 * string, so a file's few distinct tags are each read once however many times they occur.
 */
export function tagCode(tag: string): number {
  const length = tag.length;
  if (length < 3) return length === 1 && tag.charCodeAt(0) === 79 /* O */ ? KIND_O : KIND_MALFORMED;
  // A small direct-mapped cache in front of the map (keyed so B-x and I-x differ): a string compare,
  // usually of the very same string.
  const cell = (length * 7 + tag.charCodeAt(0) * 31 + tag.charCodeAt(length - 1)) & (RECENT_SIZE - 1);
  if (recentTags[cell] === tag) return recentCodes[cell] ?? 0;
  const code = codes.get(tag) ?? tagCodeRemember(tag);
  recentTags[cell] = tag;
  recentCodes[cell] = code;
  return code;
}

function tagCodeRemember(tag: string): number {
  const kind = tagKind(tag);
  let number = 0;
  if (kind !== KIND_MALFORMED) {
    const slot = tag.slice(2);
    number = slotNumbers.get(slot) ?? 0;
    if (number === 0 && slotNumbers.size < REMEMBERED_MAX) {
      number = slotNumbers.size + 1;
      slotNumbers.set(slot, number);
    }
  }
  const code = (number << TAG_CODE_KIND_BITS) | kind;
  if (codes.size >= REMEMBERED_MAX) codes.clear();
  codes.set(tag, code);
  return code;
}

export function tagCodeKind(code: number): number {
  return code & KIND_MASK;
}

/** Whether two well-formed prefixed tags name the same slot, given their codes (see `tagCode`). */
export function tagCodesShareSlot(a: string, aCode: number, b: string, bCode: number): boolean {
  const aSlot = aCode >> TAG_CODE_KIND_BITS;
  const bSlot = bCode >> TAG_CODE_KIND_BITS;
  if (aSlot !== 0 && bSlot !== 0) return aSlot === bSlot;
  return tagsShareSlot(a, b);
}
