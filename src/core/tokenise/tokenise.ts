import type { Token } from '../types';

/**
 * How an utterance text becomes tokens. `words` follows Unicode word segmentation (UAX #29) via
 * `Intl.Segmenter`, keeps punctuation as tokens and drops whitespace; `whitespace` splits on runs of
 * white space; `regex` takes each match of a user pattern as a token.
 */
export type TokeniserSpec =
  | { kind: 'words' }
  | { kind: 'whitespace' }
  | { kind: 'regex'; pattern: string; flags?: string };

export type Tokeniser = (text: string) => Token[];

export class TokeniserError extends Error {
  override name = 'TokeniserError';
}

const WHITESPACE_ONLY = /^\s+$/u;
const NON_WHITESPACE_RUN = /\S+/gu;

let segmenter: Intl.Segmenter | undefined;

/** Raw UAX #29 word segments (whitespace runs included), as [start, end) UTF-16 offsets. */
export function wordSegments(text: string): Token[] {
  // One shared instance: constructing a segmenter costs far more than segmenting a short utterance.
  segmenter ??= new Intl.Segmenter('und', { granularity: 'word' });
  const out: Token[] = [];
  for (const { segment, index } of segmenter.segment(text)) {
    out.push({ start: index, end: index + segment.length });
  }
  return out;
}

export function tokeniseWords(text: string): Token[] {
  return wordSegments(text).filter((t) => !WHITESPACE_ONLY.test(text.slice(t.start, t.end)));
}

export function tokeniseWhitespace(text: string): Token[] {
  return tokeniseByRegex(text, NON_WHITESPACE_RUN);
}

function tokeniseByRegex(text: string, pattern: RegExp): Token[] {
  const out: Token[] = [];
  for (const match of text.matchAll(pattern)) {
    const start = match.index;
    const end = start + match[0].length;
    if (end > start) out.push({ start, end });
  }
  return out;
}

/** Build a tokeniser from its spec; an invalid user pattern throws a `TokeniserError` saying why. */
export function tokeniserCreate(spec: TokeniserSpec): Tokeniser {
  switch (spec.kind) {
    case 'words':
      return tokeniseWords;
    case 'whitespace':
      return tokeniseWhitespace;
    case 'regex': {
      const flags = new Set([...(spec.flags ?? ''), 'g', 'u']);
      flags.delete('y');
      let pattern: RegExp;
      try {
        pattern = new RegExp(spec.pattern, [...flags].join(''));
      } catch (error) {
        throw new TokeniserError(`invalid token pattern /${spec.pattern}/: ${(error as Error).message}`);
      }
      return (text) => tokeniseByRegex(text, pattern);
    }
  }
}

export function tokenise(text: string, spec: TokeniserSpec = { kind: 'words' }): Token[] {
  return tokeniserCreate(spec)(text);
}
