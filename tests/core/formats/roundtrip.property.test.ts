import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  columnsRead,
  columnsWrite,
  delimitedRead,
  delimitedWrite,
  jsonlRead,
  jsonlWrite,
  textRead,
  textWrite,
} from '../../../src/core/formats';
import { tagsConvert } from '../../../src/core/schemes';
import type { Scheme, Utterance } from '../../../src/core/types';
import { corpusArbitrary, plainUtteranceArbitrary, utteranceCore } from '../../generators/formats';

const RUNS = { seed: 42, numRuns: 200 };
const SCHEMES: Scheme[] = ['iob1', 'iob2', 'bioes'];

function cores(utterances: readonly Utterance[]): Utterance[] {
  return utterances.map(utteranceCore);
}

describe('round trips through every format (emoji, combining marks, RTL, CJK)', () => {
  for (const scheme of SCHEMES) {
    it(`columns (${scheme}): write → read gives the same utterances; read canonical → write is byte-identical`, () => {
      fc.assert(
        fc.property(corpusArbitrary(scheme), (utterances) => {
          const written = columnsWrite(utterances);
          const doc = columnsRead(written, { scheme });
          expect(doc.errors).toEqual([]);
          expect(cores(doc.utterances)).toEqual(utterances);
          expect(columnsWrite(doc.utterances)).toBe(written);
        }),
        RUNS,
      );
    });

    it(`JSON Lines (${scheme}): write → read gives the same utterances; read canonical → write is byte-identical`, () => {
      fc.assert(
        fc.property(corpusArbitrary(scheme), (utterances) => {
          const written = jsonlWrite(utterances);
          const doc = jsonlRead(written, { scheme });
          expect(doc.errors).toEqual([]);
          expect(cores(doc.utterances)).toEqual(utterances);
          expect(jsonlWrite(doc.utterances)).toBe(written);
        }),
        RUNS,
      );
    });
  }

  it('columns: every token sits on the file line the reader reports', () => {
    fc.assert(
      fc.property(corpusArbitrary('iob2'), (utterances) => {
        const written = columnsWrite(utterances);
        const lines = written.split('\n');
        for (const u of columnsRead(written).utterances) {
          expect(lines[(u.line ?? 0) - 1]).toMatch(/^# /);
          u.tokens.forEach((t, i) => {
            expect(lines[(u.tokenLines?.[i] ?? 0) - 1]).toBe(`${u.text.slice(t.start, t.end)}\t${u.tags[i]}`);
          });
        }
      }),
      RUNS,
    );
  });

  it('plain text: write → read with the whitespace tokeniser gives the same texts and tokens, all tags O', () => {
    const plain = fc.array(plainUtteranceArbitrary({ ids: false, meta: false, lineBreaks: false }), { minLength: 1, maxLength: 8 });
    fc.assert(
      fc.property(plain, (utterances) => {
        const written = textWrite(utterances);
        const doc = textRead(written, { tokeniser: { kind: 'whitespace' } });
        expect(doc.errors).toEqual([]);
        expect(cores(doc.utterances)).toEqual(utterances);
        expect(doc.utterances.map((u) => u.line)).toEqual(utterances.map((_, i) => i + 1));
        expect(textWrite(doc.utterances)).toBe(written);
      }),
      RUNS,
    );
  });

  for (const delimiter of [',', '\t'] as const) {
    it(`${delimiter === ',' ? 'CSV' : 'TSV'}: write → read keeps texts (quoted line breaks too), ids, intents and meta`, () => {
      const plain = fc.array(plainUtteranceArbitrary({ ids: true, meta: true, lineBreaks: true }), { minLength: 1, maxLength: 8 });
      fc.assert(
        fc.property(plain, (utterances) => {
          const written = delimitedWrite(utterances, { delimiter });
          const doc = delimitedRead(written, {
            column: 'text',
            tokeniser: { kind: 'whitespace' },
            ...(utterances.some((u) => u.id !== undefined) ? { idColumn: 'id' } : {}),
            ...(utterances.some((u) => u.intent !== undefined) ? { intentColumn: 'intent' } : {}),
          });
          expect(doc.errors).toEqual([]);
          expect(cores(doc.utterances)).toEqual(utterances);
          expect(delimitedWrite(doc.utterances, { delimiter })).toBe(written);
        }),
        RUNS,
      );
    });
  }
});

describe('scheme and format conversions of canonical files are byte-identical', () => {
  it('IOB2 → BIOES → IOB2, ids, intents and meta comments kept', () => {
    fc.assert(
      fc.property(corpusArbitrary('iob2'), (utterances) => {
        const iob2 = columnsWrite(utterances);
        const read = columnsRead(iob2);
        const bioes = columnsWrite(read.utterances.map((u) => ({ ...u, tags: tagsConvert(u.tags, 'bioes') })));
        const back = columnsRead(bioes, { scheme: 'bioes' });
        expect(back.errors).toEqual([]);
        expect(columnsWrite(back.utterances.map((u) => ({ ...u, tags: tagsConvert(u.tags, 'iob2') })))).toBe(iob2);
      }),
      RUNS,
    );
  });

  it('IOB2 → JSON Lines → IOB2', () => {
    fc.assert(
      fc.property(corpusArbitrary('iob2'), (utterances) => {
        const iob2 = columnsWrite(utterances);
        const jsonl = jsonlWrite(columnsRead(iob2, { scheme: 'iob2' }).utterances);
        const back = jsonlRead(jsonl, { scheme: 'iob2' });
        expect(back.errors).toEqual([]);
        expect(columnsWrite(back.utterances)).toBe(iob2);
      }),
      RUNS,
    );
  });
});
