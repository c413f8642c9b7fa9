import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  AttributeEncoder,
  crfModelFromJson,
  crfModelToJson,
  CrfObjective,
  crfTagger,
  crfTrain,
  CrfTrainCancelledError,
  datasetBuild,
  IntBuffer,
  labelsFromTags,
  Lattice,
  stateFeaturesCollect,
  stateScoresFill,
} from '../../../src/core/crf';
import { mulberry32Floats } from '../../../src/core/random';
import { tagParse } from '../../../src/core/schemes';
import { TINY } from './fixtures';

function objectiveOf(c2: number) {
  const labels = labelsFromTags(TINY.map((s) => s.tags));
  const encoder = new AttributeEncoder();
  const data = datasetBuild(TINY, encoder, labels);
  const features = stateFeaturesCollect(data, encoder.size, labels.length);
  return new CrfObjective(data, { labelCount: labels.length, featureStarts: features.starts, featureLabels: features.labels }, c2);
}

function legalIob2(tags: readonly string[]): boolean {
  return tags.every((tag, t) => {
    const parsed = tagParse(tag);
    if (parsed?.prefix !== 'I') return true;
    const before = t === 0 ? null : tagParse(tags[t - 1] as string);
    return before !== null && before.prefix !== 'O' && before.slot === parsed.slot;
  });
}

describe('training objective', () => {
  it('gradient matches central finite differences', () => {
    const objective = objectiveOf(0.3);
    const random = mulberry32Floats(7);
    const w = Float64Array.from({ length: objective.size }, () => random() - 0.5);
    const g = new Float64Array(objective.size);
    objective.evaluate(w, g);
    const h = 1e-5;
    const scratch = new Float64Array(objective.size);
    // Every transition weight and a seeded sample of state weights.
    const stateCount = objective.size - labelsFromTags(TINY.map((s) => s.tags)).length ** 2;
    const picks = [...Array.from({ length: 40 }, () => Math.floor(random() * stateCount)), ...Array.from({ length: objective.size - stateCount }, (_, i) => stateCount + i)];
    for (const i of picks) {
      const saved = w[i] as number;
      w[i] = saved + h;
      const up = objective.evaluate(w, scratch);
      w[i] = saved - h;
      const down = objective.evaluate(w, scratch);
      w[i] = saved;
      expect(g[i]).toBeCloseTo((up - down) / (2 * h), 5);
    }
  });

  it('the loss is Σ (log Z − gold path score) + c2·‖w‖², each term computed token by token', () => {
    const c2 = 0.3;
    const objective = objectiveOf(c2);
    const labels = labelsFromTags(TINY.map((s) => s.tags));
    const L = labels.length;
    const encoder = new AttributeEncoder();
    const data = datasetBuild(TINY, encoder, labels);
    const features = stateFeaturesCollect(data, encoder.size, L);
    const random = mulberry32Floats(11);
    const w = Float64Array.from({ length: objective.size }, () => random() - 0.5);
    const stateCount = features.labels.length;
    const expTrans = Float64Array.from(w.subarray(stateCount), Math.exp);
    let want = 0;
    for (const sequence of TINY) {
      const ids = new IntBuffer();
      const ends = new IntBuffer();
      encoder.encode(sequence.words, ids, ends);
      const T = sequence.words.length;
      const state = new Float64Array(T * L);
      stateScoresFill(features.starts, features.labels, w, L, ends.data, ids.data, 0, T, state);
      const gold = sequence.tags.map((tag) => labels.indexOf(tag));
      let score = 0;
      gold.forEach((y, t) => (score += (state[t * L + y] as number) + (t > 0 ? (w[stateCount + (gold[t - 1] as number) * L + y] as number) : 0)));
      want += new Lattice(L).run(T, state, expTrans, null) - score;
    }
    want += c2 * w.reduce((s, v) => s + v * v, 0);
    expect(objective.evaluate(w, new Float64Array(objective.size))).toBeCloseTo(want, 9);
  });

  it('at zero weights the loss is Σ T·log L (every path equally likely)', () => {
    const objective = objectiveOf(1);
    const labels = labelsFromTags(TINY.map((s) => s.tags)).length;
    const tokens = TINY.reduce((n, s) => n + s.words.length, 0);
    expect(objective.evaluate(new Float64Array(objective.size), new Float64Array(objective.size))).toBeCloseTo(tokens * Math.log(labels), 9);
  });
});

describe('crfTrain', () => {
  it('learns the training data and tags it back', async () => {
    const model = await crfTrain(TINY, { c2: 0.01, maxIterations: 200 });
    const tagger = crfTagger(model);
    for (const s of TINY) expect(tagger.tags(s.words)).toEqual(s.tags);
    expect(model.training.stopped).not.toBe('linesearch-failed');
  });

  it('is deterministic: two runs with one seed give bit-identical weights', async () => {
    const a = await crfTrain(TINY, { seed: 5, maxIterations: 30 });
    const b = await crfTrain(TINY, { seed: 5, maxIterations: 30 });
    expect(Array.from(a.weights)).toEqual(Array.from(b.weights));
    expect(crfModelToJson(a)).toBe(crfModelToJson(b));
  });

  it('reports progress per iteration and stops when cancelled between iterations', async () => {
    const seen: number[] = [];
    await expect(
      crfTrain(TINY, {
        maxIterations: 50,
        onProgress: (p) => {
          if (p.phase === 'optimising') seen.push(p.iteration);
        },
        isCancelled: () => seen.length >= 3,
      }),
    ).rejects.toBeInstanceOf(CrfTrainCancelledError);
    expect(seen).toEqual([1, 2, 3]);
  });

  it('never tags illegal IOB2, on any words (property)', async () => {
    const model = await crfTrain(TINY, { maxIterations: 40 });
    const tagger = crfTagger(model);
    const vocabulary = [...new Set(TINY.flatMap((s) => s.words)), 'zzz', '555', 'Q1', '!'];
    fc.assert(
      fc.property(fc.array(fc.constantFrom(...vocabulary), { minLength: 1, maxLength: 25 }), (words) => {
        const tagged = tagger.tag(words);
        expect(legalIob2(tagged.tags)).toBe(true);
        expect(tagger.tags(words)).toEqual(tagged.tags);
        expect(tagged.leastConfidence).toBeGreaterThanOrEqual(0);
        expect(tagged.leastConfidence).toBeLessThanOrEqual(1);
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});

describe('model files', () => {
  it('save → load gives identical weights, tags and confidences', async () => {
    const model = await crfTrain(TINY, { maxIterations: 40, seed: 3 });
    const text = crfModelToJson(model);
    const parsed = JSON.parse(text) as { format: string; version: number };
    expect(parsed.format).toBe('slotsmith-crf-model');
    expect(parsed.version).toBe(1);
    const loaded = crfModelFromJson(text);
    expect(Array.from(loaded.weights)).toEqual(Array.from(model.weights));
    expect(Array.from(loaded.featureStarts)).toEqual(Array.from(model.featureStarts));
    expect(Array.from(loaded.featureLabels)).toEqual(Array.from(model.featureLabels));
    const before = crfTagger(model);
    const after = crfTagger(loaded);
    for (const s of [...TINY, { words: ['my', 'roof', 'leaks', 'on', 'sunday'] }]) {
      const a = before.tag(s.words);
      const b = after.tag(s.words);
      expect(b.tags).toEqual(a.tags);
      expect(Array.from(b.confidence)).toEqual(Array.from(a.confidence));
      expect(b.pathProbability).toBe(a.pathProbability);
    }
  });

  it('refuses other formats, versions and inconsistent tables', async () => {
    const model = await crfTrain(TINY, { maxIterations: 5 });
    const file = JSON.parse(crfModelToJson(model)) as Record<string, unknown>;
    expect(() => crfModelFromJson('{')).toThrow(/not JSON/);
    expect(() => crfModelFromJson(JSON.stringify({ ...file, format: 'other' }))).toThrow(/not a slotsmith-crf-model/);
    expect(() => crfModelFromJson(JSON.stringify({ ...file, version: 2 }))).toThrow(/version 2/);
    expect(() => crfModelFromJson(JSON.stringify({ ...file, labels: ['O'] }))).toThrow(/do not fit/);
  });
});
