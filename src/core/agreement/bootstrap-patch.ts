/**
 * Bootstrap totals after an edit, without resampling again. A resample's totals are Σ_u w_u · row_u
 * (w_u: how often resample r drew utterance u), so when a few utterances' rows change and the
 * shared utterances stay the same, each resample's totals change by Σ over the changed u of
 * w_u · (row_u new − row_u old). The draws are replayed to learn w_u for the changed u only (no
 * counting into rows, no summing of entries): the same numbers as resampling from scratch, exactly
 * (integer totals), at a fraction of the time.
 */
import { bootstrapStateAt } from './bootstrap';
import { wasmHitsMarked, wasmHitsOne, type BootstrapOptions } from './bootstrap-wasm';
import type { UtteranceRows } from './pair-counts';
import type { TotalsLayout } from './totals';

const MULBERRY_STEP = 0x6d2b79f5;

/** Changed utterances (positions among the shared ones) and their dense row changes, `width` each. */
export interface RowChanges {
  positions: Int32Array;
  deltas: Float64Array;
}

/** Are row p of `x` and row q of `y` the same entries in the same order? */
function rowsSame(x: UtteranceRows, p: number, y: UtteranceRows, q: number): boolean {
  const from = x.rowStart[p] as number;
  const length = (x.rowStart[p + 1] as number) - from;
  const start = y.rowStart[q] as number;
  if ((y.rowStart[q + 1] as number) - start !== length) return false;
  for (let j = 0; j < length; j++) {
    if (x.index[from + j] !== y.index[start + j] || x.value[from + j] !== y.value[start + j]) return false;
  }
  return true;
}

/** Utterances whose row differs between `before` and `after` (same shared utterances, same layout). */
export function rowChanges(before: UtteranceRows, after: UtteranceRows, width: number): RowChanges {
  const count = after.patternOf.length;
  const positions: number[] = [];
  const deltas: number[] = [];
  const delta = new Float64Array(width);
  for (let u = 0; u < count; u++) {
    const p = before.patternOf[u] as number;
    const q = after.patternOf[u] as number;
    // An unchanged utterance gives the same entries in the same order: skip it without the dense delta.
    if (rowsSame(before, p, after, q)) continue;
    for (let j = before.rowStart[p] as number; j < (before.rowStart[p + 1] as number); j++) delta[before.index[j] as number]! -= before.value[j] as number;
    for (let j = after.rowStart[q] as number; j < (after.rowStart[q + 1] as number); j++) delta[after.index[j] as number]! += after.value[j] as number;
    let changed = false;
    for (let k = 0; k < width; k++) if (delta[k] !== 0) changed = true;
    if (changed) {
      positions.push(u);
      for (let k = 0; k < width; k++) deltas.push(delta[k] as number);
    }
    delta.fill(0);
  }
  return { positions: Int32Array.from(positions), deltas: Float64Array.from(deltas) };
}

/**
 * One resample's `count` draws from `state`: each draw of a changed utterance adds its change to the
 * resample's totals (at `base`). Returns the state after the last draw.
 */
function drawsReplay(count: number, state: number, marked: Int32Array, changeOf: Map<number, number>, deltas: Float64Array, totals: Float64Array, base: number, width: number): number {
  let s = state;
  for (let i = 0; i < count; i++) {
    // mulberry32 inlined, as in the bootstrap's own draws (bootstrap.ts `drawsCount`).
    s = (s + MULBERRY_STEP) | 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    const k = ((((t ^ (t >>> 14)) >>> 0) * count) / 4294967296) | 0;
    if (((marked[k >> 5] as number) & (1 << (k & 31))) === 0) continue;
    const from = changeOf.get(k) as number;
    for (let j = 0; j < width; j++) totals[base + j]! += deltas[from + j] as number;
  }
  return s;
}

/** The draw `drawsReplay` maps a 32-bit output to (the bootstrap's own floating-point scaling). */
function drawOf(x: number, count: number): number {
  return ((x * count) / 4294967296) | 0;
}

/** The first 32-bit output that draws `u` or later: the scaling is monotonic, so a binary search finds it exactly. */
function outputFirst(u: number, count: number): number {
  let low = 0;
  let high = 4294967296;
  while (low < high) {
    const mid = Math.floor((low + high) / 2);
    if (drawOf(mid, count) >= u) high = mid;
    else low = mid + 1;
  }
  return low;
}

/**
 * `drawsReplay` for one changed utterance: the outputs that draw it form one range [low, high), so a
 * draw is two comparisons on the generator's output, without scaling it or reading memory.
 */
function drawsReplayOne(count: number, state: number, low: number, high: number, deltas: Float64Array, totals: Float64Array, base: number, width: number): number {
  let s = state;
  let hits = 0;
  // Compared as signed ints (x − 2^31 keeps the order and stays a small integer for the JIT).
  const lowSigned = low - 2147483648;
  const highSigned = high - 2147483648;
  for (let i = 0; i < count; i++) {
    s = (s + MULBERRY_STEP) | 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    const x = (t ^ (t >>> 14) ^ 0x80000000) | 0;
    if (x >= lowSigned && x < highSigned) hits++;
  }
  if (hits > 0) for (let j = 0; j < width; j++) totals[base + j]! += hits * (deltas[j] as number);
  return s;
}

export interface BootstrapTotals {
  rows: UtteranceRows;
  layout: TotalsLayout;
  seed: number;
  /** Resamples [0, resamples) (see `bootstrapTotalsRange`). */
  totals: Float64Array;
}

function layoutSame(a: TotalsLayout, b: TotalsLayout): boolean {
  return a.tags === b.tags && a.intents === b.intents && a.width === b.width;
}

/** What changed since kept totals: enough to replay any range of resamples (e.g. on helper threads). */
export interface BootstrapPatchPlan extends RowChanges {
  /** Shared utterances (draws per resample). */
  count: number;
  width: number;
  seed: number;
}

/**
 * The plan to bring `before`'s totals to the rows `rows`, when they differ from `before.rows` only
 * in some utterances' rows: same seed, same layout, same number of shared utterances (the draws
 * depend on it), and at most `maxChanged` changed utterances (default: a sixteenth). Null when that
 * does not hold: resample from scratch then.
 */
export function bootstrapPatchPlan(before: BootstrapTotals, rows: UtteranceRows, layout: TotalsLayout, seed: number, maxChanged?: number): BootstrapPatchPlan | null {
  const count = rows.patternOf.length;
  const width = layout.width;
  if (before.seed !== seed || !layoutSame(before.layout, layout) || before.rows.patternOf.length !== count || width === 0) return null;
  const changes = rowChanges(before.rows, rows, width);
  if (changes.positions.length > (maxChanged ?? Math.max(64, count >> 4))) return null;
  return { ...changes, count, width, seed };
}

/**
 * `hits[r · changed + c]` draws of changed utterance c in resample r, as changes: each changed
 * total is Σ_c hits · delta_c. The JS replay adds delta_c once per draw instead; both are the exact
 * integer while every partial sum stays below 2^53, which `deltasExact` checks.
 */
function changesFromHits(hits: Int32Array, deltas: Float64Array, changed: number, width: number, out: Float64Array): void {
  const resamples = out.length / width;
  for (let r = 0; r < resamples; r++) {
    const base = r * width;
    for (let c = 0; c < changed; c++) {
      const h = hits[r * changed + c] as number;
      if (h === 0) continue;
      const from = c * width;
      for (let j = 0; j < width; j++) out[base + j]! += h * (deltas[from + j] as number);
    }
  }
}

/** Integer deltas with count · max |delta| ≤ 2^53: any order of adding them per draw gives the same exact totals. */
export function deltasExact(deltas: Float64Array, count: number): boolean {
  let maxAbs = 0;
  for (const d of deltas) {
    if (!Number.isInteger(d)) return false;
    maxAbs = Math.max(maxAbs, Math.abs(d));
  }
  return count * maxAbs <= 2 ** 53;
}

/**
 * How the totals of resamples [from, to) change under `plan` (`width` per resample; add them to the
 * kept ones). WebAssembly SIMD counts the draws when it can promise the same numbers (see
 * bootstrap-wasm.ts); `options.engine: 'js'` keeps to the JS replay.
 */
export function bootstrapPatchRange(plan: BootstrapPatchPlan, from: number, to: number, options: BootstrapOptions = {}): Float64Array {
  const { positions, deltas, count, width, seed } = plan;
  const out = new Float64Array(Math.max(0, to - from) * width);
  if (positions.length === 0) return out;
  const wasm = options.engine !== 'js' && to > from && width > 0;
  if (wasm && positions.length === 1) {
    const u = positions[0] as number;
    const hits = wasmHitsOne(count, outputFirst(u, count), outputFirst(u + 1, count), bootstrapStateAt(seed, count, from), Math.imul(count, MULBERRY_STEP), to - from);
    if (hits !== null) {
      // As `drawsReplayOne`: one product per total, added to zero.
      changesFromHits(hits, deltas, 1, width, out);
      return out;
    }
  } else if (wasm && deltasExact(deltas, count)) {
    const hits = wasmHitsMarked(count, positions, bootstrapStateAt(seed, count, from), Math.imul(count, MULBERRY_STEP), to - from);
    if (hits !== null) {
      changesFromHits(hits, deltas, positions.length, width, out);
      return out;
    }
  }
  // One bit per position (a few KB, stays in cache): the draws only test it; hits look up the change.
  const marked = new Int32Array((count >> 5) + 1);
  const changeOf = new Map<number, number>();
  positions.forEach((u, i) => {
    marked[u >> 5]! |= 1 << (u & 31);
    changeOf.set(u, i * width);
  });
  let state = bootstrapStateAt(seed, count, from);
  if (positions.length === 1) {
    const u = positions[0] as number;
    const low = outputFirst(u, count);
    const high = outputFirst(u + 1, count);
    for (let r = from; r < to; r++) state = drawsReplayOne(count, state, low, high, deltas, out, (r - from) * width, width);
    return out;
  }
  for (let r = from; r < to; r++) state = drawsReplay(count, state, marked, changeOf, deltas, out, (r - from) * width, width);
  return out;
}

/** `kept` plus `change` (both `width` per resample), the change's range starting at resample `from`. */
export function totalsAdd(kept: Float64Array, change: Float64Array, from: number, width: number): void {
  const base = from * width;
  for (let i = 0; i < change.length; i++) kept[base + i]! += change[i] as number;
}

/** The totals of every resample of `before` for the rows `rows` (see `bootstrapPatchPlan`; null when it refuses), on this thread. */
export function bootstrapTotalsPatched(
  before: BootstrapTotals,
  rows: UtteranceRows,
  layout: TotalsLayout,
  seed: number,
  options: { maxChanged?: number } & BootstrapOptions = {},
): { totals: Float64Array; changed: number } | null {
  const plan = bootstrapPatchPlan(before, rows, layout, seed, options.maxChanged);
  if (plan === null) return null;
  const totals = before.totals.slice();
  totalsAdd(totals, bootstrapPatchRange(plan, 0, totals.length / plan.width, options), 0, plan.width);
  return { totals, changed: plan.positions.length };
}
