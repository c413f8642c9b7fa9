import { CRF_SPAN, CRF_WINDOW } from './attributes';
import type { AttributeEncoder } from './encoder';
import { IntBuffer } from './int-buffer';

/**
 * A corpus flattened into typed arrays. A token's attributes are the union of CRF_SPAN "units", one
 * per window place: a unit is a (word, place) pair, or a sentence-edge marker at a place, and holds
 * the attribute ids that word gives a token from that place (the token's own place adds `bias`).
 * Words repeat heavily, so training works per unit (a few thousand) instead of per token attribute
 * (tens per token): the state scores of a token are a sum of CRF_SPAN unit score rows.
 */
export interface CrfDataset {
  /** Utterance u covers tokens tokenStarts[u] .. tokenStarts[u + 1] - 1. */
  tokenStarts: Int32Array;
  /** Token t's units: tokenUnits[t * CRF_SPAN + k], window place k (offset k − CRF_WINDOW). */
  tokenUnits: Int32Array;
  /** Unit u's attribute ids are unitAttrs[unitStarts[u] .. unitStarts[u + 1] - 1]. */
  unitStarts: Int32Array;
  unitAttrs: Int32Array;
  /** Gold label id per token (-1 when unknown to the label set). */
  labels: Int32Array;
}

export interface CrfSequence {
  words: readonly string[];
  tags: readonly string[];
}

export function datasetBuild(sequences: readonly CrfSequence[], encoder: AttributeEncoder, labels: readonly string[]): CrfDataset {
  const labelIds = new Map(labels.map((label, id) => [label, id]));
  const unitAttrs = new IntBuffer(1 << 16);
  const unitStarts = new IntBuffer(1 << 12);
  const unitAdd = (ids: Int32Array, withBias: boolean): number => {
    unitStarts.push(unitAttrs.length);
    if (withBias) unitAttrs.pushAll(encoder.bias);
    unitAttrs.pushAll(ids);
    return unitStarts.length - 1;
  };
  const edgeUnit = (place: number): number => {
    const before = place < CRF_WINDOW;
    const ids = (before ? encoder.bos : encoder.eos)[place];
    return ids === undefined ? -1 : unitAdd(ids, false);
  };
  const bosUnits = Array.from({ length: CRF_SPAN }, (_, k) => (k < CRF_WINDOW ? edgeUnit(k) : -1));
  const eosUnits = Array.from({ length: CRF_SPAN }, (_, k) => (k > CRF_WINDOW ? edgeUnit(k) : -1));
  // A word's CRF_SPAN units are consecutive from its first unit id.
  const wordUnits = new Map<string, number>();
  const unitOfWord = (word: string): number => {
    let first = wordUnits.get(word);
    if (first === undefined) {
      const ids = encoder.wordIds(word);
      first = unitStarts.length;
      for (let k = 0; k < CRF_SPAN; k++) unitAdd(ids[k] as Int32Array, k === CRF_WINDOW);
      wordUnits.set(word, first);
    }
    return first;
  };
  const tokenUnits = new IntBuffer(1 << 14);
  const gold = new IntBuffer(1 << 12);
  const tokenStarts = new Int32Array(sequences.length + 1);
  sequences.forEach((sequence, u) => {
    const words = sequence.words;
    const firsts = words.map(unitOfWord);
    for (let t = 0; t < words.length; t++) {
      for (let k = 0; k < CRF_SPAN; k++) {
        const at = t + k - CRF_WINDOW;
        tokenUnits.push(at < 0 ? (bosUnits[k] as number) : at >= words.length ? (eosUnits[k] as number) : (firsts[at] as number) + k);
      }
    }
    for (const tag of sequence.tags) gold.push(labelIds.get(tag) ?? -1);
    tokenStarts[u + 1] = gold.length;
  });
  unitStarts.push(unitAttrs.length);
  return { tokenStarts, tokenUnits: tokenUnits.toArray(), unitStarts: unitStarts.toArray(), unitAttrs: unitAttrs.toArray(), labels: gold.toArray() };
}

/** How often each unit carries each gold label (units × labels), from which every per-token count follows. */
export function unitLabelCounts(data: CrfDataset, labelCount: number): Float64Array {
  const counts = new Float64Array((data.unitStarts.length - 1) * labelCount);
  for (let t = 0; t < data.labels.length; t++) {
    const y = data.labels[t] as number;
    if (y < 0) continue;
    for (let k = 0; k < CRF_SPAN; k++) {
      const cell = (data.tokenUnits[t * CRF_SPAN + k] as number) * labelCount + y;
      counts[cell] = (counts[cell] as number) + 1;
    }
  }
  return counts;
}

/**
 * State features: the (attribute, label) pairs seen in the data, grouped by attribute with labels
 * ascending. Returns the CSR layout the model keeps.
 */
export function stateFeaturesCollect(data: CrfDataset, attributeCount: number, labelCount: number): { starts: Int32Array; labels: Uint16Array } {
  const seen = new Uint8Array(attributeCount * labelCount);
  const perUnit = unitLabelCounts(data, labelCount);
  for (let u = 0; u + 1 < data.unitStarts.length; u++) {
    const end = data.unitStarts[u + 1] as number;
    for (let y = 0; y < labelCount; y++) {
      if (perUnit[u * labelCount + y] === 0) continue;
      for (let k = data.unitStarts[u] as number; k < end; k++) seen[(data.unitAttrs[k] as number) * labelCount + y] = 1;
    }
  }
  const starts = new Int32Array(attributeCount + 1);
  let total = 0;
  for (let a = 0; a < attributeCount; a++) {
    starts[a] = total;
    for (let y = 0; y < labelCount; y++) total += seen[a * labelCount + y] as number;
  }
  starts[attributeCount] = total;
  const featureLabels = new Uint16Array(total);
  let f = 0;
  for (let a = 0; a < attributeCount; a++) {
    for (let y = 0; y < labelCount; y++) if (seen[a * labelCount + y] === 1) featureLabels[f++] = y;
  }
  return { starts, labels: featureLabels };
}
