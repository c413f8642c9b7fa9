import { describe, expect, it } from 'vitest';
import { spansEvaluate } from '../../../../src/core/crf';
import type { CrossValidation } from '../../../../src/core/crf';
import { crossValidationReading, slotRows, trainProgressShare, trainProgressText } from '../../../../src/ui/features/model/model-reading';

/** A cross-validation of one fold's worth of tags, counted by the core's CoNLL-2000 span scorer. */
function cvOf(gold: string[][], predicted: string[][]): CrossValidation {
  const pooled = spansEvaluate(gold, predicted);
  return { folds: 2, pooled, perFold: [pooled] };
}

describe('model readings', () => {
  it('rows per slot carry the gold span count and come sorted by name', () => {
    const cv = cvOf(
      [['B-service', 'O', 'B-day'], ['B-day', 'I-day', 'O']],
      [['B-service', 'O', 'O'], ['B-day', 'O', 'O']],
    );
    const rows = slotRows(cv);
    expect(rows.map((r) => r.slot)).toEqual(['day', 'service']);
    // day: two gold spans, the one prediction covers only part of "B-day I-day", so no exact match.
    expect(rows[0]).toMatchObject({ support: 2, truePositives: 0, falsePositives: 1, f1: 0 });
    expect(rows[1]).toMatchObject({ support: 1, truePositives: 1, f1: 1 });
  });

  it('the reading names weak slots, or says every slot is a good start', () => {
    const weak = cvOf([['B-service', 'B-day']], [['B-service', 'O']]);
    expect(crossValidationReading(weak)).toContain('check suggestions for day closely');
    const good = cvOf([['B-service', 'B-day']], [['B-service', 'B-day']]);
    expect(crossValidationReading(good)).toContain('a good start on every slot');
    expect(crossValidationReading(good)).toContain('F1 1.00');
    expect(crossValidationReading(cvOf([['O']], [['O']]))).toContain('no slot spans');
  });

  it('progress counts every fold and the final training', () => {
    const p = { phase: 'cross-validating' as const, fold: 1, folds: 3, iteration: 4, maxIterations: 10, loss: 12.345 };
    expect(trainProgressShare(p)).toEqual({ value: 14, max: 40 });
    expect(trainProgressShare({ ...p, phase: 'training', fold: 0, iteration: 10 })).toEqual({ value: 40, max: 40 });
    expect(trainProgressShare({ ...p, phase: 'training', fold: 0, folds: 0, iteration: 3 })).toEqual({ value: 3, max: 10 });
    expect(trainProgressText(p)).toBe('Cross-validating, fold 2 of 3: iteration 4 of at most 10, objective 12.35');
  });
});
