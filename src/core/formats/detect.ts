import { tagParse } from '../schemes';
import { lineIsComment } from './columns-comment';

export type FormatName = 'columns' | 'jsonl' | 'text' | 'csv' | 'tsv';

const EXTENSION_FORMATS: ReadonlyMap<string, FormatName> = new Map([
  ['jsonl', 'jsonl'],
  ['ndjson', 'jsonl'],
  ['csv', 'csv'],
  ['tsv', 'tsv'],
  ['tab', 'tsv'],
  ['iob', 'columns'],
  ['iob1', 'columns'],
  ['iob2', 'columns'],
  ['bio', 'columns'],
  ['bioes', 'columns'],
  ['conll', 'columns'],
]);

const SAMPLE_LINES = 50;
/** Share of sampled token lines that must end in a tag; tolerates a few malformed lines. */
const COLUMN_LINE_SHARE = 0.8;

/** Complete, non-blank lines of the head (a cut-off last line is dropped unless it is the only one). */
function headLines(head: string): string[] {
  const lines = head.replace(/^\uFEFF/, '').split('\n');
  if (lines.length > 1 && !head.endsWith('\n')) lines.pop();
  return lines.map((l) => (l.endsWith('\r') ? l.slice(0, -1) : l)).filter((l) => l.trim() !== '');
}

function headIsJsonl(lines: readonly string[]): boolean {
  const first = lines[0];
  if (first === undefined || !first.trimStart().startsWith('{')) return false;
  try {
    const value: unknown = JSON.parse(first);
    return typeof value === 'object' && value !== null && !Array.isArray(value);
  } catch {
    return false;
  }
}

function headIsColumns(lines: readonly string[]): boolean {
  let tokenLines = 0;
  let tagged = 0;
  for (const line of lines) {
    if (lineIsComment(line, 0, line.length) || line.startsWith('-DOCSTART-')) continue;
    if (tokenLines === SAMPLE_LINES) break;
    tokenLines++;
    const fields = line.trim().split(/[ \t]+/);
    if (fields.length >= 2 && tagParse(fields[fields.length - 1] ?? '') !== null) tagged++;
  }
  return tokenLines > 0 && tagged >= tokenLines * COLUMN_LINE_SHARE;
}

/** Every sampled line has the same, non-zero number of tabs. */
function headIsTsv(lines: readonly string[]): boolean {
  const sample = lines.slice(0, SAMPLE_LINES);
  if (sample.length < 2) return false;
  const tabs = (line: string) => line.split('\t').length - 1;
  const first = tabs(sample[0] ?? '');
  return first > 0 && sample.every((line) => tabs(line) === first);
}

/**
 * Guess a file's format from its name and first bytes (`head`, decoded; a cut-off last line is fine).
 * 1. `.jsonl`/`.ndjson` → jsonl, `.csv` → csv, `.tsv`/`.tab` → tsv, and `.iob`, `.iob1`, `.iob2`,
 *    `.bio`, `.bioes`, `.conll` → columns: the extension decides.
 * 2. Otherwise (`.txt`, `.json`, anything else) the content decides: a first line holding a JSON
 *    object → jsonl; lines of `token … tag` (at least 80% of the first 50 token lines end in a valid
 *    tag, comments and -DOCSTART- aside) → columns; for names other than `.txt`, lines with one and
 *    the same number of tabs → tsv; anything else → text. CSV is never guessed from content alone:
 *    ordinary sentences hold commas too.
 */
export function formatDetect(fileName: string, head: string): FormatName {
  const dot = fileName.lastIndexOf('.');
  const slash = Math.max(fileName.lastIndexOf('/'), fileName.lastIndexOf('\\'));
  const extension = dot > slash ? fileName.slice(dot + 1).toLowerCase() : '';
  const byName = EXTENSION_FORMATS.get(extension);
  if (byName !== undefined) return byName;
  const lines = headLines(head);
  if (headIsJsonl(lines)) return 'jsonl';
  if (headIsColumns(lines)) return 'columns';
  if (extension !== 'txt' && headIsTsv(lines)) return 'tsv';
  return 'text';
}
