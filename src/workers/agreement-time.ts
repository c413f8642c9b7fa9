/**
 * Agreement as layers are completed: an utterance counts for a pair once both its layers are in,
 * at the later of their `updated` times; each point is the slot-type token kappa (as the core's
 * `kappa.slot`) over every utterance counted by then.
 */
import { kappaFromCounts, MISSING, tagCodeSlot, type AlignedCorpus } from '../core/agreement';

export interface TimePoint {
  /** Milliseconds since the epoch: the latest completion counted in this point. */
  time: number;
  utterances: number;
  tokens: number;
  kappa: number | null;
}

// Enough points to see a trend on a narrow chart; more would only crowd it.
export const TIME_POINTS_MAX = 24;

/**
 * Positions of `done` by time, ties by position. Keys (time − earliest) · 2^b + position sort as
 * plain numbers in a typed array (a comparator sort of 100k takes ~10× longer) while they stay
 * exact integers (below 2^53); wider spans of time fall back to the comparator.
 */
export function completionOrder(done: readonly number[]): Int32Array {
  const n = done.length;
  let low = Infinity;
  let high = -Infinity;
  for (const t of done) {
    low = Math.min(low, t);
    high = Math.max(high, t);
  }
  const shift = 2 ** Math.ceil(Math.log2(Math.max(2, n)));
  if (n === 0 || !Number.isInteger(low) || !Number.isInteger(high) || (high - low + 1) * shift > Number.MAX_SAFE_INTEGER) {
    return Int32Array.from(Array.from(done.keys()).sort((x, y) => (done[x] ?? 0) - (done[y] ?? 0) || x - y));
  }
  const keys = new Float64Array(n);
  for (let i = 0; i < n; i++) keys[i] = ((done[i] as number) - low) * shift + i;
  keys.sort();
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[i] = (keys[i] as number) % shift;
  return order;
}

/**
 * Cumulative slot kappa of layers `a` and `b` at up to `maxPoints` moments. Points split the
 * completion order into near-equal steps, never between two utterances completed at the same time.
 */
export function agreementOverTime(corpus: AlignedCorpus, a: number, b: number, updated: readonly Float64Array[], maxPoints = TIME_POINTS_MAX): TimePoint[] {
  const tagsA = corpus.tags[a];
  const tagsB = corpus.tags[b];
  const timesA = updated[a];
  const timesB = updated[b];
  if (tagsA === undefined || tagsB === undefined || timesA === undefined || timesB === undefined) return [];
  const shared: number[] = [];
  const done: number[] = [];
  for (let u = 0; u < corpus.utteranceCount; u++) {
    if (corpus.present[a]?.[u] !== 1 || corpus.present[b]?.[u] !== 1) continue;
    shared.push(u);
    done.push(Math.max(timesA[u] ?? 0, timesB[u] ?? 0));
  }
  const order = completionOrder(done);
  const ks = corpus.slots.length;
  const rowA = new Float64Array(ks);
  const colB = new Float64Array(ks);
  let n = 0;
  let agree = 0;
  const points: TimePoint[] = [];
  const step = Math.max(1, Math.ceil(order.length / Math.max(1, maxPoints)));
  let nextCut = step;
  for (let i = 0; i < order.length; i++) {
    const r = order[i] as number;
    const u = shared[r] as number;
    const to = corpus.offsets[u + 1] ?? 0;
    for (let t = corpus.offsets[u] ?? 0; t < to; t++) {
      const x = tagsA[t] ?? MISSING;
      const y = tagsB[t] ?? MISSING;
      if (x === MISSING || y === MISSING) continue;
      const sx = tagCodeSlot(x);
      const sy = tagCodeSlot(y);
      rowA[sx]! += 1;
      colB[sy]! += 1;
      n++;
      if (sx === sy) agree++;
    }
    const time = done[r] ?? 0;
    const last = i === order.length - 1;
    const nextTime = last ? Number.NaN : (done[order[i + 1] as number] ?? 0);
    if (last || (i + 1 >= nextCut && nextTime !== time)) {
      let chance = 0;
      for (let s = 0; s < ks; s++) chance += (rowA[s] ?? 0) * (colB[s] ?? 0);
      points.push({ time, utterances: i + 1, tokens: n, kappa: kappaFromCounts(n, agree, chance).value });
      nextCut = i + 1 + step;
    }
  }
  return points;
}
