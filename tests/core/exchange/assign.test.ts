import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { assignmentByAnnotator, assignmentDoubles, assignmentPlan, assignmentProblem } from '../../../src/core/exchange/assign';

const ANNOTATORS = ['ana', 'ben', 'chloe', 'dev', 'emi', 'femi', 'gus', 'hal'];
const input = fc.record({
  n: fc.integer({ min: 1, max: 300 }),
  k: fc.integer({ min: 2, max: 8 }),
  // Percent steps, as the screen offers.
  percent: fc.integer({ min: 0, max: 100 }),
  seed: fc.integer({ min: 0, max: 0xffffffff }),
});
const ids = (n: number) => Array.from({ length: n }, (_, i) => `hr-${String(i + 1).padStart(5, '0')}`);
const spread = (values: number[]) => Math.max(...values) - Math.min(...values);

describe('assignmentPlan', () => {
  it('sends exactly round(f·N) utterances to two annotators and every other one to one', () => {
    fc.assert(
      fc.property(input, ({ n, k, percent, seed }) => {
        const plan = assignmentPlan(ids(n), ANNOTATORS.slice(0, k), percent / 100, seed);
        const twice = plan.items.filter((i) => i.annotators.length === 2).length;
        expect(twice).toBe(Math.round((percent / 100) * n));
        expect(plan.doubles).toBe(twice);
        expect(plan.items.every((i) => i.annotators.length === 1 || (i.annotators.length === 2 && i.annotators[0] !== i.annotators[1]))).toBe(true);
        expect(plan.items.map((i) => i.id)).toEqual(ids(n));
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('balances loads within one, and pair counts within one while singles are plenty (within two always)', () => {
    fc.assert(
      fc.property(input, ({ n, k, percent, seed }) => {
        const plan = assignmentPlan(ids(n), ANNOTATORS.slice(0, k), percent / 100, seed);
        const byAnnotator = assignmentByAnnotator(plan);
        const loads = ANNOTATORS.slice(0, k).map((a) => byAnnotator.get(a)?.length ?? -1);
        expect(loads).toEqual(ANNOTATORS.slice(0, k).map((a) => plan.loads[a]));
        expect(spread(loads)).toBeLessThanOrEqual(1);
        expect(loads.reduce((s, x) => s + x, 0)).toBe(n + plan.doubles);
        const pairCounts = plan.pairs.map((p) => p.count);
        expect(pairCounts.reduce((s, x) => s + x, 0)).toBe(plan.doubles);
        expect(spread(pairCounts)).toBeLessThanOrEqual(percent <= 50 ? 1 : 2);
        // Pair counts agree with the items.
        for (const p of plan.pairs) expect(plan.items.filter((i) => i.annotators.includes(p.a) && i.annotators.includes(p.b)).length).toBe(p.count);
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('gives the same plan for the same seed, and another for another seed', () => {
    fc.assert(
      fc.property(input, ({ n, k, percent, seed }) => {
        const a = ANNOTATORS.slice(0, k);
        expect(assignmentPlan(ids(n), a, percent / 100, seed)).toEqual(assignmentPlan(ids(n), a, percent / 100, seed));
      }),
      { seed: 42, numRuns: 100 },
    );
    const first = assignmentPlan(ids(200), ['ana', 'ben'], 0.2, 1);
    const second = assignmentPlan(ids(200), ['ana', 'ben'], 0.2, 2);
    expect(first.items).not.toEqual(second.items);
  });

  it('rounds halves up and refuses impossible plans', () => {
    // 0.25 · 10 = 2.5 → 3 (Math.round, halves up).
    expect(assignmentDoubles(10, 0.25)).toBe(3);
    expect(assignmentProblem(10, [], 0.2)).toMatch(/at least one annotator/);
    expect(assignmentProblem(10, ['ana'], 0.2)).toMatch(/two annotators/);
    expect(assignmentProblem(10, ['ana', 'ana'], 0.2)).toMatch(/once/);
    expect(assignmentProblem(10, ['ana', 'ben'], 1.5)).toMatch(/between 0 and 100/);
    expect(assignmentProblem(0, ['ana', 'ben'], 0.2)).toMatch(/No utterances/);
    expect(() => assignmentPlan(ids(4), ['ana'], 0.5, 1)).toThrow(RangeError);
    // One annotator without overlap is fine: everything goes to them.
    expect(assignmentPlan(ids(4), ['ana'], 0, 1).loads).toEqual({ ana: 4 });
  });
});
