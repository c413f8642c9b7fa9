import Papa from 'papaparse';
import { tokeniserCreate, type TokeniserSpec } from '../tokenise';
import type { Document, ReadError, Scheme, Utterance } from '../types';
import { RecordBoundaryScanner } from './delimited-boundary';
import { RowReader, type ColumnRef } from './delimited-rows';
import { documentRead, readerFromTextParser, type DocumentReader, type ReadInput, type TextParser, type UtteranceSinkOption, utteranceSink } from './reader';

export type Delimiter = ',' | '\t';

export interface DelimitedReadOptions extends UtteranceSinkOption {
  /** The text column: a header name, or a 0-based index. */
  column: ColumnRef;
  /** Default: sniffed from the first line (tab when it has tabs and no more commas than tabs). */
  delimiter?: Delimiter;
  /** Whether the first record names the columns. Default: true when `column` is a name, false for an index. */
  header?: boolean;
  idColumn?: ColumnRef;
  intentColumn?: ColumnRef;
  /** Default: words. */
  tokeniser?: TokeniserSpec;
  /** Recorded on the document; every tag is O. Default: iob2. */
  scheme?: Scheme;
  /**
   * Default true: undo our writer's spreadsheet escape (`'=1+1` reads as `=1+1`; see
   * delimited-escape.ts). Only a quote before `=`, `+`, `-`, `@`, tab or CR is taken off.
   */
  formulaUnescape?: boolean;
}

const LF = 10;
const BOM = 0xfeff;

function newlinesCount(text: string, from = 0, to = text.length): number {
  let count = 0;
  for (let i = text.indexOf('\n', from); i >= 0 && i < to; i = text.indexOf('\n', i + 1)) count++;
  return count;
}

export function delimiterSniff(firstLine: string): Delimiter {
  const tabs = firstLine.split('\t').length - 1;
  const commas = firstLine.split(',').length - 1;
  return tabs > 0 && tabs >= commas ? '\t' : ',';
}

/**
 * CSV/TSV over papaparse, fed in batches of complete records so it can stream. Line breaks are
 * normalised to LF first (CRLF files and LF files read the same, quoted line breaks included); file
 * lines are counted on that text, so records with quoted line breaks still report the right line.
 */
class DelimitedParser implements TextParser {
  private readonly utterances: Utterance[] = [];
  private readonly errors: ReadError[] = [];
  private readonly badLines: number[] = [];
  private readonly rows: RowReader;
  private readonly scheme: Scheme;
  private delimiter: Delimiter | undefined;
  private scanner: RecordBoundaryScanner | null = null;
  private buffer = '';
  /** Text appended since the boundary scanner last ran. */
  private unscanned = '';
  private bufferLine = 1;
  private linesPushed = 0;
  private heldCarriageReturn = false;
  private started = false;

  constructor(options: DelimitedReadOptions) {
    this.delimiter = options.delimiter;
    const header = options.header ?? typeof options.column === 'string';
    const columns = { column: options.column, header, formulaUnescape: options.formulaUnescape ?? true, ...optionalColumns(options) };
    const tokenise = tokeniserCreate(options.tokeniser ?? { kind: 'words' });
    this.rows = new RowReader(columns, tokenise, this.badLines, utteranceSink(options, this.utterances), this.errors);
    this.scheme = options.scheme ?? 'iob2';
  }

  push(text: string): void {
    this.append(text, false);
  }

  pushUndecodable(lineText: string): void {
    this.append(lineText, true);
  }

  end(): Document {
    if (this.heldCarriageReturn) {
      this.heldCarriageReturn = false;
      this.buffer += '\r';
    }
    this.flush(true);
    this.errors.sort((a, b) => a.line - b.line);
    return { scheme: this.scheme, utterances: this.utterances, errors: this.errors };
  }

  private append(chunk: string, undecodable: boolean): void {
    if (chunk.length === 0) return;
    let text = chunk;
    if (!this.started) {
      this.started = true;
      if (text.charCodeAt(0) === BOM) text = text.slice(1);
    }
    if (this.heldCarriageReturn) {
      text = `\r${text}`;
      this.heldCarriageReturn = false;
    }
    // A CR at the end of a chunk may be the first half of a CRLF: wait for the next chunk to decide.
    if (text.charCodeAt(text.length - 1) === 13) {
      this.heldCarriageReturn = true;
      text = text.slice(0, -1);
    }
    if (text.includes('\r\n')) text = text.replaceAll('\r\n', '\n');
    if (undecodable) this.badLines.push(this.linesPushed + 1);
    this.linesPushed += newlinesCount(text);
    this.buffer += text;
    this.unscanned += text;
    this.flush(false);
  }

  private flush(final: boolean): void {
    if (this.scanner === null) {
      // Until the first line is complete nothing has been scanned, so `unscanned` is the whole buffer.
      const newline = this.buffer.indexOf('\n');
      if (newline < 0 && !final) return;
      this.delimiter ??= delimiterSniff(newline < 0 ? this.buffer : this.buffer.slice(0, newline));
      this.scanner = new RecordBoundaryScanner(this.delimiter);
    }
    let batch: string;
    if (final) {
      batch = this.buffer;
      this.buffer = '';
    } else {
      // Scan only the new text (the scanner keeps its state), so a long quoted field is not rescanned.
      const cut = this.scanner.scan(this.unscanned, 0);
      const scannedFrom = this.buffer.length - this.unscanned.length;
      this.unscanned = '';
      if (cut < 0) return;
      batch = this.buffer.slice(0, scannedFrom + cut);
      this.buffer = this.buffer.slice(scannedFrom + cut);
    }
    if (batch.length > 0) this.batchParse(batch);
  }

  private batchParse(batch: string): void {
    let rowStart = 0;
    let line = this.bufferLine;
    // papaparse drops a U+FEFF that starts its input; the file's BOM is gone by now, so one here is data
    // (a record starting with U+FEFF) and must not depend on where a batch begins: give papaparse a spare.
    Papa.parse<string[]>(batch.charCodeAt(0) === BOM ? `\uFEFF${batch}` : batch, {
      delimiter: this.delimiter ?? ',',
      newline: '\n',
      quoteChar: '"',
      escapeChar: '"',
      header: false,
      skipEmptyLines: false,
      step: (results) => {
        const cursor = results.meta.cursor;
        const breaks = newlinesCount(batch, rowStart, cursor);
        const endsWithBreak = cursor > rowStart && batch.charCodeAt(cursor - 1) === LF;
        const firstLine = line;
        const problems = results.errors.map((e) => e.message);
        this.rows.rowAdd({ fields: results.data, firstLine, lastLine: firstLine + breaks - (endsWithBreak ? 1 : 0), problems });
        line += breaks;
        rowStart = cursor;
      },
    });
    this.bufferLine += newlinesCount(batch);
  }
}

function optionalColumns(options: DelimitedReadOptions): { idColumn?: ColumnRef; intentColumn?: ColumnRef } {
  const out: { idColumn?: ColumnRef; intentColumn?: ColumnRef } = {};
  if (options.idColumn !== undefined) out.idColumn = options.idColumn;
  if (options.intentColumn !== undefined) out.intentColumn = options.intentColumn;
  return out;
}

/** Incremental CSV/TSV reader; an invalid tokeniser spec throws `TokeniserError` here (a setting, not input). */
export function delimitedReader(options: DelimitedReadOptions): DocumentReader {
  return readerFromTextParser(new DelimitedParser(options));
}

/** Read CSV/TSV (RFC 4180 quoting); one utterance per record, text from `column`, all tags O. */
export function delimitedRead(input: ReadInput, options: DelimitedReadOptions): Document {
  return documentRead(delimitedReader(options), input);
}
