import fc from 'fast-check';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { bootstrapTotalsRange } from '../../../src/core/agreement/bootstrap';
import { bootstrapPatchRange, deltasExact, type BootstrapPatchPlan } from '../../../src/core/agreement/bootstrap-patch';
import { base64Bytes, bootstrapWasmAvailable, wasmHitsMarked, wasmHitsOne, wasmTotals, WASM_COUNT_LIMIT } from '../../../src/core/agreement/bootstrap-wasm';
import type { UtteranceRows } from '../../../src/core/agreement/pair-counts';
import { totalsLayout } from '../../../src/core/agreement/totals';

const STEP = 0x6d2b79f5;

/** Sparse rows as pair-counts builds them: per pattern sorted distinct columns, values of either sign. */
function rowsArb(options: { maxCount: number; maxPatterns: number; maxWidth: number; maxValue: number }) {
  return fc
    .record({
      width: fc.integer({ min: 1, max: options.maxWidth }),
      patterns: fc.integer({ min: 1, max: options.maxPatterns }),
      count: fc.integer({ min: 1, max: options.maxCount }),
      seed: fc.nat(),
    })
    .chain(({ width, patterns, count }) =>
      fc.record({
        width: fc.constant(width),
        rows: fc.array(fc.array(fc.tuple(fc.nat(width - 1), fc.integer({ min: -options.maxValue, max: options.maxValue })), { maxLength: width }), {
          minLength: patterns,
          maxLength: patterns,
        }),
        patternOf: fc.array(fc.nat(patterns - 1), { minLength: count, maxLength: count }),
      }),
    )
    .map(({ width, rows, patternOf }) => ({ width, rows: rowsBuild(rows, patternOf) }));
}

function rowsBuild(rows: readonly (readonly [number, number])[][], patternOf: readonly number[]): UtteranceRows {
  const rowStart = [0];
  const index: number[] = [];
  const value: number[] = [];
  for (const row of rows) {
    const seen = new Map<number, number>();
    for (const [k, v] of row) seen.set(k, v);
    for (const k of [...seen.keys()].sort((a, b) => a - b)) {
      index.push(k);
      value.push(seen.get(k) as number);
    }
    rowStart.push(index.length);
  }
  return { patternOf: Int32Array.from(patternOf), rowStart: Int32Array.from(rowStart), index: Int32Array.from(index), value: Int32Array.from(value) };
}

/** Only `width` matters to the totals; the figures' layout is not read by the resampling. */
function layoutOf(width: number) {
  return { ...totalsLayout(1, 1), width };
}

describe('bootstrap in WebAssembly', () => {
  afterEach(() => {
    vi.unstubAllGlobals();
    vi.resetModules();
  });

  it('runs here (Node has WebAssembly SIMD), so the properties below compare two engines', () => {
    expect(bootstrapWasmAvailable()).toBe(true);
  });

  it('decodes base64 as the standard alphabet (RFC 4648)', () => {
    // RFC 4648 section 10 test vectors.
    const vectors: [string, string][] = [['', ''], ['Zg==', 'f'], ['Zm8=', 'fo'], ['Zm9v', 'foo'], ['Zm9vYg==', 'foob'], ['Zm9vYmE=', 'fooba'], ['Zm9vYmFy', 'foobar']];
    for (const [encoded, plain] of vectors) expect(new TextDecoder().decode(base64Bytes(encoded))).toBe(plain);
  });

  it('totals equal the JS totals exactly for random rows, seeds and ranges (fast-check)', () => {
    const prop = fc.property(
      rowsArb({ maxCount: 200, maxPatterns: 30, maxWidth: 20, maxValue: 60 }),
      fc.integer({ min: 0, max: 0xffffffff }),
      fc.nat(40),
      fc.nat(21),
      ({ width, rows }, seed, from, length) => {
        const layout = layoutOf(width);
        const js = bootstrapTotalsRange(rows, layout, seed, from, from + length, { engine: 'js' });
        expect(bootstrapTotalsRange(rows, layout, seed, from, from + length)).toEqual(js);
        if (length > 0) {
          const direct = wasmTotals(rows, width, ((seed >>> 0) + Math.imul(from, Math.imul(rows.patternOf.length, STEP))) | 0, Math.imul(rows.patternOf.length, STEP), length);
          expect(direct).not.toBeNull();
          expect(direct).toEqual(js);
        }
      },
    );
    fc.assert(prop, { seed: 42, numRuns: 300 });
  });

  it('totals equal the JS totals for one utterance and for a larger corpus (lane remainders 1 to 7)', () => {
    const [one] = fc.sample(rowsArb({ maxCount: 1, maxPatterns: 1, maxWidth: 8, maxValue: 100 }), { seed: 5, numRuns: 1 });
    if (one === undefined) throw new Error('no sample');
    for (const to of [1, 2, 5, 8, 9]) expect(bootstrapTotalsRange(one.rows, layoutOf(one.width), 77, 0, to)).toEqual(bootstrapTotalsRange(one.rows, layoutOf(one.width), 77, 0, to, { engine: 'js' }));
    const [big] = fc.sample(rowsArb({ maxCount: 1, maxPatterns: 400, maxWidth: 54, maxValue: 40 }), { seed: 9, numRuns: 1 });
    if (big === undefined) throw new Error('no sample');
    const patterns = big.rows.rowStart.length - 1;
    const patternOf = Int32Array.from({ length: 30_011 }, (_, k) => (k * 7919) % patterns);
    const rows = { ...big.rows, patternOf };
    for (const [from, to] of [[0, 8], [3, 16], [100, 111], [0, 13]] as const) {
      expect(bootstrapTotalsRange(rows, layoutOf(big.width), 2024, from, to)).toEqual(bootstrapTotalsRange(rows, layoutOf(big.width), 2024, from, to, { engine: 'js' }));
    }
  });

  it('patch changes equal the JS replay for one and several changed utterances, first and last included (fast-check)', () => {
    const prop = fc.property(
      fc.integer({ min: 2, max: 400 }),
      fc.integer({ min: 1, max: 12 }),
      fc.array(fc.oneof(fc.constant(0), fc.constant(-1), fc.nat(399)), { minLength: 1, maxLength: 6 }),
      fc.integer({ min: 0, max: 0xffffffff }),
      fc.nat(30),
      fc.nat(19),
      fc.integer({ min: 1, max: 1000 }),
      (count, width, picks, seed, from, length, scale) => {
        const positions = Int32Array.from(new Set(picks.map((p) => (p < 0 ? count - 1 : p % count)))).sort();
        const deltas = Float64Array.from({ length: positions.length * width }, (_, i) => ((i * 37 + seed) % 7) * scale - 3 * scale);
        const plan: BootstrapPatchPlan = { positions, deltas, count, width, seed };
        const js = bootstrapPatchRange(plan, from, from + length, { engine: 'js' });
        expect(bootstrapPatchRange(plan, from, from + length)).toEqual(js);
        if (length > 0) {
          const state = ((seed >>> 0) + Math.imul(from, Math.imul(count, STEP))) | 0;
          const hits = positions.length === 1 ? wasmHitsOne(count, lowOf(positions[0] as number, count), lowOf((positions[0] as number) + 1, count), state, Math.imul(count, STEP), length) : wasmHitsMarked(count, positions, state, Math.imul(count, STEP), length);
          expect(hits).not.toBeNull();
        }
      },
    );
    fc.assert(prop, { seed: 42, numRuns: 300 });
  });

  it('picks JS where WebAssembly could not be exact: count ≥ 2^21, i32 overflow, count = 1 in the one-change replay, huge deltas', () => {
    const wide: UtteranceRows = { patternOf: new Int32Array(WASM_COUNT_LIMIT), rowStart: Int32Array.from([0, 1]), index: Int32Array.from([0]), value: Int32Array.from([1]) };
    expect(wasmTotals(wide, 1, 0, 0, 1)).toBeNull();
    const below: UtteranceRows = { ...wide, patternOf: new Int32Array(WASM_COUNT_LIMIT - 1) };
    expect(wasmTotals(below, 1, 0, 0, 1)).not.toBeNull();
    // count · max |value| = 2^31 could overflow an i32 sum; one less cannot.
    const loud: UtteranceRows = { patternOf: new Int32Array(2), rowStart: Int32Array.from([0, 1]), index: Int32Array.from([0]), value: Int32Array.from([-(2 ** 30)]) };
    expect(wasmTotals(loud, 1, 0, 0, 3)).toBeNull();
    expect(bootstrapTotalsRange(loud, layoutOf(1), 1, 0, 3)).toEqual(Float64Array.from([-(2 ** 31), -(2 ** 31), -(2 ** 31)]));
    expect(wasmTotals({ ...loud, value: Int32Array.from([2 ** 30 - 1]) }, 1, 0, 0, 3)).not.toBeNull();
    expect(wasmHitsOne(1, 0, 2 ** 32, 0, 0, 4)).toBeNull();
    expect(wasmHitsOne(WASM_COUNT_LIMIT, 0, 2048, 0, 0, 4)).toBeNull();
    expect(wasmHitsMarked(WASM_COUNT_LIMIT, Int32Array.from([0, 1]), 0, 0, 4)).toBeNull();
    expect(deltasExact(Float64Array.from([2 ** 40, -1]), 2 ** 13)).toBe(true);
    expect(deltasExact(Float64Array.from([2 ** 40, -1]), 2 ** 13 + 1)).toBe(false);
    expect(deltasExact(Float64Array.from([0.5]), 2)).toBe(false);
    // count = 1: every draw is the one utterance; the JS replay answers.
    const plan: BootstrapPatchPlan = { positions: Int32Array.from([0]), deltas: Float64Array.from([2, -1]), count: 1, width: 2, seed: 9 };
    expect(bootstrapPatchRange(plan, 0, 3)).toEqual(Float64Array.from([2, -1, 2, -1, 2, -1]));
  });

  it('falls back to JS with the same totals where there is no WebAssembly', async () => {
    const [sample] = fc.sample(rowsArb({ maxCount: 50, maxPatterns: 10, maxWidth: 6, maxValue: 9 }), { seed: 13, numRuns: 1 });
    if (sample === undefined) throw new Error('no sample');
    const expected = bootstrapTotalsRange(sample.rows, layoutOf(sample.width), 3, 0, 11, { engine: 'js' });
    vi.resetModules();
    vi.stubGlobal('WebAssembly', undefined);
    const wasm = await import('../../../src/core/agreement/bootstrap-wasm');
    const bootstrap = await import('../../../src/core/agreement/bootstrap');
    expect(wasm.bootstrapWasmAvailable()).toBe(false);
    expect(wasm.wasmTotals(sample.rows, sample.width, 3, Math.imul(sample.rows.patternOf.length, STEP), 11)).toBeNull();
    expect(bootstrap.bootstrapTotalsRange(sample.rows, layoutOf(sample.width), 3, 0, 11)).toEqual(expected);
  });
});

/** The first generator output that draws `u` or later (floor(x · count / 2^32) ≥ u), as bootstrap-patch.ts finds it. */
function lowOf(u: number, count: number): number {
  return Math.ceil((u * 4294967296) / count);
}
