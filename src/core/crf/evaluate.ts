import { spansFromTags } from '../schemes';

export interface SpanCounts {
  truePositives: number;
  falsePositives: number;
  falseNegatives: number;
}

export interface SpanFigures extends SpanCounts {
  precision: number;
  recall: number;
  f1: number;
}

export interface SpanEvaluation {
  /** Per slot, sorted by name. */
  slots: Record<string, SpanFigures>;
  /** Micro-averaged over all spans. */
  overall: SpanFigures;
  utterances: number;
  /** Utterances whose predicted tags all equal the gold tags (read as spans). */
  exactUtterances: number;
}

export function spanFigures(counts: SpanCounts): SpanFigures {
  const { truePositives: tp, falsePositives: fp, falseNegatives: fn } = counts;
  const precision = tp + fp === 0 ? 0 : tp / (tp + fp);
  const recall = tp + fn === 0 ? 0 : tp / (tp + fn);
  const f1 = precision + recall === 0 ? 0 : (2 * precision * recall) / (precision + recall);
  return { ...counts, precision, recall, f1 };
}

/** Running span counts, so folds and files can be pooled before the figures are taken. */
export class SpanTally {
  private readonly counts = new Map<string, SpanCounts>();
  utterances = 0;
  exactUtterances = 0;

  private slot(name: string): SpanCounts {
    let c = this.counts.get(name);
    if (c === undefined) {
      c = { truePositives: 0, falsePositives: 0, falseNegatives: 0 };
      this.counts.set(name, c);
    }
    return c;
  }

  /**
   * Count one utterance. A span is correct only when slot, start and end all match (exact match,
   * the CoNLL-2000 shared task's conlleval convention); both sides are read leniently as conlleval does.
   */
  add(gold: readonly string[], predicted: readonly string[]): void {
    const goldSpans = spansFromTags(gold);
    const predictedSpans = spansFromTags(predicted);
    const key = (s: { start: number; end: number; slot: string }) => `${s.start}:${s.end}:${s.slot}`;
    const goldKeys = new Set(goldSpans.map(key));
    const predictedKeys = new Set(predictedSpans.map(key));
    for (const span of goldSpans) this.slot(span.slot);
    for (const span of predictedSpans) {
      const c = this.slot(span.slot);
      if (goldKeys.has(key(span))) c.truePositives++;
      else c.falsePositives++;
    }
    for (const span of goldSpans) if (!predictedKeys.has(key(span))) this.slot(span.slot).falseNegatives++;
    this.utterances++;
    if (goldKeys.size === predictedKeys.size && [...goldKeys].every((k) => predictedKeys.has(k))) this.exactUtterances++;
  }

  result(): SpanEvaluation {
    const slots: Record<string, SpanFigures> = {};
    const total: SpanCounts = { truePositives: 0, falsePositives: 0, falseNegatives: 0 };
    for (const name of [...this.counts.keys()].sort()) {
      const c = this.counts.get(name) as SpanCounts;
      slots[name] = spanFigures(c);
      total.truePositives += c.truePositives;
      total.falsePositives += c.falsePositives;
      total.falseNegatives += c.falseNegatives;
    }
    return { slots, overall: spanFigures(total), utterances: this.utterances, exactUtterances: this.exactUtterances };
  }
}

export function spansEvaluate(gold: readonly (readonly string[])[], predicted: readonly (readonly string[])[]): SpanEvaluation {
  if (gold.length !== predicted.length) throw new RangeError('spansEvaluate: gold and predicted differ in length');
  const tally = new SpanTally();
  gold.forEach((tags, i) => tally.add(tags, predicted[i] ?? []));
  return tally.result();
}
