import type { Token } from '../types';
import { textStopCuts } from './stops';

/**
 * How an utterance text becomes tokens. `words` follows Unicode word segmentation (UAX #29) via
 * `Intl.Segmenter`, keeps punctuation as tokens and drops whitespace, and always splits at a full
 * stop or colon outside numbers, where engines disagree (stops.ts); `whitespace` splits on runs of
 * Unicode White_Space; `regex` takes each non-empty match of a user pattern as a token.
 *
 * Every kind then applies one rule so that no token is invisible: whitespace at a token's edges is
 * trimmed (whole grapheme clusters only, so a combining mark never loses its base), and a token made
 * only of White_Space or Default_Ignorable_Code_Point characters (LRM/RLM, ZWJ, ZWSP…) is dropped.
 */
export type TokeniserSpec =
  | { kind: 'words' }
  | { kind: 'whitespace' }
  | { kind: 'regex'; pattern: string; flags?: string };

export type Tokeniser = (text: string) => Token[];

export class TokeniserError extends Error {
  override name = 'TokeniserError';
}

const BLANK_ONLY = /^[\p{White_Space}\p{Default_Ignorable_Code_Point}]*$/u;
const WHITE_SPACE_ONLY = /^\p{White_Space}+$/u;
const WHITE_SPACE_CHAR = /^\p{White_Space}$/u;
// Unicode White_Space, not JavaScript's \s: \s adds U+FEFF and misses U+0085 (PropList.txt).
const NON_WHITE_SPACE_RUN = /[^\p{White_Space}]+/gu;

// One shared instance each: constructing a segmenter costs far more than segmenting a short utterance.
let wordSegmenter: Intl.Segmenter | undefined;
let graphemeSegmenter: Intl.Segmenter | undefined;

/** Texts longer than this are segmented piece by piece (see `wordSegmentsChunked`). */
export const WORD_SEGMENT_CHUNK = 1024;

function segmentsPushRaw(text: string, offset: number, out: Token[]): void {
  wordSegmenter ??= new Intl.Segmenter('und', { granularity: 'word' });
  for (const { segment, index } of wordSegmenter.segment(text)) {
    out.push({ start: offset + index, end: offset + index + segment.length });
  }
}

const STOP_ANY = /[.:\uFE55\uFF0E\uFF1A]/;

/** UAX #29 segments, with the text cut before full stops and colons so every engine agrees (see stops.ts). */
function segmentsPush(text: string, offset: number, out: Token[]): void {
  const cuts = STOP_ANY.test(text) ? textStopCuts(text) : [];
  if (cuts.length === 0) return segmentsPushRaw(text, offset, out);
  let from = 0;
  for (const cut of [...cuts, text.length]) {
    segmentsPushRaw(text.slice(from, cut), offset + from, out);
    from = cut;
  }
}

const SPACE = 32;

/** An ASCII letter or digit: UAX #29 always breaks between U+0020 and one (WB999; no rule joins them). */
function asciiWordStart(code: number): boolean {
  return (code >= 48 && code <= 57) || (code >= 65 && code <= 90) || (code >= 97 && code <= 122);
}

/**
 * `wordSegments` cut into pieces of about `chunk` code units at places where UAX #29 must break (a
 * space followed by an ASCII letter or digit; no rule looks across such a break), so the result is
 * the same as one pass. Needed because the engine's segment iterator slows down with the length of
 * the text (8,000 words in one line took 0.6 s, four times 4,000); pieces keep it linear.
 */
export function wordSegmentsChunked(text: string, chunk: number): Token[] {
  const out: Token[] = [];
  let from = 0;
  while (from < text.length) {
    let cut = Math.min(text.length, from + chunk);
    while (cut < text.length && !(text.charCodeAt(cut - 1) === SPACE && asciiWordStart(text.charCodeAt(cut)))) cut++;
    segmentsPush(from === 0 && cut === text.length ? text : text.slice(from, cut), from, out);
    from = cut;
  }
  return out;
}

/**
 * UAX #29 word segments (whitespace runs included), as [start, end) UTF-16 offsets, with our one
 * departure: a full stop or colon is a segment of its own except between digits (see stops.ts).
 */
export function wordSegments(text: string): Token[] {
  return wordSegmentsChunked(text, WORD_SEGMENT_CHUNK);
}

/** The visible part of text[start, end), or null when nothing visible is left (see TokeniserSpec). */
function tokenVisible(text: string, start: number, end: number): Token | null {
  const piece = text.slice(start, end);
  if (BLANK_ONLY.test(piece)) return null;
  const edgeIsSpace = WHITE_SPACE_CHAR.test(piece[0] ?? '') || WHITE_SPACE_CHAR.test(piece[piece.length - 1] ?? '');
  if (!edgeIsSpace) return { start, end };
  graphemeSegmenter ??= new Intl.Segmenter('und', { granularity: 'grapheme' });
  const clusters = [...graphemeSegmenter.segment(piece)];
  let first = 0;
  let last = clusters.length - 1;
  while (WHITE_SPACE_ONLY.test(clusters[first]?.segment ?? '')) first++;
  while (WHITE_SPACE_ONLY.test(clusters[last]?.segment ?? '')) last--;
  const from = clusters[first];
  const to = clusters[last];
  // Not blank, so at least one cluster is not pure whitespace: from/to exist and from <= to.
  if (from === undefined || to === undefined) return null;
  return { start: start + from.index, end: start + to.index + to.segment.length };
}

function tokensVisible(text: string, pieces: Iterable<Token>): Token[] {
  const out: Token[] = [];
  for (const { start, end } of pieces) {
    const token = tokenVisible(text, start, end);
    if (token !== null) out.push(token);
  }
  return out;
}

export function tokeniseWords(text: string): Token[] {
  return tokensVisible(text, wordSegments(text));
}

export function tokeniseWhitespace(text: string): Token[] {
  return tokensVisible(text, regexMatches(text, NON_WHITE_SPACE_RUN));
}

/** Non-empty matches of a global pattern. `matchAll` steps one code point past an empty match, so it cannot loop. */
function* regexMatches(text: string, pattern: RegExp): Generator<Token> {
  for (const match of text.matchAll(pattern)) {
    const start = match.index;
    const end = start + match[0].length;
    if (end > start) yield { start, end };
  }
}

/** V8 says "Invalid regular expression: /(/gu: Unterminated group"; keep only the reason. */
function regexReason(error: unknown): string {
  const message = error instanceof Error ? error.message : String(error);
  return message.replace(/^Invalid regular expression: \/[\s\S]*\/[a-z]*: /, '');
}

/**
 * Compile a user token pattern. `g` is always on; `u` is added unless `v` is given, so matches never
 * split a surrogate pair; `y` is dropped because sticky matching would stop at the first gap.
 */
function tokenPatternCompile(pattern: string, userFlags: string): RegExp {
  if (pattern === '') throw new TokeniserError('Token pattern is empty: give a regular expression that matches one token.');
  const flags = new Set(userFlags);
  const unknown = [...flags].filter((flag) => !'dgimsuvy'.includes(flag));
  if (unknown.length > 0 || (flags.has('u') && flags.has('v'))) {
    throw new TokeniserError(
      `Token pattern flags "${userFlags}" are not valid: use any of d, i, m, s and one of u or v (g is always on).`,
    );
  }
  flags.delete('y');
  flags.add('g');
  if (!flags.has('v')) flags.add('u');
  try {
    return new RegExp(pattern, [...flags].join(''));
  } catch (error) {
    throw new TokeniserError(`Token pattern /${pattern}/${userFlags} is not a valid regular expression: ${regexReason(error)}`);
  }
}

/**
 * Build a tokeniser from its spec; a bad spec throws a `TokeniserError` saying why. A regex is
 * compiled once here. Catastrophic backtracking cannot be interrupted on the calling thread: callers
 * running user patterns over a whole corpus should do so in a worker they can terminate.
 */
export function tokeniserCreate(spec: TokeniserSpec): Tokeniser {
  switch (spec.kind) {
    case 'words':
      return tokeniseWords;
    case 'whitespace':
      return tokeniseWhitespace;
    case 'regex': {
      const pattern = tokenPatternCompile(spec.pattern, spec.flags ?? '');
      return (text) => tokensVisible(text, regexMatches(text, pattern));
    }
    default: {
      // Specs arrive from saved projects and the command line, so an unknown kind is possible at run time.
      const kind = JSON.stringify((spec as { kind?: unknown }).kind);
      throw new TokeniserError(`Unknown tokeniser kind ${kind}: expected "words", "whitespace" or "regex".`);
    }
  }
}

export function tokenise(text: string, spec: TokeniserSpec = { kind: 'words' }): Token[] {
  return tokeniserCreate(spec)(text);
}
