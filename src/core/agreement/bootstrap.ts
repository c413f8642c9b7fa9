import type { UtteranceRows } from './pair-counts';
import { pairFiguresFromTotals, type PairFigures, type TotalsLayout } from './totals';
import { wasmTotals, type BootstrapOptions } from './bootstrap-wasm';

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

/** Resamples summed together: each sparse entry is read once per lane group instead of once per resample. */
const LANES = 8;

/**
 * One resample's draws: `count` calls of mulberry32 from `state`, counted per row into `weights`
 * (zeroed first). Returns the state after the last call.
 */
function drawsCount(patternOf: Int32Array, weights: Int32Array, state: number): number {
  const count = patternOf.length;
  weights.fill(0);
  let s = state;
  for (let i = 0; i < count; i++) {
    // mulberry32 inlined (the same steps as `mulberry32` above: this loop runs count × resamples times).
    s = (s + MULBERRY_STEP) | 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    // Non-negative and below count < 2^31, so `| 0` is the floor `mulberry32` takes.
    const k = ((((t ^ (t >>> 14)) >>> 0) * count) / 4294967296) | 0;
    weights[patternOf[k] as number]! += 1;
  }
  return s;
}

/**
 * Totals of up to LANES resamples at once: `laned[p·LANES + i]` is row p's weight in resample i;
 * lane i's totals go to `totals[i·width + k]`. Eight accumulators in registers make the pass over
 * the entries (the bootstrap's main cost) about one load per entry and lane.
 */
function totalsLaned(columns: { start: Int32Array; pattern: Int32Array; value: Int32Array }, laned: Int32Array, width: number, totals: Float64Array): void {
  const { start, pattern, value } = columns;
  for (let k = 0; k < width; k++) {
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, s5 = 0, s6 = 0, s7 = 0;
    const end = start[k + 1] as number;
    for (let j = start[k] as number; j < end; j++) {
      const base = (pattern[j] as number) * LANES;
      const v = value[j] as number;
      s0 += v * (laned[base] as number);
      s1 += v * (laned[base + 1] as number);
      s2 += v * (laned[base + 2] as number);
      s3 += v * (laned[base + 3] as number);
      s4 += v * (laned[base + 4] as number);
      s5 += v * (laned[base + 5] as number);
      s6 += v * (laned[base + 6] as number);
      s7 += v * (laned[base + 7] as number);
    }
    totals[k] = s0;
    totals[width + k] = s1;
    totals[2 * width + k] = s2;
    totals[3 * width + k] = s3;
    totals[4 * width + k] = s4;
    totals[5 * width + k] = s5;
    totals[6 * width + k] = s6;
    totals[7 * width + k] = s7;
  }
}

/** mulberry32's state before the first draw of resample `from` (state before call k is seed + k·step mod 2^32). */
export function bootstrapStateAt(seed: number, count: number, from: number): number {
  // Math.imul keeps the product exact mod 2^32.
  return ((seed >>> 0) + Math.imul(from, Math.imul(count, MULBERRY_STEP))) | 0;
}

/**
 * Totals of resamples [from, to) of the bootstrap stream for `seed`: resample r's totals are
 * `out[(r − from)·width .. (r − from + 1)·width)`. Resample r makes `count` draws of mulberry32(seed)
 * starting at call r·count; mulberry32's state only advances by a constant, so any range starts
 * straight at its own state, and ranges computed apart (e.g. in workers) join into exactly the values
 * of one pass. A resample draws utterances into multiplicities w_p of their rows, then the totals are
 * Σ w_p · row_p over the distinct sparse rows: O(utterances + entries), never O(tokens). Totals are
 * integer sums below 2^53, exact in any order, so summing LANES resamples side by side (and by
 * column) gives exactly the one-at-a-time values. WebAssembly SIMD (bootstrap-wasm.ts) computes the
 * same integers when it can promise exactness; `options.engine: 'js'` keeps to the code below.
 */
export function bootstrapTotalsRange(rows: UtteranceRows, layout: TotalsLayout, seed: number, from: number, to: number, options: BootstrapOptions = {}): Float64Array {
  const { patternOf } = rows;
  const count = patternOf.length;
  if (options.engine !== 'js' && to > from) {
    const fast = wasmTotals(rows, layout.width, bootstrapStateAt(seed, count, from), Math.imul(count, MULBERRY_STEP), to - from);
    if (fast !== null) return fast;
  }
  const patterns = rows.rowStart.length - 1;
  const weights = new Int32Array(patterns);
  const laned = new Int32Array(patterns * LANES);
  const width = layout.width;
  const lanedTotals = new Float64Array(width * LANES);
  const out = new Float64Array(Math.max(0, to - from) * width);
  const columns = rowsByColumn(rows, width);
  let state = bootstrapStateAt(seed, count, from);
  for (let r0 = from; r0 < to; r0 += LANES) {
    const lanes = Math.min(LANES, to - r0);
    for (let i = 0; i < lanes; i++) {
      state = drawsCount(patternOf, weights, state);
      for (let p = 0; p < patterns; p++) laned[p * LANES + i] = weights[p] as number;
    }
    totalsLaned(columns, laned, width, lanedTotals);
    out.set(lanedTotals.subarray(0, lanes * width), (r0 - from) * width);
  }
  return out;
}

/** Every figure's value on each resample whose totals `totals` holds (NaN where undefined). */
export function resampleValuesFromTotals(totals: Float64Array, layout: TotalsLayout): ResampleValues {
  const width = layout.width;
  const resamples = width === 0 ? 0 : totals.length / width;
  const values = {} as ResampleValues;
  for (const name of FIGURE_NAMES) values[name] = new Float64Array(resamples);
  for (let r = 0; r < resamples; r++) {
    const figures = pairFiguresFromTotals(totals.subarray(r * width, (r + 1) * width), layout);
    for (const name of FIGURE_NAMES) values[name][r] = figureValue(figures, name) ?? Number.NaN;
  }
  return values;
}

/** Resamples [from, to) of the bootstrap stream for `seed` (see `bootstrapTotalsRange`), as figure values. */
export function bootstrapRange(rows: UtteranceRows, layout: TotalsLayout, seed: number, from: number, to: number, options: BootstrapOptions = {}): ResampleValues {
  return resampleValuesFromTotals(bootstrapTotalsRange(rows, layout, seed, from, to, options), layout);
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
