/** Training split into shards and spread over threads: the cut, the objective it gives, and weights that do not depend on the thread count. */
import { describe, expect, it } from 'vitest';
import {
  AttributeEncoder,
  CRF_SHARDS,
  CRF_SPAN,
  crfModelToJson,
  CrfObjective,
  type CrfSequence,
  type CrfShardData,
  type CrfShardHelper,
  CrfShardObjective,
  crfShardService,
  crfShardsSplit,
  crfTrain,
  datasetBuild,
  IntBuffer,
  labelsFromTags,
  Lattice,
  stateFeaturesCollect,
  stateScoresFill,
} from '../../../src/core/crf';
import { mulberry32Floats } from '../../../src/core/random';
import { corpusGenerate } from '../../../scripts/corpus/generate';
import { TINY } from './fixtures';

/** Generated home-repair utterances (the repo's seeded corpus generator), enough for every shard to hold many. */
const CORPUS: CrfSequence[] = corpusGenerate({ seed: 31, count: 400 }).truth.map((u) => ({
  words: u.tokens.map((t) => u.text.slice(t.start, t.end)),
  tags: u.tags,
}));

function built(sequences: readonly CrfSequence[]) {
  const labels = labelsFromTags(sequences.map((s) => s.tags));
  const encoder = new AttributeEncoder();
  const data = datasetBuild(sequences, encoder, labels);
  const features = stateFeaturesCollect(data, encoder.size, labels.length);
  return { data, structure: { labelCount: labels.length, featureStarts: features.starts, featureLabels: features.labels } };
}

/** A helper thread stand-in: answers later, through structured clones both ways, as a worker does. */
function helperInProcess(failAfter = Number.POSITIVE_INFINITY, failLoad = false): CrfShardHelper & { calls: number } {
  const service = crfShardService();
  const later = () => new Promise((resolve) => setTimeout(resolve, 0));
  const helper = {
    calls: 0,
    async load(shards: CrfShardData[]) {
      await later();
      if (failLoad) throw new Error('helper failed to load');
      service.load(structuredClone(shards));
    },
    async evaluate(weights: Float64Array) {
      await later();
      helper.calls++;
      if (helper.calls > failAfter) throw new Error('helper crashed');
      return structuredClone(service.evaluate(structuredClone(weights)));
    },
  };
  return helper;
}

describe('crfShardsSplit', () => {
  const { data, structure } = built(CORPUS);
  const shards = crfShardsSplit(data, structure);

  it('cuts the utterances, in order, into CRF_SHARDS runs of about equal token counts', () => {
    expect(shards).toHaveLength(CRF_SHARDS);
    const utterances = shards.reduce((n, s) => n + s.tokenStarts.length - 1, 0);
    expect(utterances).toBe(CORPUS.length);
    const tokens = data.tokenStarts[CORPUS.length] as number;
    const longest = Math.max(...CORPUS.map((s) => s.words.length));
    let from = 0;
    for (const shard of shards) {
      const count = shard.tokenStarts.length - 1;
      // Same utterance lengths in the same order as the whole.
      for (let u = 0; u < count; u++) {
        expect((shard.tokenStarts[u + 1] as number) - (shard.tokenStarts[u] as number)).toBe(CORPUS[from + u]?.words.length);
      }
      from += count;
      expect(Math.abs((shard.tokenStarts[count] as number) - tokens / CRF_SHARDS)).toBeLessThanOrEqual(longest);
    }
  });

  it('each shard token keeps exactly the attribute ids it has in the whole', () => {
    let token = 0;
    for (const shard of shards) {
      const count = shard.tokenUnits.length / CRF_SPAN;
      for (let t = 0; t < count; t++, token++) {
        for (let k = 0; k < CRF_SPAN; k++) {
          const mine = shard.tokenUnits[t * CRF_SPAN + k] as number;
          const whole = data.tokenUnits[token * CRF_SPAN + k] as number;
          expect(Array.from(shard.unitAttrs.subarray(shard.unitStarts[mine], shard.unitStarts[mine + 1]))).toEqual(
            Array.from(data.unitAttrs.subarray(data.unitStarts[whole], data.unitStarts[whole + 1])),
          );
        }
      }
    }
    expect(token).toBe(data.labels.length);
  });

  it('more shards than utterances leaves some empty, which add nothing', () => {
    const tiny = built(TINY);
    const many = new CrfObjective(tiny.data, tiny.structure, 0.5, TINY.length + 3);
    const one = new CrfObjective(tiny.data, tiny.structure, 0.5, 1);
    expect(many.shards.filter((s) => s.tokenStarts.length === 1)).toHaveLength(3);
    const random = mulberry32Floats(3);
    const w = Float64Array.from({ length: one.size }, () => random() - 0.5);
    const g1 = new Float64Array(one.size);
    const gMany = new Float64Array(one.size);
    expect(many.evaluate(w, gMany)).toBeCloseTo(one.evaluate(w, g1), 10);
    gMany.forEach((g, i) => expect(g).toBeCloseTo(g1[i] as number, 10));
  });
});

describe('the objective over shards', () => {
  it('equals the one-shard objective up to rounding, at any weights', () => {
    const { data, structure } = built(CORPUS);
    const one = new CrfObjective(data, structure, 1, 1);
    const four = new CrfObjective(data, structure, 1);
    const random = mulberry32Floats(9);
    const w = Float64Array.from({ length: one.size }, () => random() - 0.5);
    const gOne = new Float64Array(one.size);
    const gFour = new Float64Array(one.size);
    const fOne = one.evaluate(w, gOne);
    expect(four.evaluate(w, gFour) / fOne).toBeCloseTo(1, 12);
    gFour.forEach((g, i) => expect(g).toBeCloseTo(gOne[i] as number, 8));
  });
});

describe('CrfShardObjective', () => {
  /** Σ log Z the plain way: per token, scores summed attribute by attribute, then Lattice.run (exp per token). */
  function logZPlain(sequences: readonly CrfSequence[], weights: Float64Array): number {
    const labels = labelsFromTags(sequences.map((s) => s.tags));
    const L = labels.length;
    const encoder = new AttributeEncoder();
    const data = datasetBuild(sequences, encoder, labels);
    const features = stateFeaturesCollect(data, encoder.size, L);
    const expTrans = Float64Array.from(weights.subarray(features.labels.length), Math.exp);
    let sum = 0;
    for (const sequence of sequences) {
      const ids = new IntBuffer();
      const ends = new IntBuffer();
      encoder.encode(sequence.words, ids, ends);
      const T = sequence.words.length;
      const state = new Float64Array(T * L);
      stateScoresFill(features.starts, features.labels, weights, L, ends.data, ids.data, 0, T, state);
      sum += new Lattice(L).run(T, state, expTrans, null);
    }
    return sum;
  }

  it('Σ log Z equals the plain per-token computation, also where weights are so far apart that products of unit rows underflow', () => {
    const { data, structure } = built(TINY);
    const [shard] = crfShardsSplit(data, structure, 1);
    const objective = new CrfShardObjective(shard as CrfShardData);
    const random = mulberry32Floats(21);
    for (const spread of [1, 2000]) {
      // At 2000, unit rows differ by hundreds per label, so their five-fold products fall under 1e-200 and the per-token path must take over
      // (transition weights stay small: exp of them is taken as it is, in both computations).
      const stateCount = (shard as CrfShardData).featureLabels.length;
      const w = Float64Array.from({ length: objective.size }, (_, i) => (random() - 0.5) * (i < stateCount ? spread : 2));
      const got = objective.evaluate(w, new Float64Array(objective.size));
      expect(Number.isFinite(got)).toBe(true);
      expect(got / logZPlain(TINY, w)).toBeCloseTo(1, 12);
    }
  });
});

describe('crfTrain over threads', () => {
  it('gives bit-identical weights and model files with 0, 1, 2 or 3 helpers', async () => {
    const options = { maxIterations: 25, seed: 4 };
    const alone = await crfTrain(CORPUS, options);
    for (const count of [1, 2, 3]) {
      const helpers = Array.from({ length: count }, () => helperInProcess());
      const shared = await crfTrain(CORPUS, { ...options, shardHelpers: helpers });
      expect(Array.from(shared.weights)).toEqual(Array.from(alone.weights));
      expect(crfModelToJson(shared)).toBe(crfModelToJson(alone));
      // Every helper did its share of every evaluation.
      for (const h of helpers) expect(h.calls).toBe(alone.training.evaluations);
    }
  });

  it('more helpers than shards: the spare ones are never asked', async () => {
    const helpers = Array.from({ length: CRF_SHARDS + 1 }, () => helperInProcess());
    const model = await crfTrain(TINY, { maxIterations: 5, shardHelpers: helpers });
    expect(helpers.map((h) => h.calls)).toEqual([...Array.from({ length: CRF_SHARDS - 1 }, () => model.training.evaluations), 0, 0]);
  });

  it('a helper that fails to load, or dies mid-training, is replaced by this thread with the same result', async () => {
    const options = { maxIterations: 20, seed: 1 };
    const alone = await crfTrain(CORPUS, options);
    const dying = helperInProcess(7);
    const died = await crfTrain(CORPUS, { ...options, shardHelpers: [dying, helperInProcess()] });
    expect(dying.calls).toBe(8);
    expect(Array.from(died.weights)).toEqual(Array.from(alone.weights));
    const unloaded = helperInProcess(Number.POSITIVE_INFINITY, true);
    const never = await crfTrain(CORPUS, { ...options, shardHelpers: [unloaded] });
    expect(unloaded.calls).toBe(0);
    expect(Array.from(never.weights)).toEqual(Array.from(alone.weights));
  });
});
