import type { Utterance } from '../types';
import { FloatGrow, IntGrow } from './align-grow';
import { LabelInterner, RawPrefix, RawTagTable } from './labels';
import { MISSING } from './types';

/**
 * What alignment keeps of one layer: per utterance and per token only what pairing, token checks,
 * error messages and the tag grid need, in typed arrays, so a streamed file is never held as
 * Utterance objects. Plain arrays and strings: a worker can gather one and post it.
 */
export interface AlignLayerData {
  name: string;
  count: number;
  ids: (string | null)[];
  /** Per utterance: 1-based file line, NaN when unknown. */
  lines: Float64Array;
  texts: string[];
  /** Utterance k owns tokens [tokenStart[k], tokenStart[k + 1]). */
  tokenStart: Int32Array;
  /** Per token: start and end in its utterance's text. */
  ranges: Int32Array;
  /** Per token: its own file line, else its utterance's; NaN when unknown. */
  tokenLines: Float64Array;
  /** Per utterance: how many tags it carries (a mismatch with its tokens is an error). */
  tagCounts: Int32Array;
  /** Per token: IOB2 code over this layer's slot codes s = 1 + index in `slotNames` (0 = O, 2s-1 = B, 2s = I). */
  tags: Int32Array;
  slotNames: string[];
  /** Per utterance: index in `intentNames`, or MISSING. */
  intents: Int32Array;
  intentNames: string[];
}

/** Collects one layer utterance by utterance (file order) into `AlignLayerData`. */
export class AlignLayerGatherer {
  private readonly ids: (string | null)[] = [];
  private readonly texts: string[] = [];
  private readonly lines: FloatGrow;
  private readonly tokenStart: IntGrow;
  private readonly ranges: IntGrow;
  private readonly tokenLines: FloatGrow;
  private readonly tagCounts: IntGrow;
  private readonly tags: IntGrow;
  private readonly intents: IntGrow;
  private readonly slots = new LabelInterner(1);
  private readonly raw = new RawTagTable(this.slots);
  private readonly intentNames = new LabelInterner(0);

  /** `size`, when known, sizes the arrays once (streamed layers grow them by doubling). */
  constructor(
    readonly name: string,
    size: { utterances: number; tokens: number } = { utterances: 1024, tokens: 16384 },
  ) {
    this.lines = new FloatGrow(size.utterances);
    this.tokenStart = new IntGrow(size.utterances + 1);
    this.ranges = new IntGrow(2 * size.tokens);
    this.tokenLines = new FloatGrow(size.tokens);
    this.tagCounts = new IntGrow(size.utterances);
    this.tags = new IntGrow(size.tokens);
    this.intents = new IntGrow(size.utterances);
    this.tokenStart.push(0);
  }

  utteranceAdd(utterance: Utterance): void {
    const { tokens, tags } = utterance;
    this.ids.push(utterance.id === undefined || utterance.id === '' ? null : utterance.id);
    this.texts.push(utterance.text);
    const line = utterance.line ?? Number.NaN;
    this.lines.push(line);
    const tokenLines = utterance.tokenLines;
    const count = tokens.length;
    this.ranges.reserve(2 * count);
    this.tokenLines.reserve(count);
    this.tags.reserve(count);
    const ranges = this.ranges.data;
    let at = this.ranges.length;
    for (let t = 0; t < count; t++) {
      const token = tokens[t];
      ranges[at++] = token?.start ?? 0;
      ranges[at++] = token?.end ?? 0;
    }
    this.ranges.length = at;
    const lines = this.tokenLines.data;
    const from = this.tokenLines.length;
    for (let t = 0; t < count; t++) lines[from + t] = tokenLines?.[t] ?? line;
    this.tokenLines.length = from + count;
    this.tagsEncode(tags, count);
    this.tokenStart.push(this.tags.length);
    this.tagCounts.push(tags.length);
    this.intents.push(utterance.intent === undefined ? MISSING : this.intentNames.code(utterance.intent));
  }

  /**
   * One utterance's tags as IOB2 codes: the lenient CoNLL-2000 reading of `spansFromTags` then IOB2
   * encoding, i.e. what `tagsConvert(tags, 'iob2')` gives, without building strings.
   */
  private tagsEncode(tags: readonly string[], count: number): void {
    const out = this.tags.data;
    const at = this.tags.length;
    let open = 0;
    // Readers hand out one string object per distinct tag, and runs of one tag (O above all) are
    // common: comparing with the previous tag skips most map lookups.
    let lastTag: string | undefined;
    let lastCode = 0;
    for (let t = 0; t < count; t++) {
      const tag = tags[t] ?? 'O';
      const code = tag === lastTag ? lastCode : this.raw.code(tag);
      lastTag = tag;
      lastCode = code;
      const prefix = this.raw.prefix[code] ?? RawPrefix.O;
      const slot = this.raw.slot[code] ?? 0;
      if (prefix === RawPrefix.O) {
        open = 0;
        out[at + t] = 0;
        continue;
      }
      if ((prefix === RawPrefix.I || prefix === RawPrefix.E) && open === slot) {
        out[at + t] = 2 * slot;
      } else {
        out[at + t] = 2 * slot - 1;
        open = slot;
      }
      if (prefix === RawPrefix.E || prefix === RawPrefix.S) open = 0;
    }
    this.tags.length += count;
  }

  done(): AlignLayerData {
    return {
      name: this.name,
      count: this.ids.length,
      ids: this.ids,
      lines: this.lines.done(),
      texts: this.texts,
      tokenStart: this.tokenStart.done(),
      ranges: this.ranges.done(),
      tokenLines: this.tokenLines.done(),
      tagCounts: this.tagCounts.done(),
      tags: this.tags.done(),
      slotNames: [...this.slots.names],
      intents: this.intents.done(),
      intentNames: [...this.intentNames.names],
    };
  }
}

/** An utterance's file line, null when unknown. */
export function layerLine(layer: AlignLayerData, k: number): number | null {
  const line = layer.lines[k] ?? Number.NaN;
  return Number.isNaN(line) ? null : line;
}

export function layerTokenCount(layer: AlignLayerData, k: number): number {
  return (layer.tokenStart[k + 1] ?? 0) - (layer.tokenStart[k] ?? 0);
}

/** Token t of utterance k as text. */
export function layerTokenText(layer: AlignLayerData, k: number, t: number): string {
  const at = 2 * ((layer.tokenStart[k] ?? 0) + t);
  return (layer.texts[k] ?? '').slice(layer.ranges[at] ?? 0, layer.ranges[at + 1] ?? 0);
}

export function layerTokenLine(layer: AlignLayerData, k: number, t: number): number | null {
  const line = layer.tokenLines[(layer.tokenStart[k] ?? 0) + t] ?? Number.NaN;
  return Number.isNaN(line) ? null : line;
}

/** Index of the first token whose text differs, -1 when the sequences match (counts must be equal). */
export function layerTokensFirstDifference(a: AlignLayerData, ka: number, b: AlignLayerData, kb: number): number {
  const textA = a.texts[ka] ?? '';
  const textB = b.texts[kb] ?? '';
  const sameText = textA === textB;
  const count = layerTokenCount(a, ka);
  const fromA = 2 * (a.tokenStart[ka] ?? 0);
  const fromB = 2 * (b.tokenStart[kb] ?? 0);
  for (let t = 0; t < count; t++) {
    const xs = a.ranges[fromA + 2 * t] ?? 0;
    const xe = a.ranges[fromA + 2 * t + 1] ?? 0;
    const ys = b.ranges[fromB + 2 * t] ?? 0;
    const ye = b.ranges[fromB + 2 * t + 1] ?? 0;
    if (sameText && xs === ys && xe === ye) continue;
    if (textA.slice(xs, xe) !== textB.slice(ys, ye)) return t;
  }
  return -1;
}
