import type { CrfObjective } from './objective';
import type { CrfShardData, CrfShardHelper, CrfShardValue } from './shard';

/**
 * The objective with its shards spread over this thread and helper threads: shard k goes to thread
 * k mod T (thread 0 is this one), T = min(helpers + 1, shards). Values are combined in shard order,
 * so the result is bit-identical to `CrfObjective.evaluate`. A helper that fails (load or evaluate)
 * is dropped and its shards are computed here from then on, with the same result.
 */
export class CrfThreadedObjective {
  private readonly mine: number[] = [];
  private readonly theirs: { helper: CrfShardHelper; shards: number[] }[] = [];

  constructor(
    private readonly objective: CrfObjective,
    helpers: readonly CrfShardHelper[],
  ) {
    const threads = Math.min(helpers.length + 1, objective.shards.length);
    for (let t = 1; t < threads; t++) this.theirs.push({ helper: helpers[t - 1] as CrfShardHelper, shards: [] });
    objective.shards.forEach((_, k) => {
      const t = k % threads;
      if (t === 0) this.mine.push(k);
      else this.theirs[t - 1]?.shards.push(k);
    });
  }

  /** Threads in use (this one included). */
  get threads(): number {
    return this.theirs.length + 1;
  }

  /** Hand each helper its shards. */
  async start(): Promise<void> {
    const loads = this.theirs.map(async (part) => {
      try {
        await part.helper.load(part.shards.map((k) => this.objective.shards[k] as CrfShardData));
        return true;
      } catch {
        return false;
      }
    });
    const loaded = await Promise.all(loads);
    this.dropFailed(loaded);
  }

  private dropFailed(ok: readonly boolean[]): void {
    for (let i = ok.length - 1; i >= 0; i--) {
      if (ok[i] === true) continue;
      const [part] = this.theirs.splice(i, 1);
      if (part !== undefined) this.mine.push(...part.shards);
    }
    this.mine.sort((a, b) => a - b);
  }

  async evaluate(weights: Float64Array, gradient: Float64Array): Promise<number> {
    const values: (CrfShardValue | undefined)[] = this.objective.shards.map(() => undefined);
    // The helpers start first; this thread's shards run while they work.
    const asked = this.theirs.map((part) => part.helper.evaluate(weights).then((answer) => answer, () => null));
    for (const k of this.mine) values[k] = this.objective.shardEvaluate(k, weights);
    const answers = await Promise.all(asked);
    const ok = answers.map((answer, i) => answer !== null && answer.length === this.theirs[i]?.shards.length);
    answers.forEach((answer, i) => {
      if (answer === null || ok[i] !== true) return;
      this.theirs[i]?.shards.forEach((k, j) => (values[k] = answer[j]));
    });
    this.dropFailed(ok);
    for (const k of this.mine) values[k] ??= this.objective.shardEvaluate(k, weights);
    return this.objective.combine(values as CrfShardValue[], weights, gradient);
  }
}
