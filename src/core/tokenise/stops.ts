/**
 * Our one departure from UAX #29, so that every engine gives the same tokens: a full stop or colon
 * is always a token of its own, except between digits. UAX #29 joins letters across them (WB6/WB7:
 * "e.g", "javascript:alert" are one word), Node's ICU does so, Chromium's ICU data does not (it breaks
 * there). An exhaustive scan (every code point from U+0000 to U+2FFFF between two letters, two digits,
 * a letter and a digit, Hebrew, Katakana, Thai, CJK, emoji, spaces) found exactly these five characters
 * segmented differently by Node 20 (ICU 78) and Chromium 156; nothing else differed, also in 400,000
 * random mixes of every Word_Break class. We cut the text before them and segment the pieces, so
 * neither engine gets the chance to join them.
 */

/** U+002E FULL STOP, U+003A COLON, U+FE55 SMALL COLON, U+FF0E FULLWIDTH FULL STOP, U+FF1A FULLWIDTH COLON. */
export const TOKEN_STOPS: ReadonlySet<number> = new Set([0x2e, 0x3a, 0xfe55, 0xff0e, 0xff1a]);

// Word_Break=Numeric is General_Category Nd plus U+066B ARABIC DECIMAL SEPARATOR
// (auxiliary/WordBreakProperty.txt); the unit test checks this against the file.
const NUMERIC = /^[\p{Nd}\u066B]$/u;

/** True for a character of Word_Break=Numeric (`c` is one code point). */
export function codePointIsNumeric(c: string): boolean {
  return NUMERIC.test(c);
}
// What WB4 attaches to the character before it: Word_Break Extend, Format and ZWJ (marks, format
// controls, emoji modifiers); close enough here, where it only decides which character counts as "before".
const ATTACHED = /^[\p{M}\p{Cf}\p{Emoji_Modifier}]$/u;

function codePointBefore(text: string, end: number): string {
  const low = text.charCodeAt(end - 1);
  if (end >= 2 && low >= 0xdc00 && low <= 0xdfff) {
    const high = text.charCodeAt(end - 2);
    if (high >= 0xd800 && high <= 0xdbff) return text.slice(end - 2, end);
  }
  return text.slice(end - 1, end);
}

/** The last character before `at` that WB4 does not attach to its neighbour, or '' at the start. */
function baseBefore(text: string, at: number): string {
  let end = at;
  while (end > 0) {
    const c = codePointBefore(text, end);
    if (!ATTACHED.test(c)) return c;
    end -= c.length;
  }
  return '';
}

/**
 * Where to cut `text` before segmenting: before each stop that does not follow a digit (not at 0).
 * Cutting before the stop is enough: no UAX #29 rule but WB6 and WB12 (excluded by the digit test)
 * joins anything to a stop, and with nothing before it in its piece WB7 cannot join it to the letters
 * after it, while WB4 and WB3c still attach marks and joiners to it as usual.
 */
export function textStopCuts(text: string): number[] {
  const out: number[] = [];
  for (let i = 1; i < text.length; i++) {
    if (TOKEN_STOPS.has(text.charCodeAt(i)) && !codePointIsNumeric(baseBefore(text, i))) out.push(i);
  }
  return out;
}
