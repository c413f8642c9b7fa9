import type { Token, Utterance } from '../types';
import type { TagEntry } from './tag-table';

/** What the column reader knows of an utterance once its blank line (or the end of input) arrives. */
export interface ColumnsUtterance {
  /** `# text`, or the tokens joined one space apart ('' when read without token ranges). */
  text: string;
  id: string | undefined;
  intent: string | undefined;
  /** Other `# key = value` comments; null when there were none. */
  meta: Record<string, string> | null;
  /** 1-based line where the utterance starts. */
  line: number;
}

/**
 * Where the column reader puts what it reads, token by token, so a consumer that needs no Utterance
 * objects (the command line's `agree`) can write straight into its own arrays. The reader decides
 * every error; a target only records, and forgets an utterance when told to drop it.
 */
export interface ColumnsTarget {
  /**
   * A token line of the current utterance with its tag; `[start, end)` is the token in the
   * utterance's text, or start -1 when it was not placed (read without ranges, or not in `# text`).
   */
  tokenAdd(entry: TagEntry, line: number, start: number, end: number): void;
  /** The current utterance is good: keep it with what it had. */
  utteranceKeep(utterance: ColumnsUtterance): void;
  /** The current utterance had an error: forget its tokens. */
  utteranceDrop(): void;
  /** At the end of input: how many lines were read (a piece of a file counts its own). */
  linesRead?(count: number): void;
}

/** The ordinary target: one Utterance object per utterance, handed to `emit`. */
export class UtteranceTarget implements ColumnsTarget {
  private tokens: Token[] = [];
  private tags: string[] = [];
  private tokenLines: number[] = [];

  constructor(private readonly emit: (utterance: Utterance) => void) {}

  tokenAdd(entry: TagEntry, line: number, start: number, end: number): void {
    this.tokenLines.push(line);
    this.tags.push(entry.tag);
    if (start >= 0) this.tokens.push({ start, end });
  }

  utteranceKeep(u: ColumnsUtterance): void {
    const utterance: Utterance = { text: u.text, tokens: this.tokens, tags: this.tags, meta: u.meta ?? {}, line: u.line, tokenLines: this.tokenLines };
    if (u.id !== undefined) utterance.id = u.id;
    if (u.intent !== undefined) utterance.intent = u.intent;
    this.utteranceDrop();
    this.emit(utterance);
  }

  utteranceDrop(): void {
    this.tokens = [];
    this.tags = [];
    this.tokenLines = [];
  }
}
