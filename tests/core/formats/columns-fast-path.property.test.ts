import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { columnsRead, columnsReader } from '../../../src/core/formats';
import type { Document, Scheme } from '../../../src/core/types';

/*
 * The column reader reads common lines (`token<TAB>tag` with a known tag, blank lines) in a fast
 * path and every other line through its general line parser. Fed one character at a time, every
 * line reaches the general parser (each is completed across chunks), so the two must agree on
 * lines of every awkward shape: spaces, tabs, CR, extra columns, comments, -DOCSTART-, unknown,
 * malformed and non-ASCII tags, control characters, tokens that do or do not match `# text`.
 */
const TOKENS = ['fix', 'the', 'tap', 'día', '555-0142', '#leak', 'a\u000bb', '-DOCSTART-', 'x', ''];
const TAGS = ['O', 'B-service', 'I-service', 'E-day', 'S-day', 'B-día', 'Q-day', 'B-', 'O\r', 'I-x', 'b-day'];

/** Mostly `common`, sometimes one of the odd ones: plain lines must be frequent for the fast path to run. */
function mostly(common: string, odd: string[]): fc.Arbitrary<string> {
  return fc.oneof({ weight: 3, arbitrary: fc.constant(common) }, { weight: 1, arbitrary: fc.constantFrom(...odd) });
}

const tokenLine = fc
  .tuple(mostly('', [' ', '\t']), fc.constantFrom(...TOKENS), mostly('\t', [' ', '  ', '\t \t', '']), fc.constantFrom(...TAGS), mostly('', [' ', '\t', '\r', '\r\r', '\tVB']))
  .map((parts) => parts.join(''));

const commentLine = fc.constantFrom('# id = hr-7', '# intent = book_visit', '# text = fix the tap', '# text = fix  día 555-0142', '# note = x', '#', '# plain', '# text =', '# O', '#\tO');

const fileArbitrary = fc
  .array(fc.oneof({ weight: 6, arbitrary: tokenLine }, { weight: 2, arbitrary: commentLine }, { weight: 2, arbitrary: fc.constantFrom('', ' ', '\r') }), { minLength: 10, maxLength: 60 })
  .map((lines) => lines.join('\n'));

function charByChar(file: string, options: { scheme?: Scheme; tokenRanges?: boolean }): Document {
  const reader = columnsReader(options);
  for (const char of file) reader.push(char);
  return reader.end();
}

describe('columns reader: fast path and general line parser agree', () => {
  for (const scheme of [undefined, 'iob2', 'bioes'] as const) {
    it(`on awkward lines (scheme ${scheme ?? 'detected'})`, () => {
      const options = scheme === undefined ? {} : { scheme };
      fc.assert(
        fc.property(fileArbitrary, fc.boolean(), (file, finalNewline) => {
          const text = finalNewline ? `${file}\n` : file;
          expect(columnsRead(text, options)).toEqual(charByChar(text, options));
        }),
        { seed: 42, numRuns: 400 },
      );
    });
  }

  it('reads a tag first met in the general parser through the fast path afterwards, unchanged', () => {
    // "B-rare" is first seen on a line with trailing spaces (general parser), then on plain lines.
    const doc = columnsRead('a\tB-rare  \nb\tI-rare\n\nc\tB-rare\n');
    expect(doc.errors).toEqual([]);
    expect(doc.utterances.map((u) => u.tags)).toEqual([['B-rare', 'I-rare'], ['B-rare']]);
    expect(doc.utterances[0]?.tags[0]).toBe(doc.utterances[1]?.tags[0]);
  });
});

describe('columns reader without token ranges', () => {
  it('gives the same errors, tags, lines, ids, intents, meta and `# text`, with no tokens', () => {
    fc.assert(
      fc.property(fileArbitrary, (file) => {
        const full = columnsRead(file, { scheme: 'iob2' });
        const lean = columnsRead(file, { scheme: 'iob2', tokenRanges: false });
        expect(lean.errors).toEqual(full.errors);
        expect(lean.scheme).toBe(full.scheme);
        expect(lean.utterances).toHaveLength(full.utterances.length);
        lean.utterances.forEach((u, i) => {
          const f = full.utterances[i];
          expect(u.tokens).toEqual([]);
          expect({ ...u, tokens: [], text: '' }).toEqual({ ...f, tokens: [], text: '' });
          // A given `# text` is kept; only text joined from tokens is left out.
          if (u.text !== '') expect(u.text).toBe(f?.text);
        });
      }),
      { seed: 42, numRuns: 300 },
    );
  });
});
