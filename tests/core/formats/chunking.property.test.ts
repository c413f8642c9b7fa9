import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
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
} from '../../../src/core/formats';
import type { Document, Utterance } from '../../../src/core/types';
import { chunksCut, corpusArbitrary, cutsArbitrary, plainUtteranceArbitrary } from '../../generators/formats';

const RUNS = { seed: 42, numRuns: 150 };
const encoder = new TextEncoder();

interface FormatCase {
  name: string;
  reader: () => DocumentReader;
  corpus: fc.Arbitrary<string>;
  /** Lines that are wrong in this format, spliced in to check errors survive chunking too. */
  badLines: string[];
}

const plainCorpus = (lineBreaks: boolean) =>
  fc.array(plainUtteranceArbitrary({ ids: lineBreaks, meta: lineBreaks, lineBreaks }), { minLength: 1, maxLength: 6 });

const CASES: FormatCase[] = [
  {
    name: 'columns',
    reader: () => columnsReader(),
    corpus: corpusArbitrary('bioes').map(columnsWrite),
    badLines: ['fix', 'tap\tQ-day', '# note = inside', '', '-DOCSTART- O'],
  },
  {
    name: 'JSON Lines',
    reader: () => jsonlReader({ tokeniser: { kind: 'whitespace' } }),
    corpus: corpusArbitrary('iob2').map(jsonlWrite),
    badLines: ['{"text": 5}', '{broken', '{"text":"a b","tokens":[{"start":0,"end":9}]}', '{"text":"tap now"}', ''],
  },
  {
    name: 'plain text',
    reader: () => textReader({ tokeniser: { kind: 'whitespace' } }),
    corpus: plainCorpus(false).map(textWrite),
    badLines: ['', '   ', 'fix the sink'],
  },
  {
    name: 'CSV',
    reader: () => delimitedReader({ column: 'text', tokeniser: { kind: 'whitespace' } }),
    corpus: plainCorpus(true).map((u: Utterance[]) => delimitedWrite(u)),
    badLines: ['"unterminated', 'a"b,c', ',,,,,,', 'only one field', ''],
  },
];

/** Splice `bad` in as a whole line before line `at` (clamped). */
function lineSplice(file: string, at: number, bad: string): string {
  const lines = file.split('\n');
  lines.splice(Math.min(at, lines.length - 1), 0, bad);
  return lines.join('\n');
}

function readChunks(reader: DocumentReader, chunks: readonly (string | Uint8Array)[]): Document {
  for (const chunk of chunks) reader.push(chunk);
  return reader.end();
}

function inputArbitrary(c: FormatCase): fc.Arbitrary<string> {
  return fc
    .tuple(c.corpus, fc.option(fc.tuple(fc.nat(40), fc.constantFrom(...c.badLines)), { nil: null }))
    .map(([file, bad]) => (bad === null ? file : lineSplice(file, bad[0], bad[1])));
}

describe.each(CASES)('$name reader: chunking, CRLF, BOM and bytes give the same document', (c) => {
  it('random text chunks', () => {
    fc.assert(
      fc.property(inputArbitrary(c).chain((file) => fc.tuple(fc.constant(file), cutsArbitrary(file.length))), ([file, cuts]) => {
        const whole = readChunks(c.reader(), [file]);
        expect(readChunks(c.reader(), chunksCut(file, cuts))).toEqual(whole);
      }),
      RUNS,
    );
  });

  it('CRLF line ends, a BOM, and both, split anywhere (CR and LF in different chunks included)', () => {
    fc.assert(
      fc.property(inputArbitrary(c).chain((file) => fc.tuple(fc.constant(file), cutsArbitrary(file.length * 2))), ([file, cuts]) => {
        const whole = readChunks(c.reader(), [file]);
        const crlf = file.replaceAll('\n', '\r\n');
        expect(readChunks(c.reader(), [crlf])).toEqual(whole);
        expect(readChunks(c.reader(), [`\uFEFF${file}`])).toEqual(whole);
        expect(readChunks(c.reader(), chunksCut(`\uFEFF${crlf}`, cuts.filter((x) => x <= crlf.length)))).toEqual(whole);
      }),
      RUNS,
    );
  });

  it('UTF-8 bytes, with BOM bytes, cut at any byte (inside multi-byte characters too)', () => {
    fc.assert(
      fc.property(inputArbitrary(c).chain((file) => fc.tuple(fc.constant(file), cutsArbitrary(encoder.encode(file).length))), ([file, cuts]) => {
        const whole = readChunks(c.reader(), [file]);
        const bytes = encoder.encode(file);
        expect(readChunks(c.reader(), [bytes])).toEqual(whole);
        expect(readChunks(c.reader(), chunksCut(bytes, cuts))).toEqual(whole);
        const withBom = new Uint8Array([0xef, 0xbb, 0xbf, ...encoder.encode(file.replaceAll('\n', '\r\n'))]);
        expect(readChunks(c.reader(), [withBom])).toEqual(whole);
      }),
      RUNS,
    );
  });

  it('an invalid byte anywhere gives the same document whole or in byte chunks', () => {
    const arbitrary = inputArbitrary(c).chain((file) => {
      const length = encoder.encode(file).length;
      return fc.tuple(fc.constant(file), fc.nat(length), fc.constantFrom(0xff, 0xc3, 0x80, 0xed), cutsArbitrary(length + 1));
    });
    fc.assert(
      fc.property(arbitrary, ([file, at, byte, cuts]) => {
        const clean = encoder.encode(file);
        const bytes = new Uint8Array([...clean.subarray(0, at), byte, ...clean.subarray(at)]);
        const whole = readChunks(c.reader(), [bytes]);
        expect(readChunks(c.reader(), chunksCut(bytes, cuts))).toEqual(whole);
        // The broken line is reported (unless the byte landed where a reader skips the line anyway).
        const line = clean.subarray(0, at).filter((b) => b === 10).length + 1;
        const reported = whole.errors.some((e) => e.line === line && /UTF-8/.test(e.message));
        const lineText = file.split('\n')[line - 1] ?? '';
        if (!reported) expect(c.name === 'columns' && /^-DOCSTART-/.test(lineText)).toBe(true);
      }),
      RUNS,
    );
  });
});

describe('chunk boundaries, worked examples', () => {
  it('a CR and LF in separate chunks end one line, not two', () => {
    const reader = columnsReader();
    for (const chunk of ['fix\tO\r', '\ntap\tB-problem\r', '\n\r', '\nok\tO']) reader.push(chunk);
    const doc = reader.end();
    expect(doc.errors).toEqual([]);
    expect(doc.utterances.map((u) => [u.text, u.line, u.tokenLines])).toEqual([
      ['fix tap', 1, [1, 2]],
      ['ok', 4, [4]],
    ]);
  });

  it('a four-byte character split over three chunks decodes once', () => {
    const bytes = encoder.encode('🔧\tB-service\n');
    const reader = textReader();
    const doc = readChunks(reader, [bytes.subarray(0, 1), bytes.subarray(1, 3), bytes.subarray(3)]);
    expect(doc.utterances[0]?.text).toBe('🔧\tB-service');
  });

  it('a stream is all text or all bytes', () => {
    const reader = textReader();
    reader.push('a');
    expect(() => reader.push(new Uint8Array([98]))).toThrow(TypeError);
  });
});
