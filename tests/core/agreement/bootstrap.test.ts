import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { mulberry32Next } from '../../../scripts/corpus/random';
import {
  agreementCompute,
  layersAlign,
  mulberry32,
  quantileSorted,
  type AgreementIntervals,
  type AgreementReport,
  type AlignedCorpus,
  type AlignLayer,
} from '../../../src/core/agreement';
import { columnsRead } from '../../../src/core/formats';
import type { Utterance } from '../../../src/core/types';
import { corpusArb } from './arbitraries';
import { referenceRun, type ReferenceRequest } from './reference';

function sample(name: string): AlignLayer {
  const document = columnsRead(readFileSync(new URL(`../../../sample-corpus/${name}.iob2`, import.meta.url), 'utf8'), { scheme: 'iob2' });
  return { name, scheme: document.scheme, utterances: document.utterances };
}

function aligned(layers: readonly AlignLayer[]): AlignedCorpus {
  const result = layersAlign(layers);
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return result.corpus;
}

type Figure = 'kappaTag' | 'kappaSlot' | 'kappaSlotAnnotated' | 'intentKappa' | 'exactF1' | 'overlapF1';
const FIGURES: readonly Figure[] = ['kappaTag', 'kappaSlot', 'kappaSlotAnnotated', 'intentKappa', 'exactF1', 'overlapF1'];

function pointOf(report: AgreementReport, figure: Figure): number | null {
  switch (figure) {
    case 'kappaTag':
      return report.kappa.tag.value;
    case 'kappaSlot':
      return report.kappa.slot.value;
    case 'kappaSlotAnnotated':
      return report.kappa.slotAnnotated.value;
    case 'intentKappa':
      return report.intent?.kappa.value ?? null;
    case 'exactF1':
      return report.spans.exactF1;
    case 'overlapF1':
      return report.spans.overlapF1;
  }
}

describe('bootstrap confidence intervals', () => {
  const pair = aligned([sample('ann-a'), sample('ann-b')]);
  const truth = aligned([sample('truth'), sample('ann-a')]);

  it('the same seed gives the same intervals; another seed other ones', () => {
    const first = agreementCompute(pair, { bootstrap: 300, seed: 5 }).ci;
    const again = agreementCompute(pair, { bootstrap: 300, seed: 5 }).ci;
    const other = agreementCompute(pair, { bootstrap: 300, seed: 6 }).ci;
    expect(again).toEqual(first);
    expect(other?.kappaSlot).not.toEqual(first?.kappaSlot);
    expect(first).toMatchObject({ resamples: 300, seed: 5, confidence: 0.95, method: 'percentile', unit: 'utterance' });
  });

  it('each interval holds its point estimate on typical data', () => {
    for (const corpus of [pair, truth]) {
      const report = agreementCompute(corpus, { bootstrap: 1000 });
      const ci = report.ci as AgreementIntervals;
      for (const figure of FIGURES) {
        const interval = ci[figure];
        const point = pointOf(report, figure);
        expect(point, figure).not.toBeNull();
        expect(interval?.resamples, figure).toBe(1000);
        expect(interval?.low ?? Infinity, figure).toBeLessThanOrEqual(point ?? -Infinity);
        expect(interval?.high ?? -Infinity, figure).toBeGreaterThanOrEqual(point ?? Infinity);
        expect((interval?.high ?? 0) - (interval?.low ?? 0), figure).toBeGreaterThan(0);
      }
    }
  });

  it('a higher confidence gives a wider interval', () => {
    const narrow = agreementCompute(pair, { bootstrap: 400, confidence: 0.5 }).ci?.kappaSlot;
    const wide = agreementCompute(pair, { bootstrap: 400, confidence: 0.99 }).ci?.kappaSlot;
    expect((wide?.high ?? 0) - (wide?.low ?? 0)).toBeGreaterThan((narrow?.high ?? 0) - (narrow?.low ?? 0));
  });

  it('no resamples, no intervals', () => {
    expect(agreementCompute(pair, { bootstrap: 0 }).ci).toBeNull();
  });

  it('equals a naive bootstrap that rebuilds each resampled corpus, with numpy percentiles', () => {
    const corpora = fc.sample(corpusArb({ min: 2, max: 2 }, 0.2), { seed: 9, numRuns: 12 });
    const resamples = 40;
    const requests: ReferenceRequest[] = [];
    const checks: { interval: AgreementIntervals[Figure]; count: number }[] = [];
    for (const layers of corpora) {
      const corpus = aligned(layers);
      const ci = agreementCompute(corpus, { bootstrap: resamples, seed: 77, confidence: 0.9 }).ci as AgreementIntervals;
      const byId = layers.map((layer) => new Map(layer.utterances.map((u) => [u.id ?? '', u])));
      const shared = corpus.ids.filter((id) => byId.every((m) => m.has(id ?? '')));
      // The documented resampling: per resample, `shared.length` draws of mulberry32 over the shared utterances.
      const draw = mulberry32(77);
      const values = new Map<Figure, number[]>(FIGURES.map((f) => [f, []]));
      for (let r = 0; r < resamples; r++) {
        const picks = Array.from({ length: shared.length }, () => shared[draw(shared.length)] ?? '');
        const resampled = layers.map((layer, l) => ({
          ...layer,
          utterances: picks.map((id, i): Utterance => ({ ...(byId[l]?.get(id) as Utterance), id: `draw-${String(i)}` })),
        }));
        const report = agreementCompute(aligned(resampled), { bootstrap: 0 });
        for (const figure of FIGURES) {
          const value = pointOf(report, figure);
          if (value !== null) values.get(figure)?.push(value);
        }
      }
      for (const figure of FIGURES) {
        const list = values.get(figure) ?? [];
        // Figures undefined on the whole corpus have no interval to compare.
        if (ci[figure] === null || ci[figure].low === null) continue;
        checks.push({ interval: ci[figure], count: list.length });
        requests.push({ op: 'percentile', values: list, q: [5, 95] });
      }
    }
    // Outside reference: numpy.percentile (Debian python3-numpy), linear interpolation, for the percentile method.
    const answers = referenceRun(requests) as [number, number][];
    checks.forEach(({ interval, count }, i) => {
      const [low, high] = answers[i] ?? [NaN, NaN];
      expect(interval?.resamples).toBe(count);
      expect(Math.abs((interval?.low ?? NaN) - low)).toBeLessThanOrEqual(1e-12);
      expect(Math.abs((interval?.high ?? NaN) - high)).toBeLessThanOrEqual(1e-12);
    });
    expect(checks.length).toBeGreaterThan(corpora.length * 3);
  });
});

describe('bootstrap building blocks', () => {
  it('mulberry32 gives the same stream as the corpus generator’s mulberry32', () => {
    // Tommy Ettinger's mulberry32; scripts/corpus/random.ts implements the same published algorithm.
    const draw = mulberry32(20417);
    let state = 20417;
    for (let i = 0; i < 1000; i++) {
      const next = mulberry32Next(state);
      state = next.state;
      expect(draw(2 ** 32)).toBe(next.value);
    }
  });

  it('quantileSorted equals numpy.percentile (linear interpolation)', () => {
    const lists = fc.sample(fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 1, maxLength: 50 }), { seed: 42, numRuns: 100 });
    const q = [0, 2.5, 5, 25, 50, 97.5, 100];
    // Outside reference: numpy.percentile, default method 'linear' (Hyndman & Fan type 7).
    const answers = referenceRun(lists.map((values) => ({ op: 'percentile', values, q }))) as number[][];
    lists.forEach((values, i) => {
      const sorted = Float64Array.from(values).sort();
      q.forEach((p, k) => expect(Math.abs(quantileSorted(sorted, p / 100) - (answers[i]?.[k] ?? NaN))).toBeLessThanOrEqual(1e-12));
    });
  });
});
