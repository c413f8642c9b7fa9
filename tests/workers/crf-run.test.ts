import { describe, expect, it } from 'vitest';
import { crfModelFromJson, CrfTrainCancelledError } from '../../src/core/crf';
import { crfModelSummary, crfRunnerCreate, type CrfRunProgress } from '../../src/workers/crf-run';
import { TINY } from '../core/crf/fixtures';

describe('crf worker run module', () => {
  it('trains with progress, returns a loadable model, then tags with confidences', async () => {
    const runner = crfRunnerCreate();
    const progress: CrfRunProgress[] = [];
    const outcome = await runner.train({ sequences: TINY, maxIterations: 60, c2: 0.01, seed: 2 }, (p) => progress.push(p));
    expect(outcome.crossValidation).toBeNull();
    expect(progress.filter((p) => p.phase === 'training' && p.iteration > 0).map((p) => p.iteration)).toEqual(
      Array.from({ length: outcome.training.iterations }, (_, i) => i + 1),
    );
    expect(crfModelFromJson(outcome.modelJson).training.seed).toBe(2);
    const tagged = runner.tag(TINY.map((s) => s.words));
    tagged.forEach((item, i) => {
      expect(item.tags).toEqual(TINY[i]?.tags);
      expect(item.confidence).toHaveLength(item.tags.length);
      expect(item.leastConfidence).toBeGreaterThanOrEqual(0);
      expect(item.leastConfidence).toBeLessThan(0.5);
    });
  });

  it('cross-validates first when asked, reporting each fold', async () => {
    const runner = crfRunnerCreate();
    const folds = new Set<number>();
    const outcome = await runner.train({ sequences: TINY, maxIterations: 10, folds: 4, seed: 1 }, (p) => {
      if (p.phase === 'cross-validating') folds.add(p.fold);
    });
    expect(folds).toEqual(new Set([0, 1, 2, 3]));
    expect(outcome.crossValidation?.pooled.utterances).toBe(TINY.length);
  });

  it('a cancel arriving as a separate task stops training between iterations', async () => {
    const runner = crfRunnerCreate();
    let last = 0;
    // The cancel comes from a timer, like a message the worker reads while training yields.
    const run = runner.train({ sequences: TINY, maxIterations: 500, c2: 1e-6 }, (p) => {
      last = p.iteration;
      if (p.iteration === 2) setTimeout(() => runner.cancel(), 0);
    });
    await expect(run).rejects.toBeInstanceOf(CrfTrainCancelledError);
    expect(last).toBeGreaterThanOrEqual(2);
    expect(last).toBeLessThan(10);
  });

  it('tags with a model loaded from its file', async () => {
    const trainer = crfRunnerCreate();
    const { modelJson } = await trainer.train({ sequences: TINY, maxIterations: 40 }, () => {});
    const tagger = crfRunnerCreate();
    expect(() => tagger.tag([['hello']])).toThrow(/no model/);
    expect(tagger.modelLoad(modelJson)[0]).toBe('O');
    expect(tagger.tag([['book', 'a', 'plumber']])[0]?.tags).toEqual(trainer.tag([['book', 'a', 'plumber']])[0]?.tags);
  });

  it('summarises a model file for the Model screen, and says why a broken one cannot be read', async () => {
    const { modelJson } = await crfRunnerCreate().train({ sequences: TINY, maxIterations: 10 }, () => {});
    const model = crfModelFromJson(modelJson);
    expect(crfModelSummary(modelJson)).toEqual({ ok: true, labels: model.labels.length, training: model.training });
    expect(crfModelSummary('{"format":"something else"}')).toMatchObject({ ok: false, message: expect.stringMatching(/not a/) as unknown as string });
    expect(crfModelSummary('not json')).toMatchObject({ ok: false, message: expect.stringMatching(/not JSON/) as unknown as string });
  });
});
