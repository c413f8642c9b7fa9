/**
 * Simulated annotators: each copies the reference labels and then errs the way people labelling
 * chat data tend to (off-by-one boundaries, day vs time_window, missed spans, a different intent on
 * ambiguous messages) plus a few tag sequences that break IOB2's grammar.
 */
import { spansFromTags, tagsFromSpans } from '../../src/core/schemes';
import type { Span, Token, Utterance } from '../../src/core/types';
import type { Random } from './random';
import { CORPUS_INTENTS, CORPUS_SLOTS, type CorpusIntent } from './schema';

export interface AnnotatorProfile {
  id: string;
  /** Per reference span: chance the annotator moves one edge by one token. */
  boundary: number;
  /** Per reference span: chance of a confusable slot type (day vs time_window...). */
  slotType: number;
  /** Per reference span: chance the span is left unlabelled. */
  missed: number;
  /** Per ambiguous utterance (template with an `alt` intent): chance of choosing the alternative. */
  ambiguousIntent: number;
  /** Per other utterance: chance of a confusable intent. */
  intentSlip: number;
  /** Per utterance with a span: chance of one illegal IOB2 transition (I-X after O or after B-Y). */
  illegal: number;
}

/** Error rates are our choice (common practice, no source): low single-digit per cent per span. */
export const ANNOTATOR_PROFILES: readonly AnnotatorProfile[] = [
  { id: 'ann-a', boundary: 0.03, slotType: 0.02, missed: 0.02, ambiguousIntent: 0.25, intentSlip: 0.01, illegal: 0.011 },
  { id: 'ann-b', boundary: 0.05, slotType: 0.035, missed: 0.035, ambiguousIntent: 0.4, intentSlip: 0.02, illegal: 0.011 },
];

export interface InjectedCounts {
  utterances: number;
  spans: number;
  boundary: number;
  slotType: number;
  missed: number;
  /** Intent changes on ambiguous utterances and elsewhere. */
  intentAmbiguous: number;
  intentSlip: number;
  ambiguousUtterances: number;
  illegalAfterO: number;
  illegalAfterOther: number;
}

export function injectedCountsEmpty(): InjectedCounts {
  return {
    utterances: 0, spans: 0, boundary: 0, slotType: 0, missed: 0, intentAmbiguous: 0, intentSlip: 0,
    ambiguousUtterances: 0, illegalAfterO: 0, illegalAfterOther: 0,
  };
}

const SLOT_CONFUSIONS: Record<string, string> = {
  day: 'time_window',
  time_window: 'day',
  service: 'problem',
  problem: 'service',
  contact_phone: 'booking_ref',
  booking_ref: 'contact_phone',
};

const INTENT_CONFUSIONS: Record<CorpusIntent, readonly CorpusIntent[]> = {
  book_visit: ['reschedule', 'ask_price'],
  reschedule: ['book_visit', 'cancel'],
  cancel: ['reschedule'],
  ask_price: ['book_visit'],
  check_status: ['confirm', 'reschedule'],
  confirm: ['book_visit', 'other'],
  other: ['confirm'],
};

/** Words annotators often sweep into a neighbouring span (common practice, no source). */
const LEFT_WORDS = new Set(['the', 'on', 'in', 'at', 'for', 'a', 'an', 'by', 'around', 'about', 'my', 'this', 'next']);
const WORDLIKE = /^[\p{L}\p{N}]/u;

function boundaryShift(span: Span, spans: readonly Span[], truth: Utterance, rng: Random): Span | null {
  // Only the rare boundary error needs token texts, so they are sliced here rather than per utterance.
  const words = tokenWords(truth.text, truth.tokens);
  const taken = (i: number): boolean => spans.some((s) => s !== span && i >= s.start && i < s.end);
  const isWord = (i: number): boolean => WORDLIKE.test(words[i] ?? '');
  const options: [number, Span][] = [];
  const before = span.start - 1;
  if (before >= 0 && !taken(before) && LEFT_WORDS.has((words[before] ?? '').toLowerCase())) {
    options.push([3, { ...span, start: before }]);
  }
  const long = span.end - span.start >= 2;
  if (long && isWord(span.start) && isWord(span.start + 1)) options.push([1, { ...span, start: span.start + 1 }]);
  if (span.end < words.length && !taken(span.end) && isWord(span.end)) options.push([1, { ...span, end: span.end + 1 }]);
  if (long && isWord(span.end - 1) && isWord(span.end - 2)) options.push([1, { ...span, end: span.end - 1 }]);
  return options.length === 0 ? null : rng.weighted(options);
}

function spansPerturb(
  reference: readonly Span[],
  utterance: Utterance,
  profile: AnnotatorProfile,
  rng: Random,
  counts: InjectedCounts,
): Span[] {
  const spans = reference.map((s) => ({ ...s }));
  const out: Span[] = [];
  for (const span of spans) {
    counts.spans++;
    const roll = rng.float();
    if (roll < profile.missed) {
      counts.missed++;
      span.end = span.start; // marks it dropped while keeping later neighbour checks simple
      continue;
    }
    if (roll < profile.missed + profile.slotType) {
      const other = SLOT_CONFUSIONS[span.slot];
      if (other !== undefined) {
        span.slot = other;
        counts.slotType++;
      }
    } else if (roll < profile.missed + profile.slotType + profile.boundary) {
      const shifted = boundaryShift(span, spans, utterance, rng);
      if (shifted !== null) {
        span.start = shifted.start;
        span.end = shifted.end;
        counts.boundary++;
      }
    }
  }
  for (const span of spans) if (span.end > span.start) out.push(span);
  return out;
}

function intentPerturb(
  intent: CorpusIntent,
  alt: CorpusIntent | undefined,
  profile: AnnotatorProfile,
  rng: Random,
  counts: InjectedCounts,
): CorpusIntent {
  if (alt !== undefined) {
    counts.ambiguousUtterances++;
    if (rng.chance(profile.ambiguousIntent)) {
      counts.intentAmbiguous++;
      return alt;
    }
    return intent;
  }
  if (rng.chance(profile.intentSlip)) {
    counts.intentSlip++;
    return rng.pick(INTENT_CONFUSIONS[intent]);
  }
  return intent;
}

/** Break IOB2 once: B-X becomes I-X, or the second tag of a span takes another slot. */
function tagsBreak(tags: string[], spans: readonly Span[], rng: Random, counts: InjectedCounts): void {
  const span = rng.pick(spans);
  if (span.end - span.start >= 2 && rng.chance(0.5)) {
    const other = SLOT_CONFUSIONS[span.slot] ?? CORPUS_SLOTS.find((s) => s !== span.slot) ?? 'day';
    tags[span.start + 1] = `I-${other}`;
    counts.illegalAfterOther++;
    return;
  }
  const previous = span.start === 0 ? 'O' : (tags[span.start - 1] ?? 'O');
  tags[span.start] = `I-${span.slot}`;
  if (previous === 'O') counts.illegalAfterO++;
  else counts.illegalAfterOther++;
}

export function tokenWords(text: string, tokens: readonly Token[]): string[] {
  return tokens.map((t) => text.slice(t.start, t.end));
}

/** One annotator's labels for one reference utterance. */
export function utteranceAnnotate(
  truth: Utterance,
  alt: CorpusIntent | undefined,
  profile: AnnotatorProfile,
  rng: Random,
  counts: InjectedCounts,
): Utterance {
  counts.utterances++;
  const spans = spansPerturb(spansFromTags(truth.tags), truth, profile, rng, counts);
  const tags = tagsFromSpans(spans, truth.tokens.length, 'iob2');
  if (spans.length > 0 && rng.chance(profile.illegal)) tagsBreak(tags, spans, rng, counts);
  const intent = intentPerturb((truth.intent ?? 'other') as CorpusIntent, alt, profile, rng, counts);
  const out: Utterance = { text: truth.text, tokens: truth.tokens, tags, intent, meta: { annotator: profile.id } };
  return truth.id === undefined ? out : { id: truth.id, ...out };
}

export function intentIsKnown(intent: string): intent is CorpusIntent {
  return (CORPUS_INTENTS as readonly string[]).includes(intent);
}
