/**
 * The bootstrap's draws, totals and patch replay in WebAssembly SIMD (wasm/bootstrap.wat), giving
 * exactly the numbers of the JS code in bootstrap.ts and bootstrap-patch.ts, which stays the reference
 * and the fallback. Each function here returns null whenever it cannot promise that: no WebAssembly
 * or no SIMD (the module does not compile, e.g. under a CSP without 'wasm-unsafe-eval'), count ≥ 2^21
 * (the JS index is computed in doubles, exact only while output × count < 2^53), sums that could
 * overflow an i32, or inputs out of range.
 */
import type { UtteranceRows } from './pair-counts';
import { BOOTSTRAP_WASM_BASE64 } from './wasm/bootstrap-bytes';

/** Which code runs the bootstrap: 'auto' takes WebAssembly when it is available and exact, 'js' never does. */
export type BootstrapEngine = 'auto' | 'js';

export interface BootstrapOptions {
  engine?: BootstrapEngine;
}

interface BootstrapExports {
  memory: WebAssembly.Memory;
  totals(patOf: number, count: number, patterns: number, colStart: number, pairs: number, width: number, out: number, state: number, stride: number, resamples: number): void;
  hitsOne(count: number, low: number, span: number, out: number, state: number, stride: number, resamples: number): void;
  hitsMarked(count: number, marked: number, changeOf: number, changed: number, hits: number, state: number, stride: number, resamples: number): void;
}

/** Below this many draws per resample the JS index is exact and equals the WebAssembly one (see above). */
export const WASM_COUNT_LIMIT = 2 ** 21;

const BASE64 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';

/** Base64 to bytes (core uses no host globals such as Buffer or atob; the text is a few KB). */
export function base64Bytes(text: string): Uint8Array<ArrayBuffer> {
  const clean = text.replace(/=+$/, '');
  const bytes = new Uint8Array((clean.length * 3) >> 2);
  let bits = 0;
  let held = 0;
  let at = 0;
  for (const ch of clean) {
    bits = (bits << 6) | BASE64.indexOf(ch);
    held += 6;
    if (held >= 8) {
      held -= 8;
      bytes[at++] = (bits >> held) & 0xff;
    }
  }
  return bytes;
}

let loaded: BootstrapExports | null | undefined;

/** The instantiated module, or null where WebAssembly SIMD cannot run here (then always null). */
function wasmExports(): BootstrapExports | null {
  if (loaded !== undefined) return loaded;
  loaded = null;
  try {
    if (typeof WebAssembly !== 'object') return null;
    const bytes = base64Bytes(BOOTSTRAP_WASM_BASE64);
    if (!WebAssembly.validate(bytes)) return null;
    // Synchronous: the module is a few KB, under every engine's limit for compiling on a main thread.
    loaded = new WebAssembly.Instance(new WebAssembly.Module(bytes), {}).exports as unknown as BootstrapExports;
  } catch {
    loaded = null;
  }
  return loaded;
}

/** Whether the WebAssembly bootstrap can run in this context (what 'auto' picks when the inputs allow it). */
export function bootstrapWasmAvailable(): boolean {
  return wasmExports() !== null;
}

function align16(n: number): number {
  return (n + 15) & ~15;
}

/** The module's memory, grown to at least `bytes`; null when it cannot grow that far. */
function memoryAtLeast(wasm: BootstrapExports, bytes: number): ArrayBuffer | null {
  const have = wasm.memory.buffer.byteLength;
  if (bytes > 2 ** 31) return null;
  if (bytes > have) {
    try {
      wasm.memory.grow(Math.ceil((bytes - have) / 65536));
    } catch {
      return null;
    }
  }
  return wasm.memory.buffer;
}

/**
 * Totals of `resamples` resamples, the first starting at mulberry32 state `state`, each next one
 * `stride` further (see `bootstrapTotalsRange`), `width` per resample; null when not exact here.
 */
export function wasmTotals(rows: UtteranceRows, width: number, state: number, stride: number, resamples: number): Float64Array | null {
  const { patternOf, rowStart, index, value } = rows;
  const count = patternOf.length;
  const patterns = rowStart.length - 1;
  const entries = index.length;
  if (count === 0 || count >= WASM_COUNT_LIMIT || width <= 0 || resamples <= 0 || patterns <= 0) return null;
  // |total| ≤ Σ weights · max |value| = count · max |value|, and so is every partial sum: i32 is exact below 2^31.
  let maxAbs = 0;
  for (let j = 0; j < entries; j++) {
    const v = Math.abs(value[j] as number);
    if (v > maxAbs) maxAbs = v;
  }
  if (count * maxAbs >= 2 ** 31) return null;
  for (let k = 0; k < count; k++) {
    const p = patternOf[k] as number;
    if (!(p >= 0 && p < patterns)) return null;
  }
  for (let j = 0; j < entries; j++) {
    const c = index[j] as number;
    if (!(c >= 0 && c < width)) return null;
  }
  const wasm = wasmExports();
  if (wasm === null) return null;
  // Laned weights at address 0, so a row's weights are at p · 32 (8 lanes of i32).
  const patOf = align16(patterns * 32);
  const colStart = align16(patOf + count * 4);
  const pairs = align16(colStart + (width + 1) * 4);
  const out = align16(pairs + entries * 8);
  const padded = (resamples + 7) & ~7;
  const buffer = memoryAtLeast(wasm, out + padded * width * 8);
  if (buffer === null) return null;
  const heap = new Int32Array(buffer);
  const patBase = patOf >> 2;
  for (let k = 0; k < count; k++) heap[patBase + k] = (patternOf[k] as number) * 32;
  // The entries by column, pattern-ascending (as bootstrap.ts `rowsByColumn`).
  const start = new Int32Array(width + 1);
  for (let j = 0; j < entries; j++) start[(index[j] as number) + 1]! += 1;
  for (let k = 0; k < width; k++) start[k + 1]! += start[k] as number;
  const next = start.slice(0, width);
  const pairBase = pairs >> 2;
  for (let p = 0; p < patterns; p++) {
    const end = rowStart[p + 1] as number;
    for (let j = rowStart[p] as number; j < end; j++) {
      const at = pairBase + 2 * next[index[j] as number]!++;
      heap[at] = p * 32;
      heap[at + 1] = value[j] as number;
    }
  }
  const startBase = colStart >> 2;
  for (let k = 0; k <= width; k++) heap[startBase + k] = (start[k] as number) * 8;
  wasm.totals(patOf, count, patterns, colStart, pairs, width, out, state, stride, resamples);
  return new Float64Array(wasm.memory.buffer, out, resamples * width).slice();
}

/**
 * For one changed utterance whose draws are the generator outputs [low, high): per resample (the
 * first at `state`, each next `stride` further) how many of its `count` draws hit it; null when not
 * exact here (high − low must fit in 32 bits, so count = 1 stays in JS).
 */
export function wasmHitsOne(count: number, low: number, high: number, state: number, stride: number, resamples: number): Int32Array | null {
  const span = high - low;
  if (count === 0 || count >= WASM_COUNT_LIMIT || resamples <= 0 || !(span > 0 && span < 2 ** 32) || !(low >= 0)) return null;
  const wasm = wasmExports();
  if (wasm === null) return null;
  const padded = (resamples + 7) & ~7;
  if (memoryAtLeast(wasm, padded * 4) === null) return null;
  wasm.hitsOne(count, low | 0, span | 0, 0, state, stride, resamples);
  return new Int32Array(wasm.memory.buffer, 0, resamples).slice();
}

/**
 * For the changed utterances at `positions`: how often each resample (as `wasmHitsOne`) draws each,
 * `hits[r · positions.length + c]`; null when not exact here.
 */
export function wasmHitsMarked(count: number, positions: Int32Array, state: number, stride: number, resamples: number): Int32Array | null {
  const changed = positions.length;
  if (count === 0 || count >= WASM_COUNT_LIMIT || resamples <= 0 || changed === 0) return null;
  for (const u of positions) if (!(u >= 0 && u < count)) return null;
  const wasm = wasmExports();
  if (wasm === null) return null;
  // A byte per position rather than a bit: one load and no shifts per draw (100 KB at 100k utterances).
  const changeOf = align16(count);
  const hits = align16(changeOf + count * 4);
  const padded = (resamples + 3) & ~3;
  const buffer = memoryAtLeast(wasm, hits + padded * changed * 4);
  if (buffer === null) return null;
  const heap = new Int32Array(buffer);
  const marked = new Uint8Array(buffer, 0, count);
  marked.fill(0);
  const changeBase = changeOf >> 2;
  positions.forEach((u, c) => {
    marked[u] = 1;
    heap[changeBase + u] = c;
  });
  wasm.hitsMarked(count, 0, changeOf, changed, hits, state, stride, resamples);
  return new Int32Array(wasm.memory.buffer, hits, resamples * changed).slice();
}
