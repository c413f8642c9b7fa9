import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { columnsRead, columnsWrite, formatDetect, jsonlWrite, textWrite } from '../../../src/core/formats';
import { schemeDetect, tagsConvert } from '../../../src/core/schemes';
import type { Scheme } from '../../../src/core/types';
import { corpusArbitrary, plainUtteranceArbitrary } from '../../generators/formats';

const COLUMNS = '# id = hr-1\n# text = fix the tap\nfix\tO\nthe\tO\ntap\tB-problem\n';

describe('formatDetect', () => {
  it('trusts the extension for jsonl, csv, tsv and column-file names, case-insensitively', () => {
    expect(formatDetect('a/b.jsonl', 'anything')).toBe('jsonl');
    expect(formatDetect('b.NDJSON', '')).toBe('jsonl');
    expect(formatDetect('b.csv', 'a\tb\n')).toBe('csv');
    expect(formatDetect('b.tsv', 'a,b\n')).toBe('tsv');
    for (const ext of ['iob', 'iob2', 'bio', 'bioes', 'conll', 'IOB1']) expect(formatDetect(`x.${ext}`, 'plain words')).toBe('columns');
  });

  it('reads the content for .txt and unknown names', () => {
    expect(formatDetect('notes.txt', COLUMNS)).toBe('columns');
    expect(formatDetect('notes.txt', 'fix the tap\nbook a plumber\n')).toBe('text');
    expect(formatDetect('data', '{"text":"fix the tap"}\n{"text":"x"')).toBe('jsonl');
    expect(formatDetect('data.json', '  {"text": "a"}\n')).toBe('jsonl');
    expect(formatDetect('data', 'id\ttext\n1\tfix the tap\n2\tbook now\n')).toBe('tsv');
    expect(formatDetect('data.txt', 'id\ttext\n1\tfix the tap\n2\tbook now\n')).toBe('text');
    expect(formatDetect('', '')).toBe('text');
    expect(formatDetect('dir.v2/file', 'fix the tap\n')).toBe('text');
    expect(formatDetect('constructor', 'fix\n')).toBe('text');
  });

  it('tolerates a few malformed lines and a cut-off last line in column files', () => {
    const head = `${COLUMNS}\n-DOCSTART- O\nbroken\ncall\tO\n555-0142\tB-contact_phone\nnow\tO\nplease\tO\nfix\tO\nit\tB-`;
    expect(formatDetect('upload.txt', head)).toBe('columns');
  });

  it('recognises what the writers produce', () => {
    fc.assert(
      fc.property(corpusArbitrary('iob2'), fc.array(plainUtteranceArbitrary({ ids: false, meta: false, lineBreaks: false }), { minLength: 1, maxLength: 5 }), (labelled, plain) => {
        expect(formatDetect('upload.txt', columnsWrite(labelled))).toBe('columns');
        expect(formatDetect('upload', jsonlWrite(labelled))).toBe('jsonl');
        const text = textWrite(plain);
        // A line of plain text ending in a tag-shaped word (O, B-day) is the one thing that can look like columns.
        const tagShaped = plain.every((u) => /(^|\s)(O|[BIES]-\S+)\s*$/u.test(u.text) && /\S\s+\S/u.test(u.text));
        if (!tagShaped) expect(formatDetect('upload.txt', text)).toBe('text');
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});

describe('scheme detection while reading agrees with schemeDetect', () => {
  it('on files written in each scheme, legal or not', () => {
    const tags = fc.array(fc.array(fc.constantFrom('O', 'B-day', 'I-day', 'B-area', 'I-area', 'E-day', 'S-area'), { minLength: 1, maxLength: 6 }), {
      minLength: 1,
      maxLength: 5,
    });
    fc.assert(
      fc.property(tags, (sequences) => {
        const file = sequences.map((seq) => seq.map((tag, i) => `w${i}\t${tag}`).join('\n')).join('\n\n');
        expect(columnsRead(file).scheme).toBe(schemeDetect(sequences));
      }),
      { seed: 42, numRuns: 500 },
    );
  });

  it('on legal files of every scheme', () => {
    const schemes: Scheme[] = ['iob1', 'iob2', 'bioes'];
    fc.assert(
      fc.property(corpusArbitrary('iob2'), fc.constantFrom(...schemes), (utterances, scheme) => {
        const converted = utterances.map((u) => ({ ...u, tags: tagsConvert(u.tags, scheme) }));
        expect(columnsRead(columnsWrite(converted)).scheme).toBe(schemeDetect(converted.map((u) => u.tags)));
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});
