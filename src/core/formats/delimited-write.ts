import Papa from 'papaparse';
import type { Utterance } from '../types';
import { cellFormulaEscape } from './delimited-escape';
import type { Delimiter } from './delimited-read';
import { FormatWriteError } from './errors';

export interface DelimitedWriteOptions {
  /** Default: comma. */
  delimiter?: Delimiter;
  /**
   * Default true: cells a spreadsheet would run as a formula get a leading `'` (see
   * delimited-escape.ts); our reader removes it again unless told not to (`formulaUnescape: false`).
   */
  formulaEscape?: boolean;
}

/**
 * CSV/TSV with a header: `id` (when any utterance has one), `text`, `intent` (when any has one), then
 * meta keys sorted by code unit. Empty cells read back as absent, so empty ids, intents and meta
 * values are not kept; tokens and tags are not written (read back with a tokeniser). Formula-like
 * cells are escaped for spreadsheets by default (OWASP "CSV Injection"; see delimited-escape.ts).
 */
export function delimitedWrite(utterances: readonly Utterance[], options: DelimitedWriteOptions = {}): string {
  const delimiter = options.delimiter ?? ',';
  const format = delimiter === ',' ? 'CSV' : 'TSV';
  const hasId = utterances.some((u) => u.id !== undefined);
  const hasIntent = utterances.some((u) => u.intent !== undefined);
  const metaKeys = [...new Set(utterances.flatMap((u) => Object.keys(u.meta)))].sort();
  const fixed = [...(hasId ? ['id'] : []), 'text', ...(hasIntent ? ['intent'] : [])];
  const clash = metaKeys.find((key) => fixed.includes(key) || key === '');
  const rows: string[][] = [[...fixed, ...metaKeys]];
  utterances.forEach((utterance, index) => {
    if (clash !== undefined && clash in utterance.meta) {
      throw new FormatWriteError(format, utterance, index, `meta key ${JSON.stringify(clash)} cannot be a column name here`);
    }
    if (utterance.text.trim() === '') throw new FormatWriteError(format, utterance, index, 'its text is blank');
    const row = [...(hasId ? [utterance.id ?? ''] : []), utterance.text, ...(hasIntent ? [utterance.intent ?? ''] : [])];
    for (const key of metaKeys) row.push(utterance.meta[key] ?? '');
    rows.push(row);
  });
  const cells = options.formulaEscape === false ? rows : rows.map((row) => row.map(cellFormulaEscape));
  // RFC 4180 section 2 lets the last record end without a line break; a final one keeps files line-based.
  return `${Papa.unparse(cells, { delimiter, newline: '\n', quoteChar: '"', escapeChar: '"', header: false })}\n`;
}
