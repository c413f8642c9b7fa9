import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { alignBuilder, AlignLayerGatherer, layersAlign, type AlignLayer } from '../../../src/core/agreement';
import type { Utterance } from '../../../src/core/types';
import { corpusArb } from './arbitraries';
import { layersAlignPrevious } from './align-previous';

type Mutation =
  | { kind: 'drop-id' | 'duplicate' | 'no-line' | 'token-lines' | 'extra-tag' | 'retext' | 'drop-token' | 'odd-tag'; layer: number; at: number };

const mutationArb: fc.Arbitrary<Mutation> = fc.record({
  kind: fc.constantFrom('drop-id', 'duplicate', 'no-line', 'token-lines', 'extra-tag', 'retext', 'drop-token', 'odd-tag'),
  layer: fc.nat(3),
  at: fc.nat(20),
});

/** Each mutation makes one utterance awkward the way real files are: what alignment must report or carry. */
function mutate(layers: AlignLayer[], mutations: readonly Mutation[]): AlignLayer[] {
  const copies = layers.map((layer) => ({ ...layer, utterances: layer.utterances.map((u) => ({ ...u, tokens: [...u.tokens], tags: [...u.tags] })) }));
  for (const m of mutations) {
    const layer = copies[m.layer % copies.length];
    if (layer === undefined || layer.utterances.length === 0) continue;
    const k = m.at % layer.utterances.length;
    const u = layer.utterances[k] as Utterance;
    switch (m.kind) {
      case 'drop-id':
        delete u.id;
        break;
      case 'duplicate':
        layer.utterances.push({ ...u, line: (u.line ?? 0) + 1000 });
        break;
      case 'no-line':
        delete u.line;
        break;
      case 'token-lines':
        u.tokenLines = u.tokens.map((_, t) => (u.line ?? 500) + t + 1);
        break;
      case 'extra-tag':
        u.tags.push('O');
        break;
      case 'retext':
        // Same token count, one token's text changed (and so the text).
        u.text = `${u.text} kitchen`;
        u.tokens[u.tokens.length - 1] = { start: u.text.length - 7, end: u.text.length };
        break;
      case 'drop-token':
        u.tokens.pop();
        u.tags.pop();
        break;
      case 'odd-tag':
        u.tags[0] = 'X-budget';
        break;
    }
  }
  return copies;
}

describe('streaming alignment builder', () => {
  it('layersAlign (now on the builder) equals the previous whole-array alignment, errors and messages included', () => {
    const seen = new Set<string>();
    const prop = fc.property(
      corpusArb({ min: 1, max: 4 }, 0.25),
      fc.array(mutationArb, { maxLength: 4 }),
      fc.constantFrom('auto', 'id', 'position'),
      fc.integer({ min: 1, max: 100 }),
      (layers, mutations, by, errorLimit) => {
        const input = mutate(layers, mutations);
        const options = { by, errorLimit } as const;
        const result = layersAlign(input, options);
        expect(result).toEqual(layersAlignPrevious(input, options));
        if (result.ok) seen.add(`ok-${result.corpus.by}`);
        else for (const e of result.errors) seen.add(e.kind);
      },
    );
    fc.assert(prop, { seed: 42, numRuns: 400 });
    // The runs must have covered both pairings and every kind of error.
    expect([...seen].sort()).toEqual(['duplicate-id', 'missing-id', 'ok-id', 'ok-position', 'tags-count', 'tokens-differ']);
  });

  it('layers with the same ids in the same order (the shortcut without an id map) align like the reference, rising ids or not', () => {
    const seen = new Set<string>();
    const prop = fc.property(
      corpusArb({ min: 1, max: 1 }, 0.25),
      fc.integer({ min: 2, max: 3 }),
      fc.constantFrom('as-is', 'reversed', 'duplicate', 'missing'),
      (layers, copies, order) => {
        const first = layers[0] as AlignLayer;
        let utterances = first.utterances.map((u) => ({ ...u }));
        if (order === 'reversed') utterances.reverse();
        if (order === 'duplicate' && utterances.length > 0) utterances = [...utterances, { ...(utterances[0] as Utterance), line: 999 }];
        if (order === 'missing' && utterances.length > 0) delete (utterances[utterances.length - 1] as Utterance).id;
        // Every layer the same ids in the same order; tags differ (shifted by one) so figures are not trivial.
        const input = Array.from({ length: copies }, (_, l) => ({
          name: `layer-${String(l)}`,
          scheme: first.scheme,
          utterances: utterances.map((u) => ({ ...u, tags: u.tags.map((_, t) => u.tags[(t + l) % u.tags.length] ?? 'O') })),
        }));
        const result = layersAlign(input, { by: 'id' });
        expect(result).toEqual(layersAlignPrevious(input, { by: 'id' }));
        seen.add(result.ok ? `ok-${order}` : result.errors.map((e) => e.kind).join());
      },
    );
    fc.assert(prop, { seed: 42, numRuns: 200 });
    expect(seen).toContain('ok-as-is');
    expect(seen).toContain('ok-reversed');
  });

  it('layers gathered apart (as on worker threads) align like streamed ones', () => {
    const prop = fc.property(corpusArb({ min: 2, max: 3 }, 0.25), fc.array(mutationArb, { maxLength: 2 }), (layers, mutations) => {
      const input = mutate(layers, mutations);
      const streamed = alignBuilder();
      const gathered = alignBuilder();
      for (const layer of input) {
        streamed.layerBegin(layer.name);
        const gatherer = new AlignLayerGatherer(layer.name);
        for (const u of layer.utterances) {
          streamed.utteranceAdd(u);
          gatherer.utteranceAdd(u);
        }
        streamed.layerEnd();
        gathered.layerAdd(structuredClone(gatherer.done()));
      }
      expect(gathered.finish()).toEqual(streamed.finish());
    });
    fc.assert(prop, { seed: 42, numRuns: 100 });
  });

  it('reports a token mismatch with both token strings, files and lines', () => {
    const u = (text: string, line: number): Utterance => ({
      id: 'hr-7',
      text,
      tokens: [
        { start: 0, end: 3 },
        { start: 4, end: text.length },
      ],
      tags: ['O', 'B-problem'],
      meta: {},
      line,
      tokenLines: [line + 1, line + 2],
    });
    const builder = alignBuilder();
    builder.layerBegin('a.iob2');
    builder.utteranceAdd(u('fix boiler', 10));
    builder.layerEnd();
    builder.layerBegin('b.iob2');
    builder.utteranceAdd(u('fix boilers', 40));
    builder.layerEnd();
    const result = builder.finish();
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors[0]?.message).toBe('utterance hr-7, token 2: "boiler" in a.iob2 (line 12) but "boilers" in b.iob2 (line 42)');
  });

  it('refuses calls out of order', () => {
    const builder = alignBuilder();
    expect(() => builder.layerEnd()).toThrow();
    builder.layerBegin('a');
    expect(() => builder.layerBegin('b')).toThrow();
    expect(() => builder.finish()).toThrow();
  });
});
