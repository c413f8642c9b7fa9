/**
 * Shared core types. Offsets on `Token` and `Span` are UTF-16 code-unit indices into the utterance
 * text (what JavaScript string methods use); the JSON Lines codec converts them to Unicode code
 * points at the file boundary, because Python-based tooling slices strings by code point.
 */

/** A token as a half-open [start, end) range of the utterance text. */
export interface Token {
  start: number;
  end: number;
}

/** A labelled run of tokens: token indices, [start, end) half-open. */
export interface Span {
  start: number;
  end: number;
  slot: string;
}

export type Scheme = 'iob1' | 'iob2' | 'bioes';
export const SCHEMES: readonly Scheme[] = ['iob1', 'iob2', 'bioes'];

/** One utterance as read from or written to a file. `tags` are in the document's scheme. */
export interface Utterance {
  id?: string;
  text: string;
  tokens: Token[];
  tags: string[];
  intent?: string;
  /** Other `# key = value` comments, kept so round trips preserve them. */
  meta: Record<string, string>;
  /** 1-based file line where the utterance starts, and the line of each token (when known). */
  line?: number;
  tokenLines?: number[];
}

/** A problem in the input, never thrown: readers return the good utterances plus these. */
export interface ReadError {
  line: number;
  message: string;
}

export interface Document {
  scheme: Scheme;
  utterances: Utterance[];
  errors: ReadError[];
}
