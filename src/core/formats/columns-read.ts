import { KIND_I, KIND_S } from '../rules/tagKinds';
import { SCHEME_PREFIXES, type ParsedTag } from '../schemes';
import type { Document, ReadError, Scheme, Utterance } from '../types';
import { commentBounds, lineIsComment, type CommentBounds } from './columns-comment';
import { KEY_ID, KEY_INTENT, KEY_TEXT, RESERVED_PREFIXES, reservedCommentKey } from './columns-reserved';
import { UtteranceTarget, type ColumnsTarget } from './columns-target';
import {
  documentRead,
  errorsSort,
  readerFromLineParser,
  UNDECODABLE_MESSAGE,
  type DocumentReader,
  type LineParser,
  type ReadInput,
  type UtteranceSinkOption,
  utteranceSink,
} from './reader';
import type { LineCursor } from './lines';
import { SchemeEvidence } from './scheme-evidence';
import { TagTable, TRIE_ROOT, TRIE_SHIFT, TRIE_WIDTH, type TagEntry } from './tag-table';

export interface ColumnsReadOptions extends UtteranceSinkOption {
  /** The file's scheme; detected from the tags when absent (see `SchemeEvidence`). */
  scheme?: Scheme;
  /**
   * `false` leaves each utterance's `tokens` empty, and its `text` '' when the file gives none: for
   * consumers that need only tags and lines (the CLI's `check`), it spares an object per token.
   * Tokens are still placed in `# text`, so the errors are exactly those of a full read.
   */
  tokenRanges?: boolean;
}

const SPACE = 32;
const TAB = 9;
const HASH = 35;
const LF = 10;
const CR = 13;
const DOCSTART = '-DOCSTART-';

function schemeName(scheme: Scheme): string {
  return scheme === 'bioes' ? 'BIOES' : scheme.toUpperCase();
}

function schemeMismatchMessage(tag: string, scheme: Scheme): string {
  const allowed = ['O', ...[...SCHEME_PREFIXES[scheme]].map((p) => `${p}-`)].join(', ');
  return `tag ${JSON.stringify(tag)} is not in the ${schemeName(scheme)} scheme (allowed: ${allowed})`;
}

function tagInvalidMessage(tag: string): string {
  return `tag ${JSON.stringify(tag)} is not a valid tag: expected O, or B-, I-, E- or S- followed by a slot name`;
}

/**
 * Line parser for IOB/BIOES column files: `token … tag` lines (tab or spaces, tag in the last
 * column), a blank line after each utterance, `# key = value` comments before it. An utterance with
 * any error is left out whole; its errors name the offending lines. Tokens are placed as they are
 * read: found in order in `# text`, or laid end to end one space apart when there is none.
 */
class ColumnsParser implements LineParser {
  private readonly utterances: Utterance[] = [];
  private readonly target: ColumnsTarget;
  private readonly errors: ReadError[] = [];
  private readonly tagTable = new TagTable();
  private readonly evidence = new SchemeEvidence();
  private readonly scheme: Scheme | undefined;
  private readonly ranges: boolean;
  /** Tags of a higher kind are rejected: malformed ones always, E-/S- when the scheme is IOB1 or IOB2. */
  private readonly kindMax: number;

  // The utterance being read; `blockLine` is 0 between utterances.
  private blockLine = 0;
  private blockBad = false;
  /** Token lines of the utterance so far, tagged or not. */
  private tokenLineCount = 0;
  /** The last line number seen. */
  private lineLast = 0;
  /** Where the next token may start: in `# text`, or in the text being joined. */
  private offset = 0;
  /** Token strings to join when there is no `# text`. */
  private tokenTexts: string[] = [];
  private textLost = false;
  private id: string | undefined;
  private intent: string | undefined;
  private text: string | undefined;
  /** The `# text` value as `textSource[textBase, textEnd)`: the flat string it was cut from. */
  private textSource: string | undefined;
  private textBase = 0;
  private textEnd = 0;
  private textLine = 0;
  private meta: Record<string, string> | null = null;
  private readonly bounds: CommentBounds = { keyStart: 0, keyEnd: 0, valueStart: 0 };

  /** `target`: where tokens and utterances go; by default Utterance objects for `onUtterance` or the document. */
  constructor(options: ColumnsReadOptions, target?: ColumnsTarget) {
    this.scheme = options.scheme;
    this.ranges = options.tokenRanges ?? true;
    this.kindMax = this.scheme === 'iob1' || this.scheme === 'iob2' ? KIND_I : KIND_S;
    this.target = target ?? new UtteranceTarget(utteranceSink(options, this.utterances));
  }

  /**
   * Every complete line of `text` from `from`, in one pass: the common lines (`token<TAB>tag` with a
   * tag seen before, and blank lines) are read here with no line search and no call per line; any
   * other line goes to `lineAdd`, which knows every case. Returns where the unfinished last line starts.
   */
  linesAdd(text: string, from: number, cursor: LineCursor): number {
    const length = text.length;
    const entries = this.tagTable.entries;
    let line = cursor.line;
    let start = from;
    while (start < length) {
      let code = text.charCodeAt(start);
      if (code === LF) {
        line++;
        this.blockEnd();
        start++;
        continue;
      }
      fast: if (code > SPACE && code !== HASH) {
        // The token, compared with `# text` as it is scanned (see `lineAdd`).
        const source = this.textSource;
        const textEnd = this.textEnd;
        let at = this.textBase + this.offset;
        let matched = source !== undefined && !this.textLost;
        if (matched) while (at < textEnd && source?.charCodeAt(at) === SPACE) at++;
        let i = start;
        for (let k = at; i < length; i++, k++) {
          code = text.charCodeAt(i);
          if (code <= SPACE) break;
          if (matched && (k >= textEnd || source?.charCodeAt(k) !== code)) matched = false;
        }
        const firstEnd = i;
        if ((code !== TAB && code !== SPACE) || i === length) break fast;
        if (firstEnd - start === DOCSTART.length && text.startsWith(DOCSTART, start)) break fast;
        while (++i < length && ((code = text.charCodeAt(i)) === TAB || code === SPACE));
        // The tag, walked down the tag table's trie; it must end the line.
        const tagStart = i;
        const trie = this.tagTable.trie;
        let row = TRIE_ROOT;
        for (; i < length; i++) {
          code = text.charCodeAt(i);
          if (code <= SPACE) break;
          row = code < TRIE_WIDTH ? (trie[row + code] ?? 0) : 0;
        }
        const entry = entries[row >> TRIE_SHIFT];
        if (i === tagStart || i === length || entry === undefined) break fast;
        if (code === CR && i + 1 < length && text.charCodeAt(i + 1) === LF) i++;
        else if (code !== LF) break fast;
        line++;
        this.tokenAdd(text, start, firstEnd, entry, line, matched ? at : -1);
        start = i + 1;
        continue;
      }
      const newline = text.indexOf('\n', start);
      if (newline < 0) break;
      const end = newline > start && text.charCodeAt(newline - 1) === CR ? newline - 1 : newline;
      line++;
      // `# id = `, `# intent = ` and `# text = ` before the first token line need no further parsing.
      const key = code === HASH && this.tokenLineCount === 0 ? reservedCommentKey(text, start) : -1;
      if (key < 0) {
        this.lineAdd(text, start, end, line);
      } else {
        if (this.blockLine === 0) this.blockStart(line);
        this.reservedSet(key, text, start + (RESERVED_PREFIXES[key]?.length ?? 0), end, line);
      }
      start = newline + 1;
    }
    cursor.line = line;
    this.lineLast = line;
    return start;
  }

  lineAdd(text: string, start: number, end: number, line: number): void {
    this.lineLast = line;
    let first = start;
    let code = 0;
    while (first < end && ((code = text.charCodeAt(first)) === SPACE || code === TAB)) first++;
    if (first === end) {
      this.blockEnd();
      return;
    }
    if (code === HASH && first === start && lineIsComment(text, start, end)) {
      this.commentAdd(text, start, end, line);
      return;
    }
    // Scan the token and, when a `# text` is being followed, compare it with the text in the same
    // pass: this loop runs over every character of a million-token file. The text is read from the
    // string it was cut from, a flat string (the cut itself would be a slice, slower to index).
    const source = this.textSource;
    const textEnd = this.textEnd;
    let at = this.textBase + this.offset;
    let matched = source !== undefined && !this.textLost;
    if (matched) while (at < textEnd && source?.charCodeAt(at) === SPACE) at++;
    let firstEnd = first;
    for (let k = at; firstEnd < end; firstEnd++, k++) {
      code = text.charCodeAt(firstEnd);
      if (code === SPACE || code === TAB) break;
      if (matched && (k >= textEnd || source?.charCodeAt(k) !== code)) matched = false;
    }
    if (firstEnd - first === DOCSTART.length && text.startsWith(DOCSTART, first)) return;
    let last = end;
    while ((code = text.charCodeAt(last - 1)) === SPACE || code === TAB) last--;
    let lastStart = last;
    while (lastStart > firstEnd && (code = text.charCodeAt(lastStart - 1)) !== SPACE && code !== TAB) lastStart--;
    if (lastStart <= firstEnd) {
      if (this.blockLine === 0) this.blockStart(line);
      this.tokenLineCount++;
      this.tagMissing(text, first, last, line);
      return;
    }
    this.tokenAdd(text, first, firstEnd, this.tagTable.find(text, lastStart, last), line, matched ? at : -1);
  }

  /**
   * A token line with its tag: `text[first, firstEnd)` is the token; `matchedAt` is where it already
   * matched `# text` (in `textSource`) right after the previous token and some spaces, or -1. A token
   * never starts with a space, so such a match is also the first one `indexOf` would find.
   */
  private tokenAdd(text: string, first: number, firstEnd: number, entry: TagEntry, line: number, matchedAt: number): void {
    if (this.blockLine === 0) this.blockStart(line);
    this.tokenLineCount++;
    if (entry.kind > this.kindMax) this.tagReject(entry, line);
    else if (this.scheme === undefined) this.evidence.tagAdd(entry.parsed as ParsedTag);
    const length = firstEnd - first;
    if (this.textSource === undefined) {
      const at = this.offset;
      if (this.ranges) this.tokenTexts.push(text.slice(first, firstEnd));
      this.offset += length + 1;
      this.target.tokenAdd(entry, line, this.ranges ? at : -1, at + length);
    } else if (matchedAt >= 0) {
      const at = matchedAt - this.textBase;
      this.offset = at + length;
      this.target.tokenAdd(entry, line, this.ranges ? at : -1, at + length);
    } else {
      const at = this.tokenLocate(text, first, firstEnd, line);
      this.target.tokenAdd(entry, line, this.ranges ? at : -1, at + length);
    }
  }

  private tagMissing(text: string, first: number, last: number, line: number): void {
    const only = JSON.stringify(text.slice(first, last));
    this.errorAdd(line, `missing tag column: expected a token and a tag separated by a tab or spaces, got only ${only}`);
  }

  /** A malformed tag, or (scheme given) one outside the scheme; a detected scheme admits every prefix. */
  private tagReject(entry: TagEntry, line: number): void {
    const scheme = this.scheme;
    const message = entry.parsed === null || scheme === undefined ? tagInvalidMessage(entry.tag) : schemeMismatchMessage(entry.tag, scheme);
    this.errorAdd(line, message);
  }

  lineUndecodable(line: number): void {
    this.lineLast = line;
    if (this.blockLine === 0) this.blockStart(line);
    this.errorAdd(line, `${UNDECODABLE_MESSAGE}; its utterance is skipped`);
  }

  end(): Document {
    this.blockEnd();
    this.target.linesRead?.(this.lineLast);
    // A detected scheme admits every prefix seen (E-/S- make it BIOES), so only a given one is checked per line.
    const scheme = this.scheme ?? this.evidence.scheme();
    return { scheme, utterances: this.utterances, errors: errorsSort(this.errors) };
  }

  /**
   * Find a token that did not match right after the previous one (and some spaces) further on in
   * `# text`: where it starts, or -1 (then the utterance has an error).
   */
  private tokenLocate(line: string, first: number, firstEnd: number, lineNumber: number): number {
    const target = this.text;
    if (target === undefined || this.textLost) return -1;
    const token = line.slice(first, firstEnd);
    const at = target.indexOf(token, this.offset);
    if (at < 0) {
      this.textLost = true;
      this.errorAdd(
        lineNumber,
        `token/text mismatch: token ${JSON.stringify(token)} is not in the "# text" comment (line ${this.textLine}) ` +
          `after character ${this.offset}; the text must contain the tokens in order`,
      );
      return -1;
    }
    this.offset = at + token.length;
    return at;
  }

  private commentAdd(text: string, start: number, end: number, line: number): void {
    if (this.tokenLineCount > 0) {
      this.errorAdd(line, 'comment line inside an utterance: comments must come before its first token line (is a blank line missing?)');
      return;
    }
    if (this.blockLine === 0) this.blockStart(line);
    const bounds = this.bounds;
    if (!commentBounds(text, start, end, bounds)) return;
    const { keyStart, keyEnd, valueStart } = bounds;
    // The three reserved keys are recognised in place: a million-line file has hundreds of thousands.
    if (keyEnd - keyStart === 2 && text.startsWith('id', keyStart)) this.reservedSet(KEY_ID, text, valueStart, end, line);
    else if (keyEnd - keyStart === 6 && text.startsWith('intent', keyStart)) this.reservedSet(KEY_INTENT, text, valueStart, end, line);
    else if (keyEnd - keyStart === 4 && text.startsWith('text', keyStart)) this.reservedSet(KEY_TEXT, text, valueStart, end, line);
    else {
      this.meta ??= {};
      const key = text.slice(keyStart, keyEnd);
      const value = text.slice(valueStart, end);
      // Assigning "__proto__" would replace the prototype; it must stay a plain entry.
      if (key === '__proto__') Object.defineProperty(this.meta, key, { value, enumerable: true, writable: true, configurable: true });
      else this.meta[key] = value;
    }
  }

  /** `# id`, `# intent` or `# text` (`key`, see `RESERVED_PREFIXES`) with its value at `text[valueStart, end)`. */
  private reservedSet(key: number, text: string, valueStart: number, end: number, line: number): void {
    const value = text.slice(valueStart, end);
    if (key === KEY_ID) this.id = value;
    else if (key === KEY_INTENT) this.intent = value;
    else {
      this.text = value;
      this.textSource = text;
      this.textBase = valueStart;
      this.textEnd = end;
      this.textLine = line;
    }
  }

  private blockStart(line: number): void {
    this.blockLine = line;
    this.blockBad = false;
    this.evidence.utteranceStart();
  }

  private errorAdd(line: number, message: string): void {
    this.errors.push({ line, message });
    this.blockBad = true;
  }

  private blockEnd(): void {
    if (this.blockLine === 0) return;
    if (this.tokenLineCount === 0) {
      if (this.text !== undefined && !this.blockBad) {
        this.errors.push({ line: this.textLine, message: '"# text" comment with no token lines after it' });
      }
    } else if (this.blockBad) {
      this.target.utteranceDrop();
    } else {
      this.target.utteranceKeep({ text: this.text ?? this.tokenTexts.join(' '), id: this.id, intent: this.intent, meta: this.meta, line: this.blockLine });
    }
    this.blockLine = 0;
    this.tokenLineCount = 0;
    this.offset = 0;
    this.tokenTexts.length = 0;
    this.textLost = false;
    this.id = undefined;
    this.intent = undefined;
    this.text = undefined;
    this.textSource = undefined;
    this.meta = null;
  }
}

/** Incremental column-file reader (see `DocumentReader`). */
export function columnsReader(options: ColumnsReadOptions = {}): DocumentReader {
  return readerFromLineParser(new ColumnsParser(options));
}

/**
 * A column-file reader that hands tokens and utterances to `target` instead of building Utterance
 * objects (`onUtterance` is not called); the document it ends with has the scheme and the errors,
 * exactly those of `columnsReader`, and no utterances.
 */
export function columnsReaderTo(target: ColumnsTarget, options: Omit<ColumnsReadOptions, 'onUtterance'> = {}): DocumentReader {
  return readerFromLineParser(new ColumnsParser(options, target));
}

/** Read an IOB/BIOES column file; never throws on bad input (errors come back in the document). */
export function columnsRead(input: ReadInput, options: ColumnsReadOptions = {}): Document {
  return documentRead(columnsReader(options), input);
}
