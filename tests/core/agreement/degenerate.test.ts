import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  agreementCompute,
  layersAlign,
  REASON_EMPTY,
  REASON_EXPECTED_ONE,
  REASON_NO_PAIRABLE,
  REASON_NO_SPANS,
  type AgreementOptions,
  type AgreementReport,
  type AlignLayer,
} from '../../../src/core/agreement';
import type { Utterance } from '../../../src/core/types';
import { corpusArb } from './arbitraries';

function one(id: string, tags: readonly string[], intent?: string): Utterance {
  const words = tags.map((_, t) => `w${String(t)}`);
  let at = 0;
  const tokens = words.map((w) => {
    const token = { start: at, end: at + w.length };
    at += w.length + 1;
    return token;
  });
  const utterance: Utterance = { id, text: words.join(' '), tokens, tags: [...tags], meta: {} };
  if (intent !== undefined) utterance.intent = intent;
  return utterance;
}

function reportOf(layers: readonly Utterance[][], options: AgreementOptions = { bootstrap: 0 }): AgreementReport {
  const named: AlignLayer[] = layers.map((utterances, l) => ({ name: `ann-${String(l)}`, scheme: 'iob2', utterances }));
  const aligned = layersAlign(named);
  if (!aligned.ok) throw new Error(JSON.stringify(aligned.errors));
  return agreementCompute(aligned.corpus, options);
}

/** Every number in the report is finite: undefined figures are null with a reason instead. */
function finiteEverywhere(value: unknown): boolean {
  if (typeof value === 'number') return Number.isFinite(value);
  if (Array.isArray(value)) return value.every(finiteEverywhere);
  if (value !== null && typeof value === 'object') return Object.values(value).every(finiteEverywhere);
  return true;
}

describe('undefined figures are null with a reason, never NaN', () => {
  it('empty input', () => {
    const report = reportOf([[], []], { bootstrap: 50 });
    expect(report).toMatchObject({ utterances: 0, tokens: 0, intent: null, perSlot: {}, disagreements: { total: 0, items: [] } });
    for (const figure of [report.kappa.tag, report.kappa.slot, report.kappa.slotAnnotated]) {
      expect(figure).toEqual({ value: null, reason: REASON_EMPTY, observed: null, expected: null, n: 0 });
    }
    expect(report.spans).toMatchObject({ exactF1: null, overlapF1: null, reason: REASON_NO_SPANS, a: 0, b: 0 });
    expect(report.confusion).toEqual({ labels: ['O'], counts: [[0]] });
    expect(report.ci?.kappaTag).toMatchObject({ low: null, high: null, reason: expect.any(String) as unknown });
    expect(report.ci?.intentKappa).toBeNull();
    expect(finiteEverywhere(report)).toBe(true);
  });

  it('a single category (everything O, one intent): expected agreement 1', () => {
    const report = reportOf([
      [one('hr-1', ['O', 'O'], 'cancel'), one('hr-2', ['O'], 'cancel')],
      [one('hr-1', ['O', 'O'], 'cancel'), one('hr-2', ['O'], 'cancel')],
    ]);
    expect(report.kappa.tag).toEqual({ value: null, reason: REASON_EXPECTED_ONE, observed: 1, expected: 1, n: 3 });
    expect(report.kappa.slot.reason).toBe(REASON_EXPECTED_ONE);
    // No token carries a slot in either layer, so the slot-only figure has nothing to compare.
    expect(report.kappa.slotAnnotated).toMatchObject({ value: null, reason: REASON_EMPTY, n: 0 });
    expect(report.intent?.kappa).toMatchObject({ value: null, reason: REASON_EXPECTED_ONE, n: 2 });
    expect(report.spans.reason).toBe(REASON_NO_SPANS);
  });

  it('one slot on every token in both layers: expected agreement 1 although spans agree', () => {
    const report = reportOf([[one('hr-1', ['B-day']), one('hr-2', ['B-day'])], [one('hr-1', ['B-day']), one('hr-2', ['B-day'])]]);
    expect(report.kappa.tag.reason).toBe(REASON_EXPECTED_ONE);
    expect(report.kappa.slotAnnotated.reason).toBe(REASON_EXPECTED_ONE);
    expect(report.spans.exactF1).toBe(1);
    expect(report.perSlot.day?.kappa.reason).toBe(REASON_EXPECTED_ONE);
  });

  it('two layers each using one different category is defined: kappa 0', () => {
    // Cohen (1960): P_o = 0 and P_e = 0 give κ = 0; only P_e = 1 is undefined.
    const report = reportOf([[one('hr-1', ['O', 'O'])], [one('hr-1', ['B-day', 'B-day'])]]);
    expect(report.kappa.tag).toEqual({ value: 0, observed: 0, expected: 0, n: 2 });
  });

  it('no utterance shared: nothing to compare, and no pairable unit for alpha', () => {
    const report = reportOf([[one('hr-1', ['B-day'])], [one('hr-2', ['B-day'])], [one('hr-3', ['O'])]]);
    expect(report.tokens).toBe(0);
    expect(report.kappa.slot.reason).toBe(REASON_EMPTY);
    expect(report.fleissKappa?.slot).toMatchObject({ value: null, reason: REASON_EMPTY, utterances: 0 });
    expect(report.alpha?.slot).toMatchObject({ value: null, reason: REASON_NO_PAIRABLE, units: 0 });
    expect(report.pairwise?.kappa[0]?.[1]).toBeNull();
  });

  it('intents in one layer only: an intent figure with nothing to compare', () => {
    const report = reportOf([[one('hr-1', ['O'], 'book_visit')], [one('hr-1', ['O'])]]);
    expect(report.intent).toMatchObject({ n: 0, kappa: { value: null, reason: REASON_EMPTY } });
  });

  it('no NaN or Infinity on random corpora, degenerate ones included', () => {
    fc.assert(
      fc.property(corpusArb({ min: 2, max: 4 }, 0.5), (layers) => {
        const aligned = layersAlign(layers);
        if (!aligned.ok) throw new Error(JSON.stringify(aligned.errors));
        const report = agreementCompute(aligned.corpus, { bootstrap: 20, seed: 3 });
        expect(finiteEverywhere(report)).toBe(true);
        for (const figure of [report.kappa.tag, report.kappa.slot, report.kappa.slotAnnotated, report.intent?.kappa]) {
          if (figure !== undefined && figure.value === null) expect(figure.reason).toEqual(expect.any(String));
        }
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});

describe('agreementCompute options', () => {
  const layers = [[one('hr-1', ['O'])], [one('hr-1', ['O'])]];
  it.each([
    [{ layers: [0, 0] as const }],
    [{ layers: [0, 2] as const }],
    [{ bootstrap: -1 }],
    [{ bootstrap: 1.5 }],
    [{ confidence: 1 }],
    [{ confidence: 0 }],
    [{ disagreementLimit: -1 }],
  ])('rejects %j', (options) => {
    expect(() => reportOf(layers, options)).toThrow(RangeError);
  });

  it('needs two layers', () => {
    expect(() => reportOf([[one('hr-1', ['O'])]])).toThrow(RangeError);
  });
});
