/**
 * Incremental line splitting shared by the line-based readers. Chunks may end anywhere, even between
 * the CR and LF of a CRLF pair: a line is only emitted once its LF (or the end of input) arrives.
 */

/** Where decoded text goes; `pushUndecodable` carries one whole line that was not valid UTF-8. */
export interface TextTarget {
  push(text: string): void;
  pushUndecodable(lineText: string): void;
}

/** The number of the last line handed on, kept up to date by a sink that splits lines itself. */
export interface LineCursor {
  line: number;
}

/** Receives lines in file order; `text[start, end)` is line `line` (1-based) without its terminator. */
export interface LineSink {
  lineAdd(text: string, start: number, end: number, line: number): void;
  lineUndecodable(line: number): void;
  /**
   * Optional bulk form, for a sink that finds line ends as it parses: take every complete line of
   * `text` from `from` (a line is complete once its LF is in `text`; a CR before the LF is not part
   * of the line), advance `cursor.line` past them, and return where the unfinished tail starts.
   */
  linesAdd?(text: string, from: number, cursor: LineCursor): number;
}

const LF = '\n';
const CR = 13;
const BOM = 0xfeff;

export class LineSplitter implements TextTarget {
  private carry = '';
  private lineCount = 0;
  private started = false;
  private readonly cursor: LineCursor = { line: 0 };

  constructor(private readonly sink: LineSink) {}

  push(chunk: string): void {
    if (chunk.length === 0) return;
    let text = chunk;
    if (!this.started) {
      this.started = true;
      if (text.charCodeAt(0) === BOM) text = text.slice(1);
    }
    let from = 0;
    if (this.carry !== '') {
      const newline = text.indexOf(LF);
      if (newline < 0) {
        this.carry += text;
        return;
      }
      const whole = this.carry + text.slice(0, newline);
      this.carry = '';
      this.lineEmit(whole, 0, whole.length);
      from = newline + 1;
    }
    from = this.linesEmit(text, from);
    this.carry = from < text.length ? text.slice(from) : '';
  }

  /**
   * Emit every complete line of `text` from `from`; returns where the unfinished tail starts. Kept
   * apart from `push` so the optimiser sees one small, stable loop (inlined in `push`, it was
   * deoptimised again on every chunk).
   */
  private linesEmit(text: string, from: number): number {
    const sink = this.sink;
    if (sink.linesAdd !== undefined) {
      const cursor = this.cursor;
      cursor.line = this.lineCount;
      const tail = sink.linesAdd(text, from, cursor);
      this.lineCount = cursor.line;
      return tail;
    }
    let line = this.lineCount;
    let start = from;
    let newline = text.indexOf(LF, start);
    while (newline >= 0) {
      const end = newline > start && text.charCodeAt(newline - 1) === CR ? newline - 1 : newline;
      sink.lineAdd(text, start, end, ++line);
      start = newline + 1;
      newline = text.indexOf(LF, start);
    }
    this.lineCount = line;
    return start;
  }

  pushUndecodable(_lineText: string): void {
    // The byte decoder only sends whole lines, so no partial line can be waiting in `carry` here.
    this.started = true;
    this.lineCount++;
    this.sink.lineUndecodable(this.lineCount);
  }

  /** Flush the last line when the input does not end with a newline. */
  end(): void {
    if (this.carry !== '') {
      const last = this.carry;
      this.carry = '';
      this.lineEmit(last, 0, last.length);
    }
  }

  private lineEmit(text: string, start: number, end: number): void {
    this.lineCount++;
    const stop = end > start && text.charCodeAt(end - 1) === CR ? end - 1 : end;
    this.sink.lineAdd(text, start, stop, this.lineCount);
  }
}
