import type { AlignLayerData } from './align-layer';
import { LabelInterner } from './labels';

/** One piece of a layer read on its own: its line numbers count from the piece's first line. */
export interface AlignLayerPart {
  layer: AlignLayerData;
  /** Lines of the file before the piece. */
  lineOffset: number;
}

/**
 * An array of `length` starting with `first`'s values: a longer view of `first`'s own buffer when it
 * has the room (a read sized for a whole file usually has), else a copy. `inPlace` says which.
 */
function extended<A extends Int32Array | Float64Array>(first: A, length: number, make: (n: number) => A, view: (buffer: ArrayBufferLike, offset: number, n: number) => A): { array: A; inPlace: boolean } {
  if (first.buffer.byteLength - first.byteOffset >= length * first.BYTES_PER_ELEMENT) return { array: view(first.buffer, first.byteOffset, length), inPlace: true };
  const array = make(length);
  array.set(first);
  return { array, inPlace: false };
}

/** Whether `values` already is `out` from `at` on (the first part, grown in place or copied by `extended`). */
function sameMemory(out: Int32Array | Float64Array, at: number, values: Int32Array | Float64Array): boolean {
  return out.buffer === values.buffer && out.byteOffset + at * out.BYTES_PER_ELEMENT === values.byteOffset;
}

/** `values` shifted by `offset` into `out` at `at`: a plain copy when the offset is 0 (NaN stays NaN). */
function linesCopy(out: Float64Array, at: number, values: Float64Array, offset: number): void {
  if (offset === 0) {
    if (!sameMemory(out, at, values)) out.set(values, at);
    return;
  }
  for (let i = 0; i < values.length; i++) out[at + i] = (values[i] as number) + offset;
}

/** Codes through `remap` into `out` at `at`; a plain copy when `remap` maps every code to itself. */
function codesCopy(out: Int32Array, at: number, codes: Int32Array, remap: Int32Array): void {
  let identity = true;
  for (let c = 0; c < remap.length; c++) if (remap[c] !== c) identity = false;
  if (identity) {
    if (!sameMemory(out, at, codes)) out.set(codes, at);
    return;
  }
  for (let i = 0; i < codes.length; i++) {
    const code = codes[i] as number;
    out[at + i] = code < 0 ? code : (remap[code] as number);
  }
}

/**
 * The layer of a file read in consecutive pieces (split between utterances), equal to reading it
 * in one go: utterances and tokens in order, lines shifted by each piece's offset, slot and intent
 * codes renumbered in order of first sight across the pieces. Pieces that need no shift or
 * renumbering (the first always) are copied whole.
 */
export function alignLayersJoin(name: string, parts: readonly AlignLayerPart[]): AlignLayerData {
  let count = 0;
  let tokens = 0;
  for (const { layer } of parts) {
    count += layer.count;
    tokens += layer.tags.length;
  }
  // The first part's arrays are grown in place when they can be: it is most of the file, read first.
  const head = (parts[0] as AlignLayerPart).layer;
  const ints = (first: Int32Array, n: number) => extended(first, n, (m) => new Int32Array(m), (b, o, m) => new Int32Array(b, o, m));
  const floats = (first: Float64Array, n: number) => extended(first, n, (m) => new Float64Array(m), (b, o, m) => new Float64Array(b, o, m));
  const tokenStart = ints(head.tokenStart.subarray(0, head.count + 1), count + 1).array;
  const lines = floats(head.lines.subarray(0, head.count), count).array;
  const ranges = ints(head.ranges.subarray(0, 2 * head.tags.length), 2 * tokens).array;
  const tokenLines = floats(head.tokenLines.subarray(0, head.tags.length), tokens).array;
  const tagCounts = ints(head.tagCounts.subarray(0, head.count), count).array;
  const tags = ints(head.tags, tokens).array;
  const intents = ints(head.intents.subarray(0, head.count), count).array;
  const slots = new LabelInterner(1);
  const intentNames = new LabelInterner(0);
  let k0 = 0;
  let t0 = 0;
  parts.forEach(({ layer, lineOffset }, p) => {
    const n = layer.count;
    // The first part's values are in place already (see `extended`; k0 and t0 are 0) but for a line offset or renumbering.
    const from = p === 0 ? { lines, tokenLines, tags, intents } : layer;
    if (p > 0) {
      const starts = layer.tokenStart.subarray(1, n + 1);
      for (let k = 0; k < n; k++) tokenStart[k0 + k + 1] = t0 + (starts[k] as number);
      tagCounts.set(layer.tagCounts.subarray(0, n), k0);
      ranges.set(layer.ranges.subarray(0, 2 * layer.tags.length), 2 * t0);
    }
    linesCopy(lines, k0, from.lines.subarray(0, n), lineOffset);
    linesCopy(tokenLines, t0, from.tokenLines.subarray(0, layer.tags.length), lineOffset);
    // Local slot s becomes global g: B (2s-1) and I (2s) keep their parity, O (0) stays.
    const tagRemap = new Int32Array(2 * layer.slotNames.length + 1);
    layer.slotNames.forEach((slot, i) => {
      const g = slots.code(slot);
      tagRemap[2 * i + 1] = 2 * g - 1;
      tagRemap[2 * i + 2] = 2 * g;
    });
    codesCopy(tags, t0, from.tags.subarray(0, layer.tags.length), tagRemap);
    // MISSING (negative) passes through `codesCopy` unchanged.
    codesCopy(intents, k0, from.intents.subarray(0, n), Int32Array.from(layer.intentNames, (intent) => intentNames.code(intent)));
    k0 += n;
    t0 += layer.tags.length;
  });
  const ids: (string | null)[] = ([] as (string | null)[]).concat(...parts.map((part) => part.layer.ids.slice(0, part.layer.count)));
  const texts: string[] = ([] as string[]).concat(...parts.map((part) => part.layer.texts.slice(0, part.layer.count)));
  return {
    name,
    count,
    ids,
    lines,
    texts,
    tokenStart,
    ranges,
    tokenLines,
    tagCounts,
    tags,
    slotNames: [...slots.names],
    intents,
    intentNames: [...intentNames.names],
  };
}
