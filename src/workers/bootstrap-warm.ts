/**
 * Runs the bootstrap's code once on small made-up rows, so the engine has optimised it before a real
 * run: WebAssembly starts in a baseline tier and moves a function to optimised code only for later
 * calls, so a cold 500-resample call ran wholly in the baseline tier (Node, 100k utterances: 330-380 ms
 * cold against 160-230 ms after a warm-up of ~16 ms; noisy 2-core machine). The results are dropped.
 */
import { bootstrapPatchRange, bootstrapTotalsRange } from '../core/agreement';
import type { UtteranceRows } from '../core/agreement/pair-counts';
import { totalsLayout } from '../core/agreement/totals';

export function bootstrapWarm(): void {
  const count = 20_000;
  const patterns = 50;
  const rows: UtteranceRows = {
    patternOf: Int32Array.from({ length: count }, (_, i) => i % patterns),
    rowStart: Int32Array.from({ length: patterns + 1 }, (_, p) => 2 * p),
    index: Int32Array.from({ length: 2 * patterns }, (_, j) => j % 7),
    value: Int32Array.from({ length: 2 * patterns }, (_, j) => (j % 5) - 1),
  };
  const layout = totalsLayout(3, 0);
  for (let k = 0; k < 3; k++) bootstrapTotalsRange(rows, layout, 1, 0, 64);
  const width = layout.width;
  const plan = (positions: number[]) => ({ positions: Int32Array.from(positions), deltas: new Float64Array(positions.length * width).fill(1), count, width, seed: 1 });
  for (let k = 0; k < 3; k++) {
    bootstrapPatchRange(plan([7]), 0, 64);
    bootstrapPatchRange(plan([7, 9_001]), 0, 64);
  }
}
