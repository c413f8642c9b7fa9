/** The training worker's run with helper threads (stand-ins here; in the browser, nested workers): used for every training of a run, ended after, same model. */
import { describe, expect, it } from 'vitest';
import { type CrfShardData, type CrfShardHelper, crfShardService } from '../../src/core/crf';
import { crfRunnerCreate } from '../../src/workers/crf-run';
import { TINY } from '../core/crf/fixtures';

function helperInProcess(): CrfShardHelper & { calls: number } {
  const service = crfShardService();
  const helper = {
    calls: 0,
    load: async (shards: CrfShardData[]) => service.load(structuredClone(shards)),
    evaluate: async (weights: Float64Array) => {
      helper.calls++;
      return structuredClone(service.evaluate(structuredClone(weights)));
    },
  };
  return helper;
}

describe('crf worker run module with helper threads', () => {
  it('cross-validation and the final model share the helpers, which end after; the model is the one-thread model', async () => {
    const request = { sequences: TINY, maxIterations: 15, folds: 3, seed: 2 };
    const alone = await crfRunnerCreate().train(request, () => {});
    const started: { helper: ReturnType<typeof helperInProcess>; ended: boolean }[] = [];
    const runner = crfRunnerCreate(undefined, () => {
      const run = { helper: helperInProcess(), ended: false };
      started.push(run);
      return { helpers: [run.helper], end: () => (run.ended = true) };
    });
    const shared = await runner.train(request, () => {});
    expect(started).toHaveLength(1);
    expect(started[0]?.ended).toBe(true);
    // Asked in each of the 3 folds and the final training.
    expect(started[0]?.helper.calls).toBeGreaterThan(shared.training.evaluations);
    expect(shared.modelJson).toBe(alone.modelJson);
    expect(shared.crossValidation).toEqual(alone.crossValidation);
  });

  it('ends the helpers when training fails', async () => {
    let ended = false;
    const runner = crfRunnerCreate(undefined, () => ({ helpers: [helperInProcess()], end: () => (ended = true) }));
    await expect(runner.train({ sequences: [], maxIterations: 5 }, () => {})).rejects.toThrow(/no labelled utterances/);
    expect(ended).toBe(true);
  });
});
