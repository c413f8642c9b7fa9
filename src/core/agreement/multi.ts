import { alphaFromCounts, fleissFromCounts, kappaFromCounts, type AlphaFigure, type KappaFigure } from './kappa';
import { MISSING, tagCodeSlot, type AlignedCorpus } from './types';

/** Slot-type Cohen's kappa of two layers over the utterances both hold. */
export function pairSlotKappa(corpus: AlignedCorpus, a: number, b: number): KappaFigure {
  const tagsA = corpus.tags[a];
  const tagsB = corpus.tags[b];
  if (!tagsA || !tagsB) throw new RangeError(`no layer ${String(a)} or ${String(b)}`);
  const ks = corpus.slots.length;
  const rowA = new Float64Array(ks);
  const colB = new Float64Array(ks);
  let n = 0;
  let agree = 0;
  for (let t = 0; t < corpus.tokenCount; t++) {
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
  let chance = 0;
  for (let s = 0; s < ks; s++) chance += (rowA[s] ?? 0) * (colB[s] ?? 0);
  return kappaFromCounts(n, agree, chance);
}

export interface FleissFigure extends KappaFigure {
  /** Utterances present in every layer: Fleiss' kappa needs every item rated by every rater. */
  utterances: number;
  raters: number;
}

/**
 * Fleiss' kappa on per-token slot types over the tokens of utterances present in all layers (the
 * statistic assumes a complete item-by-rater table; utterances missing from any layer are left out).
 */
export function fleissSlot(corpus: AlignedCorpus): FleissFigure {
  const layers = corpus.tags.length;
  const ks = corpus.slots.length;
  const categoryTotals = new Float64Array(ks);
  const values = new Int32Array(layers);
  let items = 0;
  let utterances = 0;
  let agreeingPairs = 0;
  const { tags, present } = corpus;
  for (let u = 0; u < corpus.utteranceCount; u++) {
    let all = true;
    for (let l = 0; l < layers; l++) if (present[l]?.[u] !== 1) all = false;
    if (!all) continue;
    utterances++;
    const to = corpus.offsets[u + 1] ?? 0;
    for (let t = corpus.offsets[u] ?? 0; t < to; t++) {
      for (let l = 0; l < layers; l++) {
        const slot = tagCodeSlot(tags[l]?.[t] ?? 0);
        values[l] = slot;
        categoryTotals[slot]! += 1;
        for (let k = 0; k < l; k++) if (values[k] === slot) agreeingPairs++;
      }
      items++;
    }
  }
  let squares = 0;
  for (let s = 0; s < ks; s++) squares += (categoryTotals[s] ?? 0) ** 2;
  return { ...fleissFromCounts(items, layers, agreeingPairs, squares), utterances, raters: layers };
}

/**
 * Krippendorff's alpha (nominal) on per-token slot types, every token a unit and every layer an
 * observer; tokens of utterances held by fewer than two layers are not pairable and drop out.
 */
export function alphaSlot(corpus: AlignedCorpus): AlphaFigure {
  const layers = corpus.tags.length;
  const ks = corpus.slots.length;
  const categoryTotals = new Float64Array(ks);
  // Agreeing ordered pairs per unit size m, divided by m - 1 once at the end to keep sums exact.
  const sameByValues = new Float64Array(layers + 1);
  const values = new Int32Array(layers);
  let n = 0;
  let units = 0;
  const { tags, present } = corpus;
  for (let u = 0; u < corpus.utteranceCount; u++) {
    let m = 0;
    for (let l = 0; l < layers; l++) if (present[l]?.[u] === 1) m++;
    if (m < 2) continue;
    const to = corpus.offsets[u + 1] ?? 0;
    for (let t = corpus.offsets[u] ?? 0; t < to; t++) {
      let count = 0;
      let same = 0;
      for (let l = 0; l < layers; l++) {
        const code = tags[l]?.[t] ?? MISSING;
        if (code === MISSING) continue;
        const slot = tagCodeSlot(code);
        for (let k = 0; k < count; k++) if (values[k] === slot) same += 2;
        values[count++] = slot;
        categoryTotals[slot]! += 1;
      }
      sameByValues[m]! += same;
      n += m;
      units++;
    }
  }
  let coincidentSame = 0;
  for (let m = 2; m <= layers; m++) coincidentSame += (sameByValues[m] ?? 0) / (m - 1);
  let squares = 0;
  for (let s = 0; s < ks; s++) squares += (categoryTotals[s] ?? 0) ** 2;
  return alphaFromCounts(n, units, coincidentSame, squares);
}

export interface PairwiseKappa {
  layers: string[];
  /** Cohen's slot kappa for each pair of layers (diagonal: each layer with itself). */
  kappa: (number | null)[][];
  /** Tokens compared for each pair. */
  tokens: number[][];
}

export function pairwiseSlotKappa(corpus: AlignedCorpus): PairwiseKappa {
  const count = corpus.layers.length;
  const kappa = Array.from({ length: count }, () => new Array<number | null>(count).fill(null));
  const tokens = Array.from({ length: count }, () => new Array<number>(count).fill(0));
  for (let a = 0; a < count; a++) {
    for (let b = a; b < count; b++) {
      const figure = pairSlotKappa(corpus, a, b);
      for (const [i, j] of [[a, b], [b, a]] as const) {
        (kappa[i] ?? [])[j] = figure.value;
        (tokens[i] ?? [])[j] = figure.n;
      }
    }
  }
  return { layers: [...corpus.layers], kappa, tokens };
}
