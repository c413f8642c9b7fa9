/** The tagger's per-word cached score rows against plain per-token sums, and a model file saved before that change. */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { AttributeEncoder, crfModelFromJson, crfTagger, crfTrain, IntBuffer, iob2TransitionMask, Lattice, stateScoresFill } from '../../../src/core/crf';
import { TINY } from './fixtures';

const PROBES = [...TINY.map((s) => s.words), ['my', 'roof', 'leaks', 'on', 'sunday'], ['Book', 'an', 'electrician', 'for', 'Tuesday', 'morning'], ['zzz'], ['555-0142', '?', 'Q1', 'ASAP']];

describe('crfTagger', () => {
  it('marginals equal forward–backward on scores summed attribute by attribute (stateScoresFill)', async () => {
    const model = await crfTrain(TINY, { c2: 0.1, maxIterations: 30 });
    const tagger = crfTagger(model);
    const L = model.labels.length;
    const encoder = new AttributeEncoder(model.attributes, false);
    const mask = iob2TransitionMask(model.labels);
    const stateCount = model.featureLabels.length;
    const expTrans = Float64Array.from(model.weights.subarray(stateCount), (w, c) => Math.exp(w) * (mask.pair[c] as number));
    // Twice over the probes, so the second pass reads every word from the cache.
    for (const words of [...PROBES, ...PROBES]) {
      const ids = new IntBuffer();
      const ends = new IntBuffer();
      encoder.encode(words, ids, ends);
      const state = new Float64Array(words.length * L);
      stateScoresFill(model.featureStarts, model.featureLabels, model.weights, L, ends.data, ids.data, 0, words.length, state);
      const lattice = new Lattice(L);
      lattice.run(words.length, state, expTrans, mask.start);
      const got = tagger.marginals(words);
      Array.from(got).forEach((p, i) => expect(p).toBeCloseTo(lattice.marginals[i] as number, 12));
    }
  });

  it('a model file written before the unit layout (same format version) loads and tags as it did then', () => {
    // Written by the tagger at commit af2f10a (TINY, c2 = 0.1, 40 iterations), with its outputs on probe sentences.
    const fixture = JSON.parse(readFileSync(new URL('model-file-v1.fixture.json', import.meta.url), 'utf8')) as {
      model: unknown;
      expected: { words: string[]; tags: string[]; confidence: number[]; pathProbability: number }[];
    };
    const tagger = crfTagger(crfModelFromJson(JSON.stringify(fixture.model)));
    expect(fixture.expected.length).toBeGreaterThan(5);
    for (const want of fixture.expected) {
      const got = tagger.tag(want.words);
      expect(got.tags).toEqual(want.tags);
      expect(tagger.tags(want.words)).toEqual(want.tags);
      want.confidence.forEach((c, t) => expect(got.confidence[t]).toBeCloseTo(c, 12));
      expect(got.pathProbability).toBeCloseTo(want.pathProbability, 12);
    }
  });
});
