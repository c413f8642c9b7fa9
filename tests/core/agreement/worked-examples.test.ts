import { describe, expect, it } from 'vitest';
import { agreementCompute, layersAlign, type AlignLayer } from '../../../src/core/agreement';
import type { Utterance } from '../../../src/core/types';
import { referenceRun, type NltkAnswer } from './reference';

const TOLERANCE = 1e-9;

/** One single-token utterance per unit; a value v becomes slot `v<v>` (B-v3), null leaves the unit out. */
function layersFromTable(observers: readonly (readonly (number | null)[])[]): AlignLayer[] {
  return observers.map((values, o) => {
    const utterances: Utterance[] = [];
    values.forEach((value, u) => {
      if (value === null) return;
      utterances.push({ id: `unit-${String(u + 1)}`, text: 'x', tokens: [{ start: 0, end: 1 }], tags: [`B-v${String(value)}`], meta: {} });
    });
    return { name: `observer-${String(o + 1)}`, scheme: 'iob2', utterances };
  });
}

function nltkTriples(observers: readonly (readonly (number | null)[])[]): [string, string, string][] {
  return observers.flatMap((values, o) =>
    values.flatMap((value, u): [string, string, string][] => (value === null ? [] : [[`observer-${String(o + 1)}`, `unit-${String(u + 1)}`, `v${String(value)}`]])),
  );
}

describe('published worked examples', () => {
  it("Fleiss' kappa: 10 subjects, 14 raters, 5 categories gives 0.210", () => {
    // From memory: the 10 × 14 × 5 table widely used to illustrate Fleiss' (1971) statistic (it is the
    // example in the Wikipedia article on Fleiss' kappa; Fleiss's own paper, also from memory, uses
    // 30 patients rated by 6 psychiatrists). Rows are subjects, columns the count of raters per category.
    // The recalled table reproduces the recalled value: P̄ ≈ 0.378, P_e ≈ 0.213, κ ≈ 0.210.
    const counts = [
      [0, 0, 0, 0, 14],
      [0, 2, 6, 4, 2],
      [0, 0, 3, 5, 6],
      [0, 3, 9, 2, 0],
      [2, 2, 8, 1, 1],
      [7, 7, 0, 0, 0],
      [3, 2, 6, 3, 0],
      [2, 5, 3, 2, 2],
      [6, 5, 2, 1, 0],
      [0, 2, 2, 3, 7],
    ];
    // Fleiss' kappa ignores which rater gave which rating, so raters are dealt out in category order.
    const observers = Array.from({ length: 14 }, () => new Array<number | null>(counts.length).fill(null));
    counts.forEach((row, subject) => {
      let rater = 0;
      row.forEach((n, category) => {
        for (let k = 0; k < n; k++) (observers[rater++] ?? [])[subject] = category + 1;
      });
    });
    const aligned = layersAlign(layersFromTable(observers));
    if (!aligned.ok) throw new Error(JSON.stringify(aligned.errors));
    const fleiss = agreementCompute(aligned.corpus, { bootstrap: 0 }).fleissKappa?.slot;
    expect(fleiss?.n).toBe(10);
    expect(fleiss?.raters).toBe(14);
    expect(fleiss?.value).toBeCloseTo(0.21, 3); // from memory: κ = 0.210
    expect(fleiss?.observed).toBeCloseTo(0.378, 3); // from memory: P̄ = 0.378
    expect(fleiss?.expected).toBeCloseTo(0.213, 3); // from memory: P_e = 0.213
    // Outside reference: NLTK AnnotationTask.pi (multi-pi), Fleiss' kappa on complete data.
    const [answer] = referenceRun([{ op: 'nltk', data: nltkTriples(observers), measures: ['pi'] }]) as NltkAnswer[];
    expect(Math.abs((fleiss?.value ?? 0) - (answer?.pi as number))).toBeLessThanOrEqual(TOLERANCE);
  });

  it("Krippendorff's alpha: 4 observers, 12 units, nominal values with missing data gives 0.743", () => {
    // From memory: the nominal-data example of Krippendorff (2011), "Computing Krippendorff's
    // Alpha-Reliability", section C (observers A-D, units 1-12, '.' = missing; unit 12 has one value
    // and is not pairable). The recalled table reproduces the recalled α = 0.743.
    const observers = [
      [1, 2, 3, 3, 2, 1, 4, 1, 2, null, null, null],
      [1, 2, 3, 3, 2, 2, 4, 1, 2, 5, null, 3],
      [null, 3, 3, 3, 2, 3, 4, 2, 2, 5, 1, null],
      [1, 2, 3, 3, 2, 4, 4, 1, 2, 5, 1, null],
    ];
    const aligned = layersAlign(layersFromTable(observers));
    if (!aligned.ok) throw new Error(JSON.stringify(aligned.errors));
    const alpha = agreementCompute(aligned.corpus, { bootstrap: 0 }).alpha?.slot;
    expect(alpha?.units).toBe(11);
    expect(alpha?.n).toBe(40); // pairable values n.., counted from the table above
    expect(alpha?.value).toBeCloseTo(0.743, 3); // from memory: α = 0.743
    // Outside reference: NLTK AnnotationTask.alpha on the same triples.
    const [answer] = referenceRun([{ op: 'nltk', data: nltkTriples(observers), measures: ['alpha'] }]) as NltkAnswer[];
    expect(Math.abs((alpha?.value ?? 0) - (answer?.alpha as number))).toBeLessThanOrEqual(TOLERANCE);
  });
});
