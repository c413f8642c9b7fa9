import { kappaFromCounts, type KappaFigure } from './kappa';

/**
 * Sufficient statistics of the two-layer figures, as one flat vector so that a bootstrap resample is
 * a weighted sum of per-utterance vectors. Slot marginals, token and span counts all follow from the
 * IOB2 tag marginals (slot s = tags 2s-1 and 2s; a span per B tag). Everything is stored as layer A's
 * marginals plus shortfalls (B − A, disagreements, misses), which are zero on an utterance the two
 * annotated alike, so such an utterance's row holds only A's few marginals.
 */
export const TOTAL_TAG_DIFF = 0;
export const TOTAL_SLOT_DIFF = 1;
/** Tokens A left O and B did not. */
export const TOTAL_O_SHORT = 2;
export const TOTAL_INTENT_DIFF = 3;
/** A's spans minus exact (overlap) matches. */
export const TOTAL_EXACT_MISS = 4;
export const TOTAL_OVERLAP_MISS = 5;
const SCALARS = 6;

export interface TotalsLayout {
  tags: number;
  intents: number;
  /** Layer A's tag marginals, then B's minus A's. */
  tagA: number;
  tagShift: number;
  intentA: number;
  intentShift: number;
  width: number;
}

export function totalsLayout(tags: number, intents: number): TotalsLayout {
  const tagA = SCALARS;
  const tagShift = tagA + tags;
  const intentA = tagShift + tags;
  const intentShift = intentA + intents;
  return { tags, intents, tagA, tagShift, intentA, intentShift, width: intentShift + intents };
}

export interface PairFigures {
  tag: KappaFigure;
  slot: KappaFigure;
  slotAnnotated: KappaFigure;
  intent: KappaFigure;
  exactF1: number | null;
  overlapF1: number | null;
  spansA: number;
  spansB: number;
}

/** Dice / F1 over two span sets: 2·matched / (|A| + |B|) (Hripcsak & Rothschild 2005). */
export function f1FromCounts(matched: number, a: number, b: number): number | null {
  return a + b === 0 ? null : (2 * matched) / (a + b);
}

export function pairFiguresFromTotals(totals: Float64Array, layout: TotalsLayout): PairFigures {
  const { tagA, tagShift, intentA, intentShift } = layout;
  let n = 0;
  let tagChance = 0;
  for (let k = 0; k < layout.tags; k++) {
    const x = totals[tagA + k] ?? 0;
    n += x;
    tagChance += x * (x + (totals[tagShift + k] ?? 0));
  }
  const oA = totals[tagA] ?? 0;
  const oB = oA + (totals[tagShift] ?? 0);
  const bothO = oA - (totals[TOTAL_O_SHORT] ?? 0);
  let slotChance = oA * oB;
  let spansA = 0;
  let spansB = 0;
  for (let k = 1; k < layout.tags; k += 2) {
    const beginA = totals[tagA + k] ?? 0;
    const insideA = totals[tagA + k + 1] ?? 0;
    const beginB = beginA + (totals[tagShift + k] ?? 0);
    const insideB = insideA + (totals[tagShift + k + 1] ?? 0);
    spansA += beginA;
    spansB += beginB;
    slotChance += (beginA + insideA) * (beginB + insideB);
  }
  const slotAgree = n - (totals[TOTAL_SLOT_DIFF] ?? 0);
  // Dropping the tokens both left O changes only the O marginals: each loses bothO.
  const annotatedChance = slotChance - oA * oB + (oA - bothO) * (oB - bothO);
  let intentN = 0;
  let intentChance = 0;
  for (let k = 0; k < layout.intents; k++) {
    const x = totals[intentA + k] ?? 0;
    intentN += x;
    intentChance += x * (x + (totals[intentShift + k] ?? 0));
  }
  return {
    tag: kappaFromCounts(n, n - (totals[TOTAL_TAG_DIFF] ?? 0), tagChance),
    slot: kappaFromCounts(n, slotAgree, slotChance),
    slotAnnotated: kappaFromCounts(n - bothO, slotAgree - bothO, annotatedChance),
    intent: kappaFromCounts(intentN, intentN - (totals[TOTAL_INTENT_DIFF] ?? 0), intentChance),
    exactF1: f1FromCounts(spansA - (totals[TOTAL_EXACT_MISS] ?? 0), spansA, spansB),
    overlapF1: f1FromCounts(spansA - (totals[TOTAL_OVERLAP_MISS] ?? 0), spansA, spansB),
    spansA,
    spansB,
  };
}
