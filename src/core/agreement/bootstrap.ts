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

/** Values of every figure on resamples [from, to) of a stream; NaN where the figure is undefined. */
export type ResampleValues = Record<FigureName, Float64Array>;

const MULBERRY_STEP = 0x6d2b79f5;

/** The sparse rows by column (pattern, value), pattern-ascending: each total then sums in a register. */
function rowsByColumn(rows: UtteranceRows, width: number): { start: Int32Array; pattern: Int32Array; value: Int32Array } {
  const { rowStart, index, value } = rows;
  const start = new Int32Array(width + 1);
  for (let j = 0; j < index.length; j++) start[(index[j] as number) + 1]! += 1;
  for (let k = 0; k < width; k++) start[k + 1]! += start[k] as number;
  const next = start.slice(0, width);
  const columnPattern = new Int32Array(index.length);
  const columnValue = new Int32Array(index.length);
  for (let p = 0; p + 1 < rowStart.length; p++) {
    const end = rowStart[p + 1] as number;
    for (let j = rowStart[p] as number; j < end; j++) {
      const at = next[index[j] as number]!++;
      columnPattern[at] = p;
      columnValue[at] = value[j] as number;
    }
  }
  return { start, pattern: columnPattern, value: columnValue };
}

/**
 * Resamples [from, to) of the bootstrap stream for `seed`. Resample r makes `count` draws of
 * mulberry32(seed) starting at call r·count; mulberry32's state only advances by a constant, so any
 * range starts straight at its own state, and ranges computed apart (e.g. in workers) join into
 * exactly the values of one pass. A resample draws utterances into multiplicities w_p of their rows,
 * then the totals are Σ w_p · row_p over the distinct sparse rows: O(utterances + entries), never O(tokens).
 */
export function bootstrapRange(rows: UtteranceRows, layout: TotalsLayout, seed: number, from: number, to: number): ResampleValues {
  const { patternOf } = rows;
  const count = patternOf.length;
  const weights = new Int32Array(rows.rowStart.length - 1);
  const width = layout.width;
  const totals = new Float64Array(width);
  const columns = rowsByColumn(rows, width);
  const values = {} as ResampleValues;
  for (const name of FIGURE_NAMES) values[name] = new Float64Array(Math.max(0, to - from));
  // State before call k is seed + k·step (mod 2^32); Math.imul keeps the product exact mod 2^32.
  let state = ((seed >>> 0) + Math.imul(from, Math.imul(count, MULBERRY_STEP))) | 0;
  for (let r = from; r < to; r++) {
    weights.fill(0);
    for (let i = 0; i < count; i++) {
      // mulberry32 inlined (the same steps as `mulberry32` above: this loop runs count × resamples times).
      state = (state + MULBERRY_STEP) | 0;
      let t = state;
      t = Math.imul(t ^ (t >>> 15), t | 1);
      t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
      // Non-negative and below count < 2^31, so `| 0` is the floor `mulberry32` takes.
      const k = ((((t ^ (t >>> 14)) >>> 0) * count) / 4294967296) | 0;
      weights[patternOf[k] as number]! += 1;
    }
    // Integer sums below 2^53 are exact in any order, so by column gives the row-wise totals.
    for (let k = 0; k < width; k++) {
      let sum = 0;
      const end = columns.start[k + 1] as number;
      for (let j = columns.start[k] as number; j < end; j++) sum += (weights[columns.pattern[j] as number] as number) * (columns.value[j] as number);
      totals[k] = sum;
    }
    const figures = pairFiguresFromTotals(totals, layout);
    for (const name of FIGURE_NAMES) values[name][r - from] = figureValue(figures, name) ?? Number.NaN;
  }
  return values;
}

/** Ranges of resamples joined in order (each value array as long as its range). */
export function resampleValuesJoin(parts: readonly ResampleValues[]): ResampleValues {
  const values = {} as ResampleValues;
  for (const name of FIGURE_NAMES) {
    const joined = new Float64Array(parts.reduce((sum, part) => sum + part[name].length, 0));
    let at = 0;
    for (const part of parts) {
      joined.set(part[name], at);
      at += part[name].length;
    }
    values[name] = joined;
  }
  return values;
}

/** One figure's defined resample values, in resample order, and how many there are. */
export function resampleDefined(values: Float64Array): { values: Float64Array; defined: number } {
  const kept = new Float64Array(values.length);
  let defined = 0;
  for (const v of values) if (!Number.isNaN(v)) kept[defined++] = v;
  return { values: kept, defined };
}
