import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { columnsRead, columnsWrite, delimitedRead, jsonlRead, jsonlWrite, textRead, textWrite } from '../../../src/core/formats';
import type { Utterance } from '../../../src/core/types';
import { corpusArbitrary, plainUtteranceArbitrary, utteranceCore } from '../../generators/formats';

const RUNS = { seed: 42, numRuns: 150 };
const encoder = new TextEncoder();

interface BadBlock {
  lines: string[];
  /** Index in `lines` of the line the error must name. */
  at: number;
  message: RegExp;
}

const COLUMN_BLOCKS: BadBlock[] = [
  { lines: ['fix'], at: 0, message: /missing tag column/ },
  { lines: ['# id = bad', 'fix\tO', 'tap\tQ-day'], at: 2, message: /"Q-day" is not a valid tag/ },
  { lines: ['leak\tB-'], at: 0, message: /"B-" is not a valid tag/ },
  { lines: ['# text = fix tap', 'fix\tO', 'sink\tO'], at: 2, message: /token\/text mismatch: token "sink"/ },
  { lines: ['fix\tO', '# id = late', 'tap\tO'], at: 1, message: /comment line inside an utterance/ },
  { lines: ['fix\tB-day', 'tap\tE-day'], at: 1, message: /"E-day" is not in the IOB2 scheme/ },
];

/** Insert `item` at position `k` (clamped) of a copy of `list`. */
function inserted<T>(list: readonly T[], k: number, item: T): T[] {
  const out = [...list];
  out.splice(Math.min(k, out.length), 0, item);
  return out;
}

describe('malformed input: the right line, a clear message, every other utterance kept', () => {
  it('columns: one bad utterance among good ones', () => {
    fc.assert(
      fc.property(corpusArbitrary('iob2'), fc.nat(8), fc.constantFrom(...COLUMN_BLOCKS), (utterances, k, bad) => {
        const blocks = inserted(
          utterances.map((u) => columnsWrite([u]).trimEnd().split('\n')),
          k,
          bad.lines,
        );
        const position = Math.min(k, utterances.length);
        const line = blocks.slice(0, position).reduce((n, b) => n + b.length + 1, 0) + bad.at + 1;
        const doc = columnsRead(`${blocks.map((b) => b.join('\n')).join('\n\n')}\n`, { scheme: 'iob2' });
        expect(doc.errors).toEqual([{ line, message: expect.stringMatching(bad.message) }]);
        expect(doc.utterances.map(utteranceCore)).toEqual(utterances);
      }),
      RUNS,
    );
  });

  it('JSON Lines: one bad record among good ones', () => {
    const badRecords: [string, RegExp][] = [
      ['{"text": "fix", ', /^invalid JSON/],
      ['{"id": "x"}', /missing "text"/],
      ['{"text": "fix", "tokens": [{"start": 0, "end": 9}]}', /out of range/],
      ['{"text": "fix tap", "tokens": [{"start": 0, "end": 3}], "spans": [{"start": 0, "end": 7, "label": "problem"}]}', /not on token boundaries/],
      ['{"text": "fix", "spans": [{"start": 0, "end": 3, "label": ""}]}', /label/],
    ];
    fc.assert(
      fc.property(corpusArbitrary('iob2'), fc.nat(8), fc.constantFrom(...badRecords), (utterances, k, [bad, message]) => {
        const lines = inserted(jsonlWrite(utterances).trimEnd().split('\n'), k, bad);
        const doc = jsonlRead(`${lines.join('\n')}\n`);
        expect(doc.errors).toEqual([{ line: Math.min(k, utterances.length) + 1, message: expect.stringMatching(message) }]);
        expect(doc.utterances.map(utteranceCore)).toEqual(utterances);
      }),
      RUNS,
    );
  });

  it('plain text: one undecodable line among good ones', () => {
    const plain = fc.array(plainUtteranceArbitrary({ ids: false, meta: false, lineBreaks: false }), { minLength: 1, maxLength: 8 });
    fc.assert(
      fc.property(plain, fc.nat(8), (utterances, k) => {
        const lines = textWrite(utterances).slice(0, -1).split('\n').map((l) => encoder.encode(l));
        const all = inserted(lines, k, new Uint8Array([0x66, 0x69, 0x78, 0xc0, 0xaf]));
        const bytes = new Uint8Array(all.flatMap((l) => [...l, 10]));
        const doc = textRead(bytes, { tokeniser: { kind: 'whitespace' } });
        expect(doc.errors).toEqual([{ line: Math.min(k, utterances.length) + 1, message: expect.stringMatching(/not valid UTF-8/) }]);
        expect(doc.utterances.map(utteranceCore)).toEqual(utterances);
      }),
      RUNS,
    );
  });

  it('CSV: one ragged or empty row among rows whose quoted texts span lines', () => {
    // Quoting by hand, every field, per RFC 4180 section 2 rules 5-7, so the test does not lean on the writer.
    const quote = (field: string) => `"${field.replaceAll('"', '""')}"`;
    const badRows: [string, RegExp][] = [
      ['"x","fix","extra"', /ragged row: 3 fields where the header \(line 1\) has 2/],
      ['"x"', /ragged row: 1 fields/],
      ['"x","  "', /empty text in column "text"/],
    ];
    const plain = fc.array(plainUtteranceArbitrary({ ids: false, meta: false, lineBreaks: true }), { minLength: 1, maxLength: 8 });
    fc.assert(
      fc.property(plain, fc.nat(8), fc.constantFrom(...badRows), (utterances, k, [bad, message]) => {
        const rows = utterances.map((u, i) => `${quote(`id-${i}`)},${quote(u.text)}`);
        const position = Math.min(k, rows.length);
        const all = inserted(rows, k, bad);
        const line = 2 + rows.slice(0, position).reduce((n, row) => n + row.split('\n').length, 0);
        const doc = delimitedRead(`"id","text"\n${all.join('\n')}\n`, { column: 'text', idColumn: 'id', tokeniser: { kind: 'whitespace' } });
        expect(doc.errors).toEqual([{ line, message: expect.stringMatching(message) }]);
        expect(doc.utterances.map((u) => u.text)).toEqual(utterances.map((u: Utterance) => u.text));
      }),
      RUNS,
    );
  });
});
