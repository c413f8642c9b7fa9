/**
 * Fuzz properties shared by the fixed-seed tests (`npm test`) and the long run (`npm run fuzz`).
 * A property throws on failure; fast-check shrinks the input and reports its seed and path.
 */
import fc from 'fast-check';
import { isDeepStrictEqual } from 'node:util';
import { backupDecode, backupEncode, backupReader, type BackupDecodeResult } from '../../src/core/backup';
import { layersRead, packRead, type ExchangeRead } from '../../src/core/exchange';
import {
  columnsReader,
  columnsWrite,
  delimitedReader,
  delimitedWrite,
  jsonlReader,
  jsonlWrite,
  textReader,
  textWrite,
  type DocumentReader,
} from '../../src/core/formats';
import type { Document, ReadError, Utterance } from '../../src/core/types';
import { backupDataArbitrary } from '../core/backup/arbitraries';
import { corpusArbitrary, plainUtteranceArbitrary, utteranceCore } from '../generators/formats';
import { chunksAt, cutFractionsArbitrary, fuzzInputArbitrary, lineCount, type FuzzInput } from './inputs';

const strictUtf8 = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });

export interface FuzzRun {
  seed: number;
  numRuns: number;
  /** A failure's replay path, printed by fast-check. */
  path?: string;
}

export interface FuzzProperty {
  name: string;
  /** Throws (or rejects) with fast-check's report on the first failing input. */
  run: (params: FuzzRun) => void | Promise<void>;
}

function sync<T extends unknown[]>(name: string, property: fc.IProperty<T>): FuzzProperty {
  return { name, run: (params) => fc.assert(property, params) };
}

function async<T extends unknown[]>(name: string, property: fc.IAsyncProperty<T>): FuzzProperty {
  return { name, run: (params) => fc.assert(property, params) };
}

export interface ReaderTarget {
  name: string;
  reader: () => DocumentReader;
  /** Files this reader reads without error, to mutate. */
  valid: fc.Arbitrary<string>;
}

const plainCorpus = fc.array(plainUtteranceArbitrary({ ids: true, meta: true, lineBreaks: false }), { minLength: 1, maxLength: 6 });
// The whitespace tokeniser: word segmentation is fuzzed elsewhere, and on huge many-token lines it
// costs more than all the rest of a case (V8's Intl.Segmenter steps slow down as lines grow).
const csvColumns = { column: 'text', idColumn: 'id', intentColumn: 'intent', tokeniser: { kind: 'whitespace' } } as const;

export const READER_TARGETS: readonly ReaderTarget[] = [
  { name: 'columns', reader: () => columnsReader(), valid: fc.oneof(corpusArbitrary('iob2'), corpusArbitrary('bioes'), corpusArbitrary('iob1')).map(columnsWrite) },
  { name: 'columns (iob2, no token ranges)', reader: () => columnsReader({ scheme: 'iob2', tokenRanges: false }), valid: corpusArbitrary('iob2').map(columnsWrite) },
  { name: 'jsonl', reader: () => jsonlReader(), valid: corpusArbitrary('iob2').map(jsonlWrite) },
  { name: 'text', reader: () => textReader({ tokeniser: { kind: 'whitespace' } }), valid: plainCorpus.map(textWrite) },
  { name: 'csv', reader: () => delimitedReader(csvColumns), valid: plainCorpus.map((c) => delimitedWrite(c)) },
  { name: 'tsv', reader: () => delimitedReader({ ...csvColumns, delimiter: '\t' }), valid: plainCorpus.map((c) => delimitedWrite(c, { delimiter: '\t' })) },
  { name: 'tsv by index, no header', reader: () => delimitedReader({ column: 1, idColumn: 0, header: false, tokeniser: { kind: 'whitespace' } }), valid: plainCorpus.map((c) => delimitedWrite(c, { delimiter: '\t' })) },
];

function fail(message: string): never {
  throw new Error(message);
}

export function errorsCheck(errors: readonly ReadError[], lines: number, where: string): void {
  for (const e of errors) {
    if (!Number.isInteger(e.line) || e.line < 1 || e.line > lines) fail(`${where}: error line ${e.line} outside 1..${lines}: ${e.message}`);
    if (typeof e.message !== 'string' || e.message === '') fail(`${where}: error without a message on line ${e.line}`);
  }
}

/** Errors on known lines, and every utterance self-consistent (tokens inside the text, one tag each). */
export function documentCheck(doc: Document, lines: number, where: string): void {
  errorsCheck(doc.errors, lines, where);
  for (const u of doc.utterances) {
    if (u.line !== undefined && (u.line < 1 || u.line > lines)) fail(`${where}: utterance line ${u.line} outside 1..${lines}`);
    if (u.tokens.length > 0 && u.tokens.length !== u.tags.length) fail(`${where}: ${u.tokens.length} tokens but ${u.tags.length} tags`);
    let previous = 0;
    for (const t of u.tokens) {
      if (!(t.start >= previous && t.start < t.end && t.end <= u.text.length)) fail(`${where}: token [${t.start}, ${t.end}) misplaced in a text of ${u.text.length}`);
      previous = t.end;
    }
  }
}

function readAll(make: () => DocumentReader, chunks: readonly (string | Uint8Array)[]): Document {
  const reader = make();
  for (const chunk of chunks) reader.push(chunk);
  return reader.end();
}

function sameDocument(a: Document, b: Document, where: string): void {
  if (!isDeepStrictEqual(a, b)) fail(`${where}: chunked read differs from the one-shot read`);
}

/** Bytes and text, whole and in chunks: no throw, lines in range, chunking changes nothing. */
export function readerFuzzCheck(target: ReaderTarget, input: FuzzInput, cuts: readonly number[]): void {
  const byteLines = lineCount(input.bytes, false);
  const textLines = lineCount(input.text, false);
  const bytesWhole = readAll(target.reader, [input.bytes]);
  documentCheck(bytesWhole, byteLines, `${target.name} bytes`);
  sameDocument(readAll(target.reader, chunksAt(input.bytes, cuts)), bytesWhole, `${target.name} bytes`);
  const textWhole = readAll(target.reader, [input.text]);
  documentCheck(textWhole, textLines, `${target.name} text`);
  sameDocument(readAll(target.reader, chunksAt(input.text, cuts)), textWhole, `${target.name} text`);
  // Well-formed UTF-8 reads the same as bytes and as the string it decodes to.
  let decoded: string | null;
  try {
    decoded = strictUtf8.decode(input.bytes);
  } catch {
    decoded = null;
  }
  if (decoded !== null && decoded === input.text && !isDeepStrictEqual(bytesWhole, textWhole)) fail(`${target.name}: bytes and text read differently`);
}

export function readerFuzzProperty(target: ReaderTarget): FuzzProperty {
  return sync(
    `${target.name}: mutated and random input`,
    fc.property(fuzzInputArbitrary(target.valid), cutFractionsArbitrary, (input, cuts) => readerFuzzCheck(target, input, cuts)),
  );
}

/** Every generated utterance must come out, in order, whatever garbage sits between them. */
function subsequenceCheck(read: readonly Utterance[], wanted: readonly Utterance[], where: string): void {
  let k = 0;
  for (const u of read) {
    if (k < wanted.length && isDeepStrictEqual(utteranceCore(u), wanted[k])) k++;
  }
  if (k < wanted.length) fail(`${where}: good utterance ${k + 1} of ${wanted.length} was lost next to bad input`);
}

const garbageLine = fuzzInputArbitrary(fc.constantFrom('fix\tO', '{"text": "fix"}', 'fix tap', '"fix",1')).map((i) =>
  i.text.replace(/[\r\n\u2028\u2029\u0085]/g, ' '),
);

/** Good utterances with garbage blocks (columns) or lines (JSON Lines) between them. */
export function neighbourProperties(): FuzzProperty[] {
  const columns = fc.property(corpusArbitrary('iob2'), fc.array(fc.tuple(fc.nat(8), fc.array(garbageLine, { minLength: 1, maxLength: 3 })), { maxLength: 3 }), (utterances, garbage) => {
    const blocks = utterances.map((u) => columnsWrite([u]).trimEnd());
    for (const [k, lines] of garbage) {
      const block = lines.filter((l) => l.trim() !== '').join('\n');
      if (block !== '') blocks.splice(Math.min(k, blocks.length), 0, block);
    }
    const text = `${blocks.join('\n\n')}\n`;
    const doc = readAll(() => columnsReader({ scheme: 'iob2' }), [text]);
    documentCheck(doc, lineCount(text, false), 'columns neighbours');
    subsequenceCheck(doc.utterances, utterances, 'columns neighbours');
  });
  const jsonl = fc.property(corpusArbitrary('iob2'), fc.array(fc.tuple(fc.nat(8), garbageLine), { maxLength: 4 }), (utterances, garbage) => {
    const lines = utterances.map((u) => jsonlWrite([u]).trimEnd());
    for (const [k, line] of garbage) lines.splice(Math.min(k, lines.length), 0, line);
    const text = `${lines.join('\n')}\n`;
    const doc = readAll(() => jsonlReader(), [text]);
    documentCheck(doc, lineCount(text, false), 'jsonl neighbours');
    subsequenceCheck(doc.utterances, utterances, 'jsonl neighbours');
  });
  // CSV rows of well-quoted random cells (any count) among good rows: a short or long row must not take its neighbours.
  const csv = fc.property(plainCorpus, fc.array(fc.tuple(fc.nat(8), fc.array(fc.string({ unit: 'binary', maxLength: 8 }), { maxLength: 5 })), { maxLength: 3 }), (utterances, garbage) => {
    const rows = delimitedWrite(utterances).slice(0, -1).split('\n');
    const header = rows.shift() ?? '';
    for (const [k, cells] of garbage) {
      const row = cells.map((c) => `"${c.replace(/[\r\n]/g, ' ').replaceAll('"', '""')}"`).join(',');
      rows.splice(Math.min(k, rows.length), 0, row);
    }
    const text = `${[header, ...rows].join('\n')}\n`;
    const doc = readAll(
      () =>
        delimitedReader({
          column: 'text',
          tokeniser: { kind: 'whitespace' },
          ...(utterances.some((u) => u.id !== undefined) ? { idColumn: 'id' } : {}),
          ...(utterances.some((u) => u.intent !== undefined) ? { intentColumn: 'intent' } : {}),
        }),
      [text],
    );
    documentCheck(doc, lineCount(text, false), 'csv neighbours');
    subsequenceCheck(doc.utterances, utterances, 'csv neighbours');
  });
  return [
    sync('columns: good utterances survive garbage blocks', columns),
    sync('jsonl: good records survive garbage lines', jsonl),
    sync('csv: good rows survive odd rows', csv),
  ];
}

function backupResultCheck(result: BackupDecodeResult, lines: number, where: string): void {
  errorsCheck(result.ok ? result.warnings : result.errors, lines, where);
}

export function backupFuzzProperty(): FuzzProperty {
  const valid = backupDataArbitrary.map((data) => backupEncode(data, '2026-12-02T03:00:00.000Z'));
  const property = fc.property(fuzzInputArbitrary(valid), cutFractionsArbitrary, (input, cuts) => {
    const lines = lineCount(input.text, false);
    const whole = backupDecode(input.text);
    backupResultCheck(whole, lines, 'backup');
    const reader = backupReader();
    for (const chunk of chunksAt(input.text, cuts)) reader.push(chunk);
    if (!isDeepStrictEqual(reader.end(), whole)) fail('backup: chunked read differs from the one-shot read');
  });
  return sync('backup: mutated and random input', property);
}

function exchangeCheck<T>(result: ExchangeRead<T>, lines: number, where: string): void {
  errorsCheck(result.ok ? result.warnings : result.errors, lines, where);
}

/** Pack and layer files; `packs` and `layers` are valid files made up front (their writers are async). */
export function exchangeFuzzProperties(packs: readonly string[], layers: readonly string[]): FuzzProperty[] {
  const pack = fc.asyncProperty(fuzzInputArbitrary(fc.constantFrom(...packs)), async (input) => {
    exchangeCheck(await packRead(input.text), lineCount(input.text, false), 'pack');
  });
  const layer = fc.asyncProperty(fuzzInputArbitrary(fc.constantFrom(...layers)), async (input) => {
    exchangeCheck(await layersRead(input.text), lineCount(input.text, false), 'layers');
  });
  return [async('pack: mutated and random input', pack), async('layers: mutated and random input', layer)];
}
