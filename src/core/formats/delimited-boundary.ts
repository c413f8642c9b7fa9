const LF = 10;
const QUOTE = 34;

const enum State {
  FieldStart,
  Unquoted,
  Quoted,
  QuoteInQuoted,
}

/**
 * Finds record ends in streamed CSV/TSV so complete records can be parsed before the input is over.
 * It follows RFC 4180 section 2 quoting (a field is quoted only if it starts with `"`, `""` escapes a
 * quote, line breaks inside quotes are data). On anything outside that grammar it stops cutting for
 * good, so the rest is parsed in one piece exactly as a whole-file parse would see it.
 */
export class RecordBoundaryScanner {
  private state = State.FieldStart;
  private broken = false;
  private readonly delimiter: number;

  constructor(delimiter: string) {
    this.delimiter = delimiter.charCodeAt(0);
  }

  /** Scan `text[from..]` (continuing the previous scan); index after the last record-ending LF, or -1. */
  scan(text: string, from: number): number {
    if (this.broken) return -1;
    let cut = -1;
    let state = this.state;
    for (let i = from; i < text.length; i++) {
      const c = text.charCodeAt(i);
      if (state === State.Quoted) {
        if (c === QUOTE) state = State.QuoteInQuoted;
      } else if (state === State.QuoteInQuoted) {
        if (c === QUOTE) state = State.Quoted;
        else if (c === this.delimiter) state = State.FieldStart;
        else if (c === LF) {
          state = State.FieldStart;
          cut = i + 1;
        } else {
          this.broken = true;
          return cut;
        }
      } else if (c === LF) {
        state = State.FieldStart;
        cut = i + 1;
      } else if (c === this.delimiter) {
        state = State.FieldStart;
      } else if (state === State.FieldStart) {
        state = c === QUOTE ? State.Quoted : State.Unquoted;
      }
    }
    this.state = state;
    return cut;
  }
}
