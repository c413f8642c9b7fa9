import { describe, expect, it } from 'vitest';
import { crfCrossValidate, foldsAssign, spansEvaluate } from '../../../src/core/crf';
import { TINY } from './fixtures';

describe('span evaluation (CoNLL-2000 exact match)', () => {
  it('counts exact spans per slot, worked by hand', () => {
    const gold = [
      ['B-day', 'I-day', 'O', 'B-area'],
      ['O', 'B-service', 'O'],
    ];
    const predicted = [
      ['B-day', 'O', 'O', 'B-area'], // day: wrong end → 1 fp + 1 fn; area right → 1 tp
      ['O', 'B-service', 'O'], // service right → 1 tp
    ];
    const result = spansEvaluate(gold, predicted);
    expect(result.slots.day).toMatchObject({ truePositives: 0, falsePositives: 1, falseNegatives: 1, f1: 0 });
    expect(result.slots.area).toMatchObject({ truePositives: 1, falsePositives: 0, falseNegatives: 0, f1: 1 });
    // Overall: tp 2, fp 1, fn 1 → P = R = 2/3, F1 = 2/3.
    expect(result.overall.f1).toBeCloseTo(2 / 3, 12);
    expect(result.exactUtterances).toBe(1);
    expect(Object.keys(result.slots)).toEqual(['area', 'day', 'service']);
  });

  it('reads a stray I-X as starting a span, as conlleval does', () => {
    const result = spansEvaluate([['O', 'I-day']], [['O', 'B-day']]);
    expect(result.overall.f1).toBe(1);
  });
});

describe('k-fold cross-validation', () => {
  it('deals seeded folds whose sizes differ by at most one', () => {
    const folds = foldsAssign(23, 5, 9);
    const sizes = [0, 1, 2, 3, 4].map((k) => folds.filter((f) => f === k).length);
    expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
    expect(Array.from(foldsAssign(23, 5, 9))).toEqual(Array.from(folds));
    expect(Array.from(foldsAssign(23, 5, 10))).not.toEqual(Array.from(folds));
  });

  it('tests every utterance once and pools the counts', async () => {
    const progress: number[] = [];
    const result = await crfCrossValidate(TINY, { folds: 4, seed: 1, maxIterations: 20, onProgress: (p) => void progress.push(p.fold) });
    expect(result.perFold).toHaveLength(4);
    expect(result.pooled.utterances).toBe(TINY.length);
    expect(result.perFold.reduce((n, f) => n + f.overall.truePositives, 0)).toBe(result.pooled.overall.truePositives);
    expect(new Set(progress)).toEqual(new Set([0, 1, 2, 3]));
  });
});
