import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { agreementCompute, layersAlign, type AgreementReport, type AlignLayer } from '../../../src/core/agreement';
import { corpusArb, iob2ById, slotOf } from './arbitraries';
import { referenceRun, type ReferenceRequest } from './reference';

const TOLERANCE = 1e-9;

/** The pair's labels, built from tag strings (`tagsConvert` to IOB2), independently of the core's codes. */
function pairLabels(layers: readonly AlignLayer[], a: number, b: number) {
  const left = iob2ById(layers[a] as AlignLayer);
  const right = iob2ById(layers[b] as AlignLayer);
  const tagsA: string[] = [];
  const tagsB: string[] = [];
  const intentsA: string[] = [];
  const intentsB: string[] = [];
  for (const [id, x] of left) {
    const y = right.get(id);
    if (y === undefined) continue;
    tagsA.push(...x.iob2);
    tagsB.push(...y.iob2);
    if (x.intent !== undefined && y.intent !== undefined) {
      intentsA.push(x.intent);
      intentsB.push(y.intent);
    }
  }
  const slotsA = tagsA.map(slotOf);
  const slotsB = tagsB.map(slotOf);
  const annotated = slotsA.map((s, i) => s !== 'O' || slotsB[i] !== 'O');
  return {
    tagsA,
    tagsB,
    slotsA,
    slotsB,
    annotatedA: slotsA.filter((_, i) => annotated[i]),
    annotatedB: slotsB.filter((_, i) => annotated[i]),
    intentsA,
    intentsB,
    slots: [...new Set([...slotsA, ...slotsB])].filter((s) => s !== 'O').sort(),
  };
}

function expectSame(ours: number | null, reference: unknown, what: string): void {
  if (reference === null) {
    expect(ours, `${what}: reference says undefined`).toBeNull();
  } else {
    expect(ours, `${what}: reference says ${String(reference)}`).not.toBeNull();
    expect(Math.abs((ours ?? 0) - (reference as number)), what).toBeLessThanOrEqual(TOLERANCE);
  }
}

describe("two-layer kappas against scikit-learn's cohen_kappa_score", () => {
  it('match on seeded random corpora (mixed schemes, illegal IOB2, missing utterances, shuffled order)', () => {
    const corpora = fc.sample(corpusArb({ min: 2, max: 3 }, 0.25), { seed: 42, numRuns: 250 });
    const cases: { report: AgreementReport; labels: ReturnType<typeof pairLabels>; first: number }[] = [];
    const requests: ReferenceRequest[] = [];
    corpora.forEach((layers, k) => {
      const aligned = layersAlign(layers);
      if (!aligned.ok) throw new Error(JSON.stringify(aligned.errors));
      const pair: [number, number] = layers.length === 3 && k % 2 === 1 ? [2, 0] : [0, 1];
      const report = agreementCompute(aligned.corpus, { bootstrap: 0, layers: pair });
      const labels = pairLabels(layers, pair[0], pair[1]);
      cases.push({ report, labels, first: requests.length });
      requests.push(
        { op: 'cohen', a: labels.tagsA, b: labels.tagsB },
        { op: 'cohen', a: labels.slotsA, b: labels.slotsB },
        { op: 'cohen', a: labels.annotatedA, b: labels.annotatedB },
        { op: 'cohen', a: labels.intentsA, b: labels.intentsB },
        // One-vs-rest per slot: this slot against everything else.
        ...labels.slots.map((slot): ReferenceRequest => ({
          op: 'cohen',
          a: labels.slotsA.map((s) => (s === slot ? slot : 'rest')),
          b: labels.slotsB.map((s) => (s === slot ? slot : 'rest')),
        })),
      );
    });
    // Outside reference: sklearn.metrics.cohen_kappa_score (Debian python3-sklearn), Cohen (1960).
    const answers = referenceRun(requests);
    let defined = 0;
    for (const { report, labels, first } of cases) {
      expect(report.tokens).toBe(labels.tagsA.length);
      expectSame(report.kappa.tag.value, answers[first], 'kappa.tag');
      expectSame(report.kappa.slot.value, answers[first + 1], 'kappa.slot');
      expectSame(report.kappa.slotAnnotated.value, answers[first + 2], 'kappa.slotAnnotated');
      if (report.intent !== null) {
        expect(report.intent.n).toBe(labels.intentsA.length);
        expectSame(report.intent.kappa.value, answers[first + 3], 'intent.kappa');
      } else {
        expect(labels.intentsA).toHaveLength(0);
      }
      expect(Object.keys(report.perSlot).sort()).toEqual(labels.slots);
      labels.slots.forEach((slot, i) => expectSame(report.perSlot[slot]?.kappa.value ?? null, answers[first + 4 + i], `perSlot.${slot}`));
      if (report.kappa.tag.value !== null) defined++;
    }
    // The batch must mostly exercise defined kappas, not only degenerate corpora.
    expect(defined).toBeGreaterThan(cases.length * 0.7);
  });
});
