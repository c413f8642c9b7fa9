import type { UtteranceRows } from './pair-counts';
import { pairFiguresFromTotals, type PairFigures, type TotalsLayout } from './totals';

/**
 * mulberry32 (Tommy Ettinger's 32-bit generator, public domain): small, fast and seedable, enough
 * for resampling; not for cryptography. Returns a function giving uniform integers in [0, n).
 */
export function mulberry32(seed: number): (n: number) => number {
  let state = seed >>> 0;
  return (n: number): number => {
    state = (state + 0x6d2b79f5) | 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    // Scaling the 32-bit output (bias below n / 2^32, negligible for corpus sizes) keeps one draw per index.
    return Math.floor((((t ^ (t >>> 14)) >>> 0) * n) / 4294967296);
  };
}

export interface Interval {
  low: number | null;
  high: number | null;
  /** Resamples on which the figure was defined (the interval uses only those). */
  resamples: number;
  reason?: string;
}

/** Linear-interpolation quantile of sorted values (Hyndman & Fan 1996, type 7; numpy's default). */
export function quantileSorted(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const low = Math.floor(h);
  const a = sorted[low] ?? 0;
  const b = sorted[Math.min(low + 1, sorted.length - 1)] ?? a;
  return a + (h - low) * (b - a);
}

export const REASON_POINT_UNDEFINED = 'the figure itself is undefined on these data';
export const REASON_RESAMPLES_UNDEFINED = 'the figure is undefined on every resample';

/** Percentile interval (Efron & Tibshirani 1993) over the defined resample values. */
export function percentileInterval(values: Float64Array, defined: number, confidence: number): Interval {
  if (defined === 0) return { low: null, high: null, resamples: 0, reason: REASON_RESAMPLES_UNDEFINED };
  const sorted = values.slice(0, defined).sort();
  const tail = (1 - confidence) / 2;
  return { low: quantileSorted(sorted, tail), high: quantileSorted(sorted, 1 - tail), resamples: defined };
}

export type FigureName = 'tag' | 'slot' | 'slotAnnotated' | 'intent' | 'exactF1' | 'overlapF1';
export const FIGURE_NAMES: readonly FigureName[] = ['tag', 'slot', 'slotAnnotated', 'intent', 'exactF1', 'overlapF1'];

function figureValue(figures: PairFigures, name: FigureName): number | null {
  switch (name) {
    case 'exactF1':
      return figures.exactF1;
    case 'overlapF1':
      return figures.overlapF1;
    default:
      return figures[name].value;
  }
}

/**
 * Bootstrap the two-layer figures by resampling utterances with replacement (tokens of one utterance
 * are not independent). A resample draws utterances into multiplicities w_p of their rows, then the
 * totals are Σ w_p · row_p over the distinct sparse rows: O(utterances + entries), never O(tokens).
 */
export function bootstrapFigures(
  rows: UtteranceRows,
  layout: TotalsLayout,
  resamples: number,
  seed: number,
): { values: Record<FigureName, Float64Array>; defined: Record<FigureName, number> } {
  const count = rows.patternOf.length;
  const patterns = rows.rowStart.length - 1;
  const draw = mulberry32(seed);
  const weights = new Int32Array(patterns);
  const totals = new Float64Array(layout.width);
  const values = {} as Record<FigureName, Float64Array>;
  const defined = {} as Record<FigureName, number>;
  for (const name of FIGURE_NAMES) {
    values[name] = new Float64Array(resamples);
    defined[name] = 0;
  }
  const { patternOf, rowStart, index, value } = rows;
  for (let r = 0; r < resamples; r++) {
    weights.fill(0);
    for (let i = 0; i < count; i++) weights[patternOf[draw(count)] ?? 0]! += 1;
    totals.fill(0);
    for (let u = 0; u < patterns; u++) {
      const w = weights[u] ?? 0;
      if (w === 0) continue;
      const end = rowStart[u + 1] ?? 0;
      for (let j = rowStart[u] ?? 0; j < end; j++) totals[index[j] ?? 0]! += w * (value[j] ?? 0);
    }
    const figures = pairFiguresFromTotals(totals, layout);
    for (const name of FIGURE_NAMES) {
      const v = figureValue(figures, name);
      if (v !== null) values[name][defined[name]++] = v;
    }
  }
  return { values, defined };
}
