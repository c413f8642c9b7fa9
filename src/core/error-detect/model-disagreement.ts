import { spansFromTags } from '../schemes';
import type { Span } from '../types';
import { locationCompare, tagsNormalise, tokenFold } from './normalise';
import type { LabelledUtterance, ModelDisagreementFinding } from './types';

/** An annotator's utterance with the model's tags and the model's confidence in each of its tags. */
export interface ModelComparedUtterance extends LabelledUtterance {
  modelTags: readonly string[];
  /** Per token, in [0, 1]; a missing value counts as 0 (not confident). */
  confidences: readonly number[];
}

export interface ModelDisagreementOptions {
  /** Report a stretch only when the model's lowest confidence on it is at least this (default 0.9). */
  minConfidence?: number;
}

export const MODEL_DISAGREEMENT_MIN_CONFIDENCE = 0.9;

/**
 * Stretches where the annotator's spans and the model's spans differ (spans compared exactly, as in
 * CoNLL-2000 scoring), overlapping differences merged into one stretch, kept when the model is
 * confident on every token of it; most confident first.
 */
export function modelDisagreementsFind(
  utterances: readonly ModelComparedUtterance[],
  options: ModelDisagreementOptions = {},
): ModelDisagreementFinding[] {
  const minConfidence = options.minConfidence ?? MODEL_DISAGREEMENT_MIN_CONFIDENCE;
  const findings: ModelDisagreementFinding[] = [];
  for (const utterance of utterances) {
    const annotatorTags = tagsNormalise(utterance);
    const modelTags = tagsNormalise({ ...utterance, tags: utterance.modelTags });
    for (const stretch of stretchesDiffering(spansFromTags(annotatorTags), spansFromTags(modelTags))) {
      let confidence = 1;
      for (let i = stretch.start; i < stretch.end; i++) confidence = Math.min(confidence, utterance.confidences[i] ?? 0);
      if (!(confidence >= minConfidence)) continue;
      findings.push({
        kind: 'model-disagreement',
        location: { id: utterance.id, layer: utterance.layer, start: stretch.start, end: stretch.end },
        tokens: utterance.tokens.slice(stretch.start, stretch.end).map(tokenFold),
        annotatorTags: annotatorTags.slice(stretch.start, stretch.end),
        modelTags: modelTags.slice(stretch.start, stretch.end),
        confidence,
      });
    }
  }
  return findings.sort((a, b) => b.confidence - a.confidence || locationCompare(a.location, b.location));
}

/** Token ranges covered by spans found in only one of the two lists, overlapping ranges merged. */
export function stretchesDiffering(a: readonly Span[], b: readonly Span[]): { start: number; end: number }[] {
  const key = (span: Span): string => `${String(span.start)}:${String(span.end)}:${span.slot}`;
  const inA = new Set(a.map(key));
  const inB = new Set(b.map(key));
  const unmatched = [...a.filter((span) => !inB.has(key(span))), ...b.filter((span) => !inA.has(key(span)))];
  unmatched.sort((x, y) => x.start - y.start || x.end - y.end);
  const stretches: { start: number; end: number }[] = [];
  for (const span of unmatched) {
    const last = stretches[stretches.length - 1];
    if (last !== undefined && span.start < last.end) last.end = Math.max(last.end, span.end);
    else stretches.push({ start: span.start, end: span.end });
  }
  return stretches;
}
