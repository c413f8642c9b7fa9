import {
  bootstrapRange,
  percentileInterval,
  REASON_POINT_UNDEFINED,
  resampleDefined,
  type FigureName,
  type Interval,
  type ResampleValues,
} from './bootstrap';
import { kappaFromCounts, type AlphaFigure, type KappaFigure } from './kappa';
import { alphaSlot, fleissSlot, pairwiseSlotKappa, type FleissFigure, type PairwiseKappa } from './multi';
import { pairCount, pairTotals, type PairCounts, type UtteranceRows } from './pair-counts';
import { f1FromCounts, pairFiguresFromTotals, type PairFigures, type TotalsLayout } from './totals';
import { tagCodeSlot, type AlignedCorpus } from './types';

export interface AgreementOptions {
  /** Bootstrap resamples (default 1000; 0 = no intervals). */
  bootstrap?: number;
  /** PRNG seed for the bootstrap (default 1). */
  seed?: number;
  /** Interval coverage (default 0.95). */
  confidence?: number;
  /** Which two layers the two-layer figures compare (default [0, 1]). */
  layers?: readonly [number, number];
  /** Most disagreements listed (default 100); `total` counts them all. */
  disagreementLimit?: number;
}

export interface SpanFigures {
  /** 2·matched / (|A| + |B|); null (with `reason`) when neither layer has a span. */
  exactF1: number | null;
  overlapF1: number | null;
  reason?: string;
  a: number;
  b: number;
  exactMatched: number;
  overlapMatched: number;
  /** How overlapping spans pair up: a maximum one-to-one matching per utterance and slot. */
  matching: 'maximum';
}

export interface SlotFigures {
  /** One-vs-rest token kappa on slot types (this slot against everything else, O included). */
  kappa: KappaFigure;
  exactF1: number | null;
  /** Spans of this slot in layer A and B, and exact matches among them. */
  a: number;
  b: number;
  exactMatched: number;
}

export interface Disagreement {
  /** Position in the aligned corpus. */
  index: number;
  id: string | null;
  /** File lines of the utterance in layer A and layer B, when known. */
  line?: number;
  lineB?: number;
  tokensDiffering: number;
  intentDiffers: boolean;
}

export interface AgreementIntervals {
  confidence: number;
  /** Resamples drawn (B); each interval says on how many its figure was defined. */
  resamples: number;
  seed: number;
  method: 'percentile';
  unit: 'utterance';
  kappaTag: Interval;
  kappaSlot: Interval;
  kappaSlotAnnotated: Interval;
  /** Null when the report has no intent figure. */
  intentKappa: Interval | null;
  exactF1: Interval;
  overlapF1: Interval;
}

export interface AgreementReport {
  layers: string[];
  /** Indices and names of the two layers the two-layer figures compare. */
  pair: [number, number];
  pairNames: [string, string];
  /** Counted over the utterances both layers of the pair hold. */
  utterances: number;
  tokens: number;
  kappa: { tag: KappaFigure; slot: KappaFigure; slotAnnotated: KappaFigure };
  /** Per utterance where both carry an intent; null when neither layer has intents. */
  intent: { kappa: KappaFigure; n: number } | null;
  spans: SpanFigures;
  perSlot: Record<string, SlotFigures>;
  /** Per-token slot types, rows layer A, columns layer B; O first, then slots in name order. */
  confusion: { labels: string[]; counts: number[][] };
  disagreements: { total: number; items: Disagreement[] };
  /** With three or more layers only. */
  fleissKappa?: { slot: FleissFigure };
  alpha?: { slot: AlphaFigure };
  pairwise?: PairwiseKappa;
  /** Null when `bootstrap` is 0. */
  ci: AgreementIntervals | null;
}

export const REASON_NO_SPANS = 'neither layer marks a span';

function slotConfusion(corpus: AlignedCorpus, counts: PairCounts): { labels: string[]; counts: number[][]; codes: number[] } {
  const ks = corpus.slots.length;
  const kt = corpus.tagLabels.length;
  const table = new Float64Array(ks * ks);
  for (let x = 0; x < kt; x++) {
    for (let y = 0; y < kt; y++) table[tagCodeSlot(x) * ks + tagCodeSlot(y)]! += counts.tagConfusion[x * kt + y] ?? 0;
  }
  const codes: number[] = [0];
  for (let s = 1; s < ks; s++) {
    let used = 0;
    for (let k = 0; k < ks; k++) used += (table[s * ks + k] ?? 0) + (table[k * ks + s] ?? 0);
    if (used > 0) codes.push(s);
  }
  return {
    labels: codes.map((s) => corpus.slots[s] ?? ''),
    counts: codes.map((x) => codes.map((y) => table[x * ks + y] ?? 0)),
    codes,
  };
}

function perSlotFigures(corpus: AlignedCorpus, counts: PairCounts, confusion: { counts: number[][]; codes: number[] }): Record<string, SlotFigures> {
  const n = counts.tokens;
  const entries: [string, SlotFigures][] = [];
  confusion.codes.forEach((s, i) => {
    if (s === 0) return;
    const row = confusion.counts[i] ?? [];
    const rowTotal = row.reduce((sum, c) => sum + c, 0);
    const colTotal = confusion.counts.reduce((sum, r) => sum + (r[i] ?? 0), 0);
    const both = row[i] ?? 0;
    // Two-by-two table of "this slot" against "anything else".
    const agree = n - rowTotal - colTotal + 2 * both;
    const chance = rowTotal * colTotal + (n - rowTotal) * (n - colTotal);
    const a = counts.spansA[s] ?? 0;
    const b = counts.spansB[s] ?? 0;
    const exactMatched = counts.exactBySlot[s] ?? 0;
    entries.push([corpus.slots[s] ?? '', { kappa: kappaFromCounts(n, agree, chance), exactF1: f1FromCounts(exactMatched, a, b), a, b, exactMatched }]);
  });
  // fromEntries defines own properties, so a slot named like an Object.prototype member stays data.
  return Object.fromEntries(entries);
}

function disagreementsList(corpus: AlignedCorpus, counts: PairCounts, a: number, b: number, limit: number): { total: number; items: Disagreement[] } {
  const { shared, differing, intentDiffers } = counts;
  let maxDiffer = 0;
  let total = 0;
  for (let r = 0; r < shared.length; r++) {
    const d = differing[r] ?? 0;
    if (d > 0 || intentDiffers[r] === 1) total++;
    if (d > maxDiffer) maxDiffer = d;
  }
  const items: Disagreement[] = [];
  // Descending token differences, corpus order within each count: a counting sort, stable by construction.
  for (let d = maxDiffer; d >= 0 && items.length < limit; d--) {
    for (let r = 0; r < shared.length && items.length < limit; r++) {
      if ((differing[r] ?? 0) !== d || (d === 0 && intentDiffers[r] !== 1)) continue;
      const u = shared[r] ?? 0;
      const item: Disagreement = { index: u, id: corpus.ids[u] ?? null, tokensDiffering: d, intentDiffers: intentDiffers[r] === 1 };
      const lineA = corpus.lines[a]?.[u] ?? 0;
      const lineB = corpus.lines[b]?.[u] ?? 0;
      if (lineA > 0) item.line = lineA;
      if (lineB > 0) item.lineB = lineB;
      items.push(item);
    }
  }
  return { total, items };
}

/** The bootstrap still to run: plain typed arrays and numbers, so it can be cloned into a worker. */
export interface BootstrapJob {
  rows: UtteranceRows;
  layout: TotalsLayout;
  resamples: number;
  seed: number;
}

/** A report whose intervals wait for the bootstrap (`job` null when none is asked for). */
export interface AgreementPending {
  report: AgreementReport;
  job: BootstrapJob | null;
  point: PairFigures;
  hasIntent: boolean;
  confidence: number;
}

function intervalsFromValues(pending: AgreementPending, job: BootstrapJob, values: ResampleValues): AgreementIntervals {
  const { point, hasIntent, confidence } = pending;
  const interval = (name: FigureName, pointValue: number | null): Interval => {
    if (pointValue === null) return { low: null, high: null, resamples: 0, reason: REASON_POINT_UNDEFINED };
    const { values: kept, defined } = resampleDefined(values[name]);
    return percentileInterval(kept, defined, confidence);
  };
  return {
    confidence,
    resamples: job.resamples,
    seed: job.seed,
    method: 'percentile',
    unit: 'utterance',
    kappaTag: interval('tag', point.tag.value),
    kappaSlot: interval('slot', point.slot.value),
    kappaSlotAnnotated: interval('slotAnnotated', point.slotAnnotated.value),
    intentKappa: hasIntent ? interval('intent', point.intent.value) : null,
    exactF1: interval('exactF1', point.exactF1),
    overlapF1: interval('overlapF1', point.overlapF1),
  };
}

function optionsCheck(corpus: AlignedCorpus, options: AgreementOptions): { a: number; b: number; resamples: number; seed: number; confidence: number; limit: number } {
  const [a, b] = options.layers ?? [0, 1];
  const layers = corpus.layers.length;
  if (layers < 2) throw new RangeError('agreement needs at least two layers');
  if (!Number.isInteger(a) || !Number.isInteger(b) || a < 0 || b < 0 || a >= layers || b >= layers || a === b) {
    throw new RangeError(`layers must name two different layers in 0..${String(layers - 1)}`);
  }
  const resamples = options.bootstrap ?? 1000;
  if (!Number.isInteger(resamples) || resamples < 0) throw new RangeError('bootstrap must be a non-negative integer');
  const confidence = options.confidence ?? 0.95;
  if (!(confidence > 0 && confidence < 1)) throw new RangeError('confidence must lie strictly between 0 and 1');
  const limit = options.disagreementLimit ?? 100;
  if (!Number.isInteger(limit) || limit < 0) throw new RangeError('disagreementLimit must be a non-negative integer');
  return { a, b, resamples, seed: options.seed ?? 1, confidence, limit };
}

/**
 * Every figure but the intervals, plus the bootstrap job that yields them: for callers that run the
 * resamples elsewhere (in ranges, e.g. on worker threads) and then call `agreementIntervalsAdd`.
 */
export function agreementPrepare(corpus: AlignedCorpus, options: AgreementOptions = {}): AgreementPending {
  const { a, b, resamples, seed, confidence, limit } = optionsCheck(corpus, options);
  const counts = pairCount(corpus, a, b, resamples > 0);
  const point = pairFiguresFromTotals(pairTotals(counts), counts.layout);
  const hasIntent = (corpus.hasIntents[a] ?? false) || (corpus.hasIntents[b] ?? false);
  const confusion = slotConfusion(corpus, counts);
  const spans: SpanFigures = {
    exactF1: point.exactF1,
    overlapF1: point.overlapF1,
    a: point.spansA,
    b: point.spansB,
    exactMatched: counts.exact,
    overlapMatched: counts.overlap,
    matching: 'maximum',
  };
  if (point.exactF1 === null) spans.reason = REASON_NO_SPANS;
  const report: AgreementReport = {
    layers: [...corpus.layers],
    pair: [a, b],
    pairNames: [corpus.layers[a] ?? '', corpus.layers[b] ?? ''],
    utterances: counts.shared.length,
    tokens: counts.tokens,
    kappa: { tag: point.tag, slot: point.slot, slotAnnotated: point.slotAnnotated },
    intent: hasIntent ? { kappa: point.intent, n: point.intent.n } : null,
    spans,
    perSlot: perSlotFigures(corpus, counts, confusion),
    confusion: { labels: confusion.labels, counts: confusion.counts },
    disagreements: disagreementsList(corpus, counts, a, b, limit),
    ci: null,
  };
  if (corpus.layers.length >= 3) {
    report.fleissKappa = { slot: fleissSlot(corpus) };
    report.alpha = { slot: alphaSlot(corpus) };
    report.pairwise = pairwiseSlotKappa(corpus);
  }
  let job: BootstrapJob | null = null;
  if (resamples > 0) {
    if (counts.rows === null) throw new Error('bootstrap rows missing');
    job = { rows: counts.rows, layout: counts.layout, resamples, seed };
  }
  return { report, job, point, hasIntent, confidence };
}

/** The pending report with its intervals, from the values of all `job.resamples` resamples in order. */
export function agreementIntervalsAdd(pending: AgreementPending, values: ResampleValues): AgreementReport {
  const { report, job } = pending;
  if (job !== null) report.ci = intervalsFromValues(pending, job, values);
  return report;
}

/** Agreement figures for an aligned corpus: see `AgreementReport` for what each one is. */
export function agreementCompute(corpus: AlignedCorpus, options: AgreementOptions = {}): AgreementReport {
  const pending = agreementPrepare(corpus, options);
  const { job } = pending;
  if (job === null) return pending.report;
  return agreementIntervalsAdd(pending, bootstrapRange(job.rows, job.layout, job.seed, 0, job.resamples));
}
