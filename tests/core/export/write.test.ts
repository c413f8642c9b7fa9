import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type ExportChunk, exportChunks, exportWrite, EXPORT_FORMATS, EXPORT_PRIVACY_CAUTION } from '../../../src/core/export';
import { columnsRead, columnsWrite, FormatWriteError, jsonlRead, jsonlWrite } from '../../../src/core/formats';
import { tagsConvert } from '../../../src/core/schemes';
import type { Utterance } from '../../../src/core/types';
import { corpusArbitrary } from '../../generators/formats';
import { itemMake } from './items';

function joinedByPart(chunks: Iterable<ExportChunk>): Map<string, string> {
  const out = new Map<string, string>();
  for (const c of chunks) out.set(c.part, (out.get(c.part) ?? '') + c.text);
  return out;
}

const splitArb = fc.option(
  fc.record({ ratios: fc.constantFrom({ train: 0.8, dev: 0.1, test: 0.1 }, { train: 0.5, dev: 0.5, test: 0 }), seed: fc.nat() }),
  { nil: undefined },
);

describe('exportChunks', () => {
  it('joined per part, equals the one-shot export, whatever the chunk size (property)', () => {
    fc.assert(
      fc.property(
        corpusArbitrary('iob2', 14),
        fc.constantFrom(...EXPORT_FORMATS),
        fc.subarray(['digits', 'email'] as const),
        splitArb,
        fc.integer({ min: 1, max: 5 }),
        (utterances, format, mask, split, size) => {
          const options = { format, mask, ...(split !== undefined && { split }) };
          const files = exportWrite({ utterances }, options);
          const chunks = [...exportChunks({ utterances }, options, size)];
          const joined = joinedByPart(chunks);
          expect([...joined.keys()]).toEqual(files.map((f) => f.part));
          for (const file of files) expect(joined.get(file.part)).toBe(file.content);
          // Progress only grows, never passes the total, and ends on it.
          chunks.forEach((c, k) => {
            expect(c.done).toBeGreaterThanOrEqual(k === 0 ? 0 : (chunks[k - 1]?.done ?? 0));
            expect(c.total).toBe(utterances.length);
          });
          expect(chunks.at(-1)?.done).toBe(utterances.length);
          expect(files.reduce((n, f) => n + f.count, 0)).toBe(utterances.length);
        },
      ),
      { seed: 42, numRuns: 300 },
    );
  });

  it('without a split or mask, equals the canonical writers on tags re-encoded as `convert` does (property)', () => {
    fc.assert(
      fc.property(corpusArbitrary('iob2', 10), fc.integer({ min: 1, max: 4 }), (utterances, size) => {
        const joined = (format: 'iob2' | 'bioes' | 'jsonl') => [...exportChunks({ utterances }, { format }, size)].map((c) => c.text).join('');
        expect(joined('iob2')).toBe(columnsWrite(utterances.map((u) => ({ ...u, tags: tagsConvert(u.tags, 'iob2') }))));
        expect(joined('bioes')).toBe(columnsWrite(utterances.map((u) => ({ ...u, tags: tagsConvert(u.tags, 'bioes') }))));
        expect(joined('jsonl')).toBe(jsonlWrite(utterances));
      }),
      { seed: 43, numRuns: 200 },
    );
  });

  it('puts an empty intent and no intent in one stratum: two such utterances at 0.5/0.5 always split 1/1', () => {
    const utterances = [itemUtterance('hr-1', 'hello there', ['O', 'O']), { ...itemUtterance('hr-2', 'hi again', ['O', 'O']), intent: '' }];
    // As two strata of one, each seat would be a coin toss, and 20 seeds would not all give 1/1.
    for (let seed = 0; seed < 20; seed++) {
      const files = exportWrite({ utterances }, { format: 'jsonl', split: { ratios: { train: 0.5, dev: 0.5, test: 0 }, seed } });
      expect(files.map((f) => f.count)).toEqual([1, 1, 0]);
    }
  });

  it('yields one empty piece for an empty part, so every part still gets a file', () => {
    const chunks = [...exportChunks({ utterances: [] }, { format: 'iob2', split: { ratios: { train: 1, dev: 0, test: 0 }, seed: 1 } })];
    expect(chunks).toEqual([
      { part: 'train', text: '', done: 0, total: 0 },
      { part: 'dev', text: '', done: 0, total: 0 },
      { part: 'test', text: '', done: 0, total: 0 },
    ]);
  });

  it('checks before the first piece: bad chunk sizes and ratios throw at the call', () => {
    const utterances = [itemUtterance('hr-1', 'cancel friday', ['O', 'B-day'])];
    expect(() => exportChunks({ utterances }, { format: 'iob2' }, 0)).toThrow(RangeError);
    expect(() => exportChunks({ utterances }, { format: 'iob2', split: { ratios: { train: 1, dev: 1, test: 0 }, seed: 1 } })).toThrow(/add up to 1/);
  });

  it('numbers a writer error within its part, the same in pieces as in one go', () => {
    const utterances = ['hr-1', 'hr-2', 'hr-3', 'hr-4', 'hr-5'].map((id) => itemUtterance(id, 'cancel friday', ['O', 'B-day']));
    // A token with a space cannot be a column line: utterance 5 (hr-5) is unwritable.
    const broken = utterances[4] as Utterance;
    broken.text = 'cancel fri day';
    broken.tokens = [{ start: 0, end: 6 }, { start: 7, end: 14 }];
    const message = (size: number): string => {
      try {
        Array.from(exportChunks({ utterances }, { format: 'iob2' }, size));
      } catch (error) {
        expect(error).toBeInstanceOf(FormatWriteError);
        return (error as FormatWriteError).message;
      }
      return 'no error';
    };
    expect(message(Infinity)).toMatch(/^cannot write utterance 5 \(id "hr-5"\) as IOB columns: token 1 "fri day" contains white space$/);
    expect(message(2)).toBe(message(Infinity));
    expect(message(1)).toBe(message(Infinity));
  });
});

function itemUtterance(id: string, text: string, tags: string[]): Utterance {
  const item = itemMake(id, text, []);
  return { id, text, tokens: [...item.tokens], tags, meta: {} };
}

describe('masking on export', () => {
  const text = 'plumber to 12 Elm Row, call 555-0142 or dana.k@example.org';
  const tokens = itemMake('hr-1', text, []).tokens;
  const utterance: Utterance = { id: 'hr-1', text, tokens: [...tokens], tags: tokens.map(() => 'O'), meta: {}, intent: 'book_visit' };

  it('masks the text and every token line, keeping token offsets (columns read back)', () => {
    const [file] = exportWrite({ utterances: [utterance] }, { format: 'iob2', mask: ['digits', 'email'] });
    const back = columnsRead(file?.content ?? '');
    expect(back.errors).toEqual([]);
    const read = back.utterances[0];
    expect(read?.text).toBe(`plumber to 00 Elm Row, call 000-0000 or ${'*'.repeat('dana.k@example.org'.length)}`);
    expect(read?.tokens).toEqual(tokens);
    // Ids and meta are not masked (nor are they by `convert`); everything else is digit- and address-free.
    expect(file?.content.replace('# id = hr-1\n', '')).not.toMatch(/[1-9]|example/);
  });

  it('keeps JSON Lines token and span offsets for BMP text', () => {
    const labelled = { ...utterance, tags: utterance.tags.map((_, i) => (i === 2 ? 'B-budget' : 'O')) };
    const plain = JSON.parse(exportWrite({ utterances: [labelled] }, { format: 'jsonl' })[0]?.content ?? '') as Record<string, unknown>;
    const masked = JSON.parse(exportWrite({ utterances: [labelled] }, { format: 'jsonl', mask: ['digits', 'email'] })[0]?.content ?? '') as Record<string, unknown>;
    expect(masked.tokens).toEqual(plain.tokens);
    expect(masked.spans).toEqual(plain.spans);
    expect(masked.text).not.toBe(plain.text);
  });

  it('keeps UTF-16 offsets for astral digits too; the JSON Lines code-point offsets then follow the masked text', () => {
    // U+1D7DA MATHEMATICAL DOUBLE-STRUCK DIGIT TWO is Nd (UnicodeData.txt) and two UTF-16 units,
    // masked as "00": same UTF-16 length, one code point more, so later code-point offsets shift by one.
    const astral = '\u{1D7DA} taps';
    const u: Utterance = { text: astral, tokens: [{ start: 0, end: 2 }, { start: 3, end: 7 }], tags: ['O', 'B-problem'], meta: {} };
    const content = exportWrite({ utterances: [u] }, { format: 'jsonl', mask: ['digits'] })[0]?.content ?? '';
    const back = jsonlRead(content);
    expect(back.errors).toEqual([]);
    expect(back.utterances[0]?.tokens).toEqual(u.tokens);
    expect((JSON.parse(content) as { spans: unknown }).spans).toEqual([{ start: 3, end: 7, label: 'problem' }]);
  });
});

describe('EXPORT_PRIVACY_CAUTION', () => {
  it('is one paragraph naming personal data, masking and keeping files on this machine', () => {
    expect(EXPORT_PRIVACY_CAUTION).not.toMatch(/\n/);
    expect(EXPORT_PRIVACY_CAUTION).toMatch(/personal/);
    expect(EXPORT_PRIVACY_CAUTION).toMatch(/[Mm]asking/);
    expect(EXPORT_PRIVACY_CAUTION).toMatch(/this computer/);
  });
});
