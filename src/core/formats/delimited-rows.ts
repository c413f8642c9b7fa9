import type { Tokeniser } from '../tokenise';
import type { ReadError, Utterance } from '../types';
import { cellFormulaUnescape } from './delimited-escape';
import { UNDECODABLE_MESSAGE } from './reader';

export type ColumnRef = string | number;

export interface RowColumns {
  column: ColumnRef;
  idColumn?: ColumnRef;
  intentColumn?: ColumnRef;
  header: boolean;
  /** Undo the writer's formula escape in every cell (header names included). */
  formulaUnescape: boolean;
}

/** One parsed record with the file lines it covers (more than one when a quoted field holds a line break). */
export interface Row {
  fields: string[];
  firstLine: number;
  lastLine: number;
  /** Parser complaints about quoting, already worded. */
  problems: string[];
}

interface Resolved {
  text: number;
  id: number | undefined;
  intent: number | undefined;
  width: number;
  /** Header names of the columns kept in `meta` (empty without a header). */
  metaColumns: [number, string][];
  widthLine: number;
}

function columnName(ref: ColumnRef): string {
  return typeof ref === 'number' ? `number ${ref} (0-based)` : JSON.stringify(ref);
}

/**
 * Turns records into utterances: the first record is the header when there is one, the text comes
 * from `column`, and every other named column with a value is kept in `meta`.
 */
export class RowReader {
  private resolved: Resolved | null = null;
  private dead = false;
  private badLineIndex = 0;

  constructor(
    private readonly columns: RowColumns,
    private readonly tokenise: Tokeniser,
    private readonly badLines: readonly number[],
    private readonly emit: (utterance: Utterance) => void,
    private readonly errors: ReadError[],
  ) {}

  rowAdd(row: Row): void {
    const { firstLine, lastLine, problems } = row;
    const fields = this.columns.formulaUnescape ? row.fields.map(cellFormulaUnescape) : row.fields;
    if (fields.length === 1 && fields[0] === '' && problems.length === 0) return;
    if (this.rowHasBadLine(firstLine, lastLine)) {
      // Without its header row the columns cannot be named, so nothing after it can be read.
      if (this.resolved === null && this.columns.header) this.dead = true;
      return;
    }
    if (this.dead) return;
    if (problems.length > 0) {
      this.errors.push({ line: firstLine, message: `CSV quoting: ${problems.join('; ')}` });
      if (this.resolved === null) this.dead = true;
      return;
    }
    if (this.resolved === null) {
      this.resolved = this.columnsResolve(fields, firstLine);
      if (this.resolved === null) {
        this.dead = true;
        return;
      }
      if (this.columns.header) return;
    }
    this.recordAdd(this.resolved, fields, firstLine);
  }

  private rowHasBadLine(firstLine: number, lastLine: number): boolean {
    let found = false;
    while (this.badLineIndex < this.badLines.length) {
      const bad = this.badLines[this.badLineIndex] ?? 0;
      if (bad > lastLine) break;
      if (bad >= firstLine) {
        this.errors.push({ line: bad, message: `${UNDECODABLE_MESSAGE}; its record is skipped` });
        found = true;
      }
      this.badLineIndex++;
    }
    return found;
  }

  private columnIndex(ref: ColumnRef, fields: readonly string[], line: number): number | null {
    let index: number;
    if (typeof ref === 'number') index = ref;
    else if (this.columns.header) index = fields.indexOf(ref);
    else {
      this.errors.push({ line, message: `column ${columnName(ref)} is named, but the file is read without a header row` });
      return null;
    }
    if (Number.isInteger(index) && index >= 0 && index < fields.length) return index;
    const have = this.columns.header ? `the header has ${fields.map((f) => JSON.stringify(f)).join(', ')}` : `the first row has ${fields.length} fields`;
    this.errors.push({ line, message: `missing column ${columnName(ref)}: ${have}` });
    return null;
  }

  private columnsResolve(fields: string[], line: number): Resolved | null {
    const { column, idColumn, intentColumn } = this.columns;
    const text = this.columnIndex(column, fields, line);
    const id = idColumn === undefined ? undefined : this.columnIndex(idColumn, fields, line);
    const intent = intentColumn === undefined ? undefined : this.columnIndex(intentColumn, fields, line);
    if (text === null || id === null || intent === null) return null;
    const metaColumns: [number, string][] = [];
    if (this.columns.header) {
      const taken = new Set([text, id, intent]);
      const named = new Set<string>();
      fields.forEach((name, i) => {
        if (!taken.has(i) && name !== '' && !named.has(name)) {
          named.add(name);
          metaColumns.push([i, name]);
        }
      });
    }
    return { text, id, intent, width: fields.length, metaColumns, widthLine: line };
  }

  private recordAdd(resolved: Resolved, fields: string[], line: number): void {
    if (fields.length !== resolved.width) {
      const source = this.columns.header ? 'the header' : 'the first row';
      this.errors.push({
        line,
        message: `ragged row: ${fields.length} fields where ${source} (line ${resolved.widthLine}) has ${resolved.width}`,
      });
      return;
    }
    const text = fields[resolved.text] ?? '';
    if (text.trim() === '') {
      this.errors.push({ line, message: `empty text in column ${columnName(this.columns.column)}` });
      return;
    }
    const tokens = this.tokenise(text);
    const meta: [string, string][] = [];
    for (const [i, name] of resolved.metaColumns) {
      const value = fields[i] ?? '';
      if (value !== '') meta.push([name, value]);
    }
    const utterance: Utterance = { text, tokens, tags: new Array<string>(tokens.length).fill('O'), meta: Object.fromEntries(meta), line };
    const id = resolved.id === undefined ? '' : (fields[resolved.id] ?? '');
    const intent = resolved.intent === undefined ? '' : (fields[resolved.intent] ?? '');
    if (id !== '') utterance.id = id;
    if (intent !== '') utterance.intent = intent;
    this.emit(utterance);
  }
}
