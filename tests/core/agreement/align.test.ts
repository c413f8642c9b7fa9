import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { layersAlign, MISSING, type AlignedCorpus, type AlignLayer } from '../../../src/core/agreement';
import { columnsRead } from '../../../src/core/formats';
import { tagsConvert } from '../../../src/core/schemes';
import { SCHEMES, type Scheme, type Utterance } from '../../../src/core/types';
import { tagSequenceArb } from '../schemes/arbitraries';

function sample(name: string): AlignLayer {
  const text = readFileSync(new URL(`../../../sample-corpus/${name}.iob2`, import.meta.url), 'utf8');
  const document = columnsRead(text, { scheme: 'iob2' });
  expect(document.errors).toEqual([]);
  return { name, scheme: document.scheme, utterances: document.utterances };
}

function alignedOrThrow(layers: readonly AlignLayer[], by?: 'id' | 'position'): AlignedCorpus {
  const result = layersAlign(layers, by === undefined ? {} : { by });
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return result.corpus;
}

function utterance(words: readonly string[], tags: readonly string[], extra: Partial<Utterance> = {}): Utterance {
  let at = 0;
  const tokens = words.map((word) => {
    const token = { start: at, end: at + word.length };
    at += word.length + 1;
    return token;
  });
  return { text: words.join(' '), tokens, tags: [...tags], meta: {}, ...extra };
}

/** Tag strings of one layer's utterance, read back from the codes. */
function tagsAt(corpus: AlignedCorpus, layer: number, u: number): string[] {
  const codes = corpus.tags[layer]?.subarray(corpus.offsets[u], corpus.offsets[u + 1]) ?? new Int32Array();
  return Array.from(codes, (code) => (code === MISSING ? '(missing)' : (corpus.tagLabels[code] ?? '?')));
}

const FILE_A = ['# id = hr-00001', '# text = fix the tap', 'fix\tO', 'the\tO', 'tap\tB-problem', '', '# id = hr-00002', '# text = book a plumber', 'book\tO', 'a\tO', 'plumber\tB-service', ''].join('\n');
const FILE_B = [
  '# id = hr-00002',
  '# text = book a plumbers',
  'book\tO',
  'a\tO',
  'plumbers\tB-service',
  '',
  '# id = hr-00001',
  '# text = fix the tap now',
  'fix\tO',
  'the\tO',
  'tap\tB-problem',
  'now\tO',
  '',
].join('\n');

describe('layersAlign on the sample corpus', () => {
  it('aligns ann-a and ann-b by id: the union of their utterances, 400 held by both', () => {
    const overlap = readFileSync(new URL('../../../sample-corpus/overlap-ids.txt', import.meta.url), 'utf8').trim().split('\n');
    const corpus = alignedOrThrow([sample('ann-a'), sample('ann-b')]);
    expect(corpus.by).toBe('id');
    expect(corpus.utteranceCount).toBe(2000);
    const both = corpus.ids.filter((_, u) => corpus.present[0]?.[u] === 1 && corpus.present[1]?.[u] === 1);
    expect([...both].sort()).toEqual([...overlap].sort());
    expect(corpus.slots[0]).toBe('O');
    expect(corpus.slots.slice(1)).toEqual([...corpus.slots.slice(1)].sort());
    expect(corpus.hasIntents).toEqual([true, true]);
  });

  it('keeps an utterance missing from a layer with missing codes there', () => {
    const corpus = alignedOrThrow([sample('ann-a'), sample('ann-b')]);
    const u = corpus.present[0]?.findIndex((p, i) => p === 1 && corpus.present[1]?.[i] === 0) ?? -1;
    expect(u).toBeGreaterThanOrEqual(0);
    expect(tagsAt(corpus, 1, u).every((t) => t === '(missing)')).toBe(true);
    expect(corpus.intents[1]?.[u]).toBe(MISSING);
    expect(corpus.lines[1]?.[u]).toBe(0);
    expect(corpus.lines[0]?.[u]).toBeGreaterThan(0);
  });
});

describe('layersAlign errors', () => {
  it('names the utterance id and both layers with their lines for every token mismatch', () => {
    const a = columnsRead(FILE_A);
    const b = columnsRead(FILE_B);
    const result = layersAlign([
      { name: 'a.iob2', scheme: 'iob2', utterances: a.utterances },
      { name: 'b.iob2', scheme: 'iob2', utterances: b.utterances },
    ]);
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errorCount).toBe(2);
    const [count, token] = result.errors;
    expect(count).toMatchObject({ kind: 'tokens-differ', id: 'hr-00001', places: [{ layer: 'a.iob2', line: 1 }, { layer: 'b.iob2', line: 7 }] });
    expect(count?.message).toBe('utterance hr-00001: a.iob2 (line 1) has 3 tokens, b.iob2 (line 7) has 4');
    expect(token).toMatchObject({ kind: 'tokens-differ', id: 'hr-00002', places: [{ layer: 'a.iob2', line: 7 }, { layer: 'b.iob2', line: 1 }] });
    // The token's own line when the reader recorded it: line 11 in a.iob2, line 5 in b.iob2.
    expect(token?.message).toBe('utterance hr-00002, token 3: "plumber" in a.iob2 (line 11) but "plumbers" in b.iob2 (line 5)');
  });

  it('lists every mismatch up to the limit and counts them all', () => {
    const make = (word: string): AlignLayer => ({
      name: word,
      scheme: 'iob2',
      utterances: Array.from({ length: 150 }, (_, i) => utterance(['call', word], ['O', 'O'], { id: `hr-${String(i)}` })),
    });
    const result = layersAlign([make('me'), make('us')]);
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors).toHaveLength(100);
    expect(result.errorCount).toBe(150);
    const limited = layersAlign([make('me'), make('us')], { errorLimit: 5 });
    expect(limited.ok ? 0 : limited.errors.length).toBe(5);
  });

  it('reports duplicate ids within one layer with both lines', () => {
    const layer: AlignLayer = {
      name: 'a',
      scheme: 'iob2',
      utterances: [utterance(['hi'], ['O'], { id: 'hr-1', line: 3 }), utterance(['hi'], ['O'], { id: 'hr-1', line: 9 })],
    };
    const result = layersAlign([layer, { ...layer, name: 'b', utterances: [layer.utterances[0] as Utterance] }]);
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors).toEqual([
      { kind: 'duplicate-id', id: 'hr-1', index: 0, places: [{ layer: 'a', line: 3 }, { layer: 'a', line: 9 }], message: 'id hr-1 occurs twice in a (line 3 and line 9)' },
    ]);
  });

  it('reports utterances without an id when alignment by id is asked for', () => {
    const layer: AlignLayer = { name: 'a', scheme: 'iob2', utterances: [utterance(['hi'], ['O'], { id: 'hr-1' }), utterance(['yo'], ['O'], { line: 5 })] };
    const result = layersAlign([layer, layer], { by: 'id' });
    expect(result.ok ? [] : result.errors.map((e) => e.kind)).toEqual(['missing-id', 'missing-id']);
    expect(result.ok ? '' : result.errors[0]?.message).toBe('a (line 5): utterance without an id; aligning by id needs one on every utterance');
  });

  it('reports a tag count that differs from the token count', () => {
    const bad = utterance(['hi', 'there'], ['O'], { id: 'hr-1', line: 2 });
    const result = layersAlign([{ name: 'a', scheme: 'iob2', utterances: [bad] }, { name: 'b', scheme: 'iob2', utterances: [utterance(['hi', 'there'], ['O', 'O'], { id: 'hr-1' })] }]);
    expect(result.ok ? [] : result.errors.map((e) => e.message)).toEqual(['utterance hr-1 in a (line 2): 2 tokens but 1 tags']);
  });
});

describe('layersAlign by position', () => {
  const withoutIds = (name: string, words: readonly (readonly string[])[]): AlignLayer => ({
    name,
    scheme: 'iob2',
    utterances: words.map((w, i) => utterance(w, w.map(() => 'O'), { line: 1 + 4 * i })),
  });

  it('aligns by position when some utterance lacks an id, longer layers keeping the rest', () => {
    const a = withoutIds('a', [['fix', 'it'], ['thanks']]);
    const b = withoutIds('b', [['fix', 'it'], ['thanks'], ['bye']]);
    const corpus = alignedOrThrow([a, b]);
    expect(corpus.by).toBe('position');
    expect(corpus.utteranceCount).toBe(3);
    expect(corpus.ids).toEqual([null, null, null]);
    expect(Array.from(corpus.present[0] ?? [])).toEqual([1, 1, 0]);
  });

  it('names mismatches by position', () => {
    const result = layersAlign([withoutIds('a', [['fix'], ['thanks']]), withoutIds('b', [['fix'], ['cheers']])]);
    expect(result.ok ? [] : result.errors.map((e) => e.message)).toEqual(['utterance #2, token 1: "thanks" in a (line 5) but "cheers" in b (line 5)']);
  });

  it('ignores ids when asked to align by position', () => {
    const a: AlignLayer = { name: 'a', scheme: 'iob2', utterances: [utterance(['x'], ['O'], { id: 'one' }), utterance(['y'], ['O'], { id: 'two' })] };
    const b: AlignLayer = { name: 'b', scheme: 'iob2', utterances: [utterance(['x'], ['B-day'], { id: 'uno' }), utterance(['y'], ['O'], { id: 'dos' })] };
    const corpus = alignedOrThrow([a, b], 'position');
    expect(corpus.ids).toEqual(['one', 'two']);
    expect(tagsAt(corpus, 1, 0)).toEqual(['B-day']);
  });
});

describe('layersAlign tag conversion', () => {
  it('gives the IOB2 tags tagsConvert gives, for any scheme and for illegal or malformed tags', () => {
    fc.assert(
      fc.property(fc.array(tagSequenceArb, { minLength: 1, maxLength: 6 }), fc.constantFrom<Scheme>(...SCHEMES), (sequences, scheme) => {
        const utterances = sequences.map((tags, i) => utterance(tags.map((_, t) => `w${String(t)}`), tags, { id: `hr-${String(i)}` }));
        const corpus = alignedOrThrow([
          { name: 'a', scheme, utterances },
          { name: 'b', scheme: 'iob2', utterances },
        ]);
        sequences.forEach((tags, u) => {
          expect(tagsAt(corpus, 0, u)).toEqual(tagsConvert(tags, 'iob2'));
        });
        // The fixed code layout: B-slot = 2s-1, I-slot = 2s.
        corpus.slots.slice(1).forEach((slot, i) => {
          expect(corpus.tagLabels[2 * i + 1]).toBe(`B-${slot}`);
          expect(corpus.tagLabels[2 * i + 2]).toBe(`I-${slot}`);
        });
      }),
      { seed: 42, numRuns: 300 },
    );
  });
});
