import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { agreementCompute, layersAlign, type AgreementReport, type AlignLayer } from '../../../src/core/agreement';
import { corpusArb, iob2ById, slotOf } from './arbitraries';
import { referenceRun, type NltkAnswer, type ReferenceRequest } from './reference';

const TOLERANCE = 1e-9;

/**
 * NLTK AnnotationTask triples (coder, item, slot type): one item per token. `complete` keeps only
 * utterances every layer holds, as NLTK's kappa and pi assume (they divide by the number of items).
 */
function nltkData(layers: readonly AlignLayer[], complete: boolean): [string, string, string][] {
  const maps = layers.map(iob2ById);
  const ids = new Set(maps.flatMap((m) => [...m.keys()]));
  const data: [string, string, string][] = [];
  for (const id of ids) {
    const held = maps.filter((m) => m.has(id));
    if (complete && held.length !== maps.length) continue;
    maps.forEach((m, l) => {
      m.get(id)?.iob2.forEach((tag, t) => data.push([layers[l]?.name ?? '', `${id}#${String(t)}`, slotOf(tag)]));
    });
  }
  return data;
}

function answerValue(answer: NltkAnswer, measure: string): number | null | { error: string } {
  return answer[measure] ?? null;
}

describe('three or more layers against NLTK nltk.metrics.agreement.AnnotationTask', () => {
  it("Fleiss' kappa equals NLTK's multi-pi, and the mean pairwise Cohen kappa equals NLTK's kappa (complete data)", () => {
    const corpora = fc.sample(corpusArb({ min: 3, max: 5 }, 0), { seed: 7, numRuns: 60 });
    const reports: AgreementReport[] = [];
    const requests: ReferenceRequest[] = corpora.map((layers) => {
      const aligned = layersAlign(layers);
      if (!aligned.ok) throw new Error(JSON.stringify(aligned.errors));
      reports.push(agreementCompute(aligned.corpus, { bootstrap: 0 }));
      return { op: 'nltk', data: nltkData(layers, true), measures: ['pi', 'kappa'] };
    });
    const answers = referenceRun(requests) as NltkAnswer[];
    let compared = 0;
    reports.forEach((report, i) => {
      const answer = answers[i] ?? {};
      const fleiss = report.fleissKappa?.slot;
      const pi = answerValue(answer, 'pi');
      // Outside reference: NLTK AnnotationTask.pi (Scott 1955 generalised, "multi-pi", Siegel & Castellan's K),
      // which on a complete item-by-coder table is Fleiss' (1971) kappa: avg_Ao is P̄, Ae is Σ p_j².
      if (fleiss?.value === null || fleiss === undefined) {
        // Undefined for us (one category, or no item): NLTK then divides by zero (or has no items).
        expect(pi === null || typeof pi === 'object', JSON.stringify(answer)).toBe(true);
      } else {
        expect(typeof pi).toBe('number');
        expect(Math.abs(fleiss.value - (pi as number))).toBeLessThanOrEqual(TOLERANCE);
        compared++;
      }
      // Outside reference: NLTK AnnotationTask.kappa averages Cohen's kappa over coder pairs (its docstring:
      // "Averages naively over kappas for each coder pair"); compare with the mean of our pairwise matrix.
      const matrix = report.pairwise?.kappa ?? [];
      const pairs: (number | null)[] = [];
      matrix.forEach((row, a) => row.forEach((value, b) => b > a && pairs.push(value)));
      const kappa = answerValue(answer, 'kappa');
      if (pairs.every((v): v is number => v !== null) && pairs.length > 0) {
        expect(typeof kappa).toBe('number');
        const mean = pairs.reduce((s, v) => s + v, 0) / pairs.length;
        expect(Math.abs(mean - (kappa as number))).toBeLessThanOrEqual(TOLERANCE);
      } else {
        expect(kappa === null || typeof kappa === 'object', JSON.stringify(answer)).toBe(true);
      }
    });
    expect(compared).toBeGreaterThan(reports.length * 0.7);
  });

  it("Krippendorff's alpha equals NLTK's alpha, with utterances missing from some layers", () => {
    const corpora = fc.sample(corpusArb({ min: 3, max: 5 }, 0.35), { seed: 11, numRuns: 80 });
    const reports: AgreementReport[] = [];
    const requests: ReferenceRequest[] = corpora.flatMap((layers): ReferenceRequest[] => {
      const aligned = layersAlign(layers);
      if (!aligned.ok) throw new Error(JSON.stringify(aligned.errors));
      reports.push(agreementCompute(aligned.corpus, { bootstrap: 0 }));
      return [
        { op: 'nltk', data: nltkData(layers, false), measures: ['alpha'] },
        { op: 'nltk', data: nltkData(layers, true), measures: ['pi'] },
      ];
    });
    const answers = referenceRun(requests) as NltkAnswer[];
    let compared = 0;
    let withMissing = 0;
    reports.forEach((report, i) => {
      const alpha = report.alpha?.slot;
      const reference = answerValue(answers[2 * i] ?? {}, 'alpha');
      // Fleiss' kappa takes only the utterances every layer holds: NLTK's pi on that complete subset.
      const pi = answerValue(answers[2 * i + 1] ?? {}, 'pi');
      const fleiss = report.fleissKappa?.slot.value ?? null;
      if (fleiss !== null) expect(Math.abs(fleiss - (pi as number))).toBeLessThanOrEqual(TOLERANCE);
      else expect(pi === null || typeof pi === 'object', JSON.stringify(pi)).toBe(true);
      if (alpha !== undefined && alpha.n < alpha.units * report.layers.length) withMissing++; // some pairable unit lacks a value
      // Outside reference: NLTK AnnotationTask.alpha (Krippendorff), which drops items with fewer than two
      // values as Krippendorff (2011) does. Where alpha is undefined for us NLTK returns 1 when only one
      // label occurs at all, and raises (ZeroDivisionError) when only dropped items carried other labels.
      if (alpha?.value === null || alpha === undefined) {
        expect(reference === 1 || reference === null || typeof reference === 'object', JSON.stringify(reference)).toBe(true);
      } else {
        expect(typeof reference).toBe('number');
        expect(Math.abs(alpha.value - (reference as number))).toBeLessThanOrEqual(TOLERANCE);
        compared++;
      }
    });
    expect(compared).toBeGreaterThan(reports.length * 0.7);
    expect(withMissing).toBeGreaterThan(reports.length * 0.25);
  });
});
