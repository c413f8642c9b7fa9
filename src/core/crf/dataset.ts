import type { AttributeEncoder } from './encoder';
import { IntBuffer } from './int-buffer';

/** A corpus flattened into typed arrays: token ranges per utterance, attribute ids per token, gold labels. */
export interface CrfDataset {
  /** Utterance u covers tokens tokenStarts[u] .. tokenStarts[u + 1] - 1. */
  tokenStarts: Int32Array;
  /** Token t's attribute ids are attrIds[attrEnds[t - 1] .. attrEnds[t] - 1] (from 0 for t = 0). */
  attrEnds: Int32Array;
  attrIds: Int32Array;
  /** Gold label id per token (-1 when unknown to the label set). */
  labels: Int32Array;
}

export interface CrfSequence {
  words: readonly string[];
  tags: readonly string[];
}

export function datasetBuild(sequences: readonly CrfSequence[], encoder: AttributeEncoder, labels: readonly string[]): CrfDataset {
  const labelIds = new Map(labels.map((label, id) => [label, id]));
  const ids = new IntBuffer(1 << 16);
  const ends = new IntBuffer(1 << 12);
  const gold = new IntBuffer(1 << 12);
  const tokenStarts = new Int32Array(sequences.length + 1);
  sequences.forEach((sequence, u) => {
    encoder.encode(sequence.words, ids, ends);
    for (const tag of sequence.tags) gold.push(labelIds.get(tag) ?? -1);
    tokenStarts[u + 1] = ends.length;
  });
  return { tokenStarts, attrEnds: ends.toArray(), attrIds: ids.toArray(), labels: gold.toArray() };
}

/**
 * State features: the (attribute, label) pairs seen in the data, grouped by attribute with labels
 * ascending. Returns the CSR layout the model keeps.
 */
export function stateFeaturesCollect(data: CrfDataset, attributeCount: number, labelCount: number): { starts: Int32Array; labels: Uint16Array } {
  const seen = new Uint8Array(attributeCount * labelCount);
  let k = 0;
  for (let t = 0; t < data.labels.length; t++) {
    const y = data.labels[t] as number;
    const end = data.attrEnds[t] as number;
    if (y < 0) {
      k = end;
      continue;
    }
    for (; k < end; k++) seen[(data.attrIds[k] as number) * labelCount + y] = 1;
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
