import { type CrfDataset, unitLabelCounts } from './dataset';
import { CRF_SHARDS, type CrfShardData, CrfShardObjective, crfShardsSplit, type CrfShardValue, type CrfStructure, unitRowsToFeatures } from './shard';

export type { CrfStructure } from './shard';

/**
 * The training objective: negative conditional log-likelihood plus c2·‖w‖² (CRFsuite's L2 form,
 * train_lbfgs.c in the vendored CRFsuite source), with its gradient. The observed feature counts
 * never change, so they are counted once; each evaluation adds the expected counts from
 * forward–backward, computed per shard (see shard.ts) and summed in shard order, whichever
 * thread computed each shard, so that the sum is the same bit for bit.
 */
export class CrfObjective {
  readonly size: number;
  readonly shards: CrfShardData[];
  private readonly observed: Float64Array;
  private readonly stateCount: number;
  /** Built on first use: a run whose shards all live in helper threads never needs them here. */
  private readonly here: (CrfShardObjective | undefined)[];
  private readonly hereExpected: (Float64Array | undefined)[];

  constructor(
    private readonly data: CrfDataset,
    private readonly structure: CrfStructure,
    private readonly c2: number,
    shardCount = CRF_SHARDS,
  ) {
    const L = structure.labelCount;
    this.stateCount = structure.featureLabels.length;
    this.size = this.stateCount + L * L;
    this.shards = crfShardsSplit(data, structure, shardCount);
    this.here = this.shards.map(() => undefined);
    this.hereExpected = this.shards.map(() => undefined);
    this.observed = this.observedCount();
  }

  private observedCount(): Float64Array {
    const { data, structure } = this;
    const L = structure.labelCount;
    const counts = new Float64Array(this.size);
    unitRowsToFeatures(structure.featureStarts, structure.featureLabels, L, data.unitStarts, data.unitAttrs, unitLabelCounts(data, L), counts);
    for (let u = 0; u + 1 < data.tokenStarts.length; u++) {
      const stop = data.tokenStarts[u + 1] as number;
      for (let t = (data.tokenStarts[u] as number) + 1; t < stop; t++) {
        const cell = this.stateCount + (data.labels[t - 1] as number) * L + (data.labels[t] as number);
        counts[cell] = (counts[cell] as number) + 1;
      }
    }
    return counts;
  }

  /** Shard k's value computed on this thread (its `expected` is reused by the next call for k). */
  shardEvaluate(k: number, weights: Float64Array): CrfShardValue {
    const objective = (this.here[k] ??= new CrfShardObjective(this.shards[k] as CrfShardData));
    const expected = (this.hereExpected[k] ??= new Float64Array(this.size));
    return { logZ: objective.evaluate(weights, expected), expected };
  }

  /** f(w) into the return value, ∇f(w) into `gradient`, from every shard's value in shard order. */
  combine(values: readonly CrfShardValue[], weights: Float64Array, gradient: Float64Array): number {
    gradient.fill(0);
    let logZSum = 0;
    for (const value of values) {
      logZSum += value.logZ;
      const expected = value.expected;
      for (let i = 0; i < this.size; i++) gradient[i] = (gradient[i] as number) + (expected[i] as number);
    }
    // The gold paths' total score is Σ observed·w, so no per-token pass over the gold labels is needed.
    const observed = this.observed;
    const twoC2 = 2 * this.c2;
    let norm = 0;
    let gold = 0;
    for (let i = 0; i < this.size; i++) {
      const w = weights[i] as number;
      const o = observed[i] as number;
      norm += w * w;
      gold += o * w;
      gradient[i] = (gradient[i] as number) - o + twoC2 * w;
    }
    return logZSum - gold + this.c2 * norm;
  }

  /** f(w) and ∇f(w) with every shard on this thread. */
  evaluate(weights: Float64Array, gradient: Float64Array): number {
    return this.combine(
      this.shards.map((_, k) => this.shardEvaluate(k, weights)),
      weights,
      gradient,
    );
  }
}
