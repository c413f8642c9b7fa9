import type { AlignLayerData } from './align-layer';
import { LabelInterner } from './labels';

/** One piece of a layer read on its own: its line numbers count from the piece's first line. */
export interface AlignLayerPart {
  layer: AlignLayerData;
  /** Lines of the file before the piece. */
  lineOffset: number;
}

/** `values` shifted by `offset` into `out` at `at`: a plain copy when the offset is 0 (NaN stays NaN). */
function linesCopy(out: Float64Array, at: number, values: Float64Array, offset: number): void {
  if (offset === 0) {
    out.set(values, at);
    return;
  }
  for (let i = 0; i < values.length; i++) out[at + i] = (values[i] as number) + offset;
}

/** Codes through `remap` into `out` at `at`; a plain copy when `remap` maps every code to itself. */
function codesCopy(out: Int32Array, at: number, codes: Int32Array, remap: Int32Array): void {
  let identity = true;
  for (let c = 0; c < remap.length; c++) if (remap[c] !== c) identity = false;
  if (identity) {
    out.set(codes, at);
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
  const tokenStart = new Int32Array(count + 1);
  const lines = new Float64Array(count);
  const ranges = new Int32Array(2 * tokens);
  const tokenLines = new Float64Array(tokens);
  const tagCounts = new Int32Array(count);
  const tags = new Int32Array(tokens);
  const intents = new Int32Array(count);
  const slots = new LabelInterner(1);
  const intentNames = new LabelInterner(0);
  let k0 = 0;
  let t0 = 0;
  for (const { layer, lineOffset } of parts) {
    const n = layer.count;
    const starts = layer.tokenStart.subarray(1, n + 1);
    if (t0 === 0) tokenStart.set(starts, k0 + 1);
    else for (let k = 0; k < n; k++) tokenStart[k0 + k + 1] = t0 + (starts[k] as number);
    linesCopy(lines, k0, layer.lines.subarray(0, n), lineOffset);
    linesCopy(tokenLines, t0, layer.tokenLines.subarray(0, layer.tags.length), lineOffset);
    tagCounts.set(layer.tagCounts.subarray(0, n), k0);
    ranges.set(layer.ranges.subarray(0, 2 * layer.tags.length), 2 * t0);
    // Local slot s becomes global g: B (2s-1) and I (2s) keep their parity, O (0) stays.
    const tagRemap = new Int32Array(2 * layer.slotNames.length + 1);
    layer.slotNames.forEach((slot, i) => {
      const g = slots.code(slot);
      tagRemap[2 * i + 1] = 2 * g - 1;
      tagRemap[2 * i + 2] = 2 * g;
    });
    codesCopy(tags, t0, layer.tags, tagRemap);
    // MISSING (negative) passes through `codesCopy` unchanged.
    codesCopy(intents, k0, layer.intents.subarray(0, n), Int32Array.from(layer.intentNames, (intent) => intentNames.code(intent)));
    k0 += n;
    t0 += layer.tags.length;
  }
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
