/**
 * The seeded corpus generator: reference ("truth") utterances plus simulated annotator layers.
 * Pure TypeScript with no file access, so the benchmark can call it for large corpora.
 */
import { tagsFromSpans } from '../../src/core/schemes';
import { tokeniserCreate } from '../../src/core/tokenise';
import type { Span, Token, Utterance } from '../../src/core/types';
import {
  ANNOTATOR_PROFILES,
  injectedCountsEmpty,
  utteranceAnnotate,
  type AnnotatorProfile,
  type InjectedCounts,
} from './annotators';
import { Random, seedDerive } from './random';
import { templateRender, type Segment } from './render';
import { CORPUS_INTENTS, type CorpusIntent } from './schema';
import { INTENT_WEIGHTS, TEMPLATES, type Template } from './templates';

const wordTokeniser = tokeniserCreate({ kind: 'words' });

export interface CorpusOptions {
  seed: number;
  count: number;
  /** Share of utterances every annotator labels (default 0.2); the rest are dealt out in turn. */
  overlapShare?: number;
  annotators?: readonly AnnotatorProfile[];
  /** Id prefix (default "hr"), giving ids like hr-00001. */
  idPrefix?: string;
}

export interface AnnotatorLayer {
  annotator: string;
  utterances: Utterance[];
  injected: InjectedCounts;
}

export interface Corpus {
  seed: number;
  truth: Utterance[];
  layers: AnnotatorLayer[];
  /** Ids every annotator labelled, in corpus order. */
  overlapIds: string[];
  /** Typos put into the texts (the truth layer labels the misspelt words as they stand). */
  typos: number;
}

export class CorpusGenerationError extends Error {
  override name = 'CorpusGenerationError';
}

/** Token indices of each slot segment; throws if a token straddles a value edge (a template bug). */
export function spansFromSegments(segments: readonly Segment[], tokens: readonly Token[], text: string): Span[] {
  const spans: Span[] = [];
  let offset = 0;
  let t = 0;
  for (const segment of segments) {
    const start = offset;
    const end = offset + segment.text.length;
    offset = end;
    if (segment.slot === undefined) continue;
    while (t < tokens.length && (tokens[t]?.end ?? 0) <= start) t++;
    const first = t;
    while (t < tokens.length && (tokens[t]?.start ?? end) < end) {
      const token = tokens[t];
      if (token !== undefined && (token.start < start || token.end > end)) {
        throw new CorpusGenerationError(`slot ${segment.slot} cuts a token in ${JSON.stringify(text)}`);
      }
      t++;
    }
    if (t === first) throw new CorpusGenerationError(`slot ${segment.slot} has no token in ${JSON.stringify(text)}`);
    spans.push({ start: first, end: t, slot: segment.slot });
  }
  return spans;
}

function templatePick(rng: Random): Template {
  const intent = rng.weighted(CORPUS_INTENTS.map((name) => [INTENT_WEIGHTS[name], name] as const));
  return rng.pick(TEMPLATES[intent]);
}

function idFormat(prefix: string, index: number, width: number): string {
  return `${prefix}-${String(index + 1).padStart(width, '0')}`;
}

interface TruthItem {
  utterance: Utterance;
  alt: CorpusIntent | undefined;
}

function truthBuild(seed: number, count: number, prefix: string): { items: TruthItem[]; typos: number } {
  const rng = new Random(seedDerive(seed, 'texts'));
  const width = Math.max(5, String(count).length);
  const items: TruthItem[] = [];
  let typos = 0;
  for (let i = 0; i < count; i++) {
    const template = templatePick(rng);
    const rendered = templateRender(template, rng);
    typos += rendered.typos;
    const text = rendered.segments.map((s) => s.text).join('');
    const tokens = wordTokeniser(text);
    const spans = spansFromSegments(rendered.segments, tokens, text);
    const meta: Record<string, string> = { template: template.id };
    if (template.alt !== undefined) meta.alt_intent = template.alt;
    const utterance: Utterance = {
      id: idFormat(prefix, i, width),
      text,
      tokens,
      tags: tagsFromSpans(spans, tokens.length, 'iob2'),
      intent: template.intent,
      meta,
    };
    items.push({ utterance, alt: template.alt });
  }
  return { items, typos };
}

/** Which annotators label each utterance: a shuffled overlap share for all, the rest dealt in turn. */
export function assignmentsMake(seed: number, count: number, annotators: number, overlapShare: number): number[][] {
  if (!(overlapShare >= 0 && overlapShare <= 1)) throw new RangeError('overlapShare must lie in [0, 1]');
  const rng = new Random(seedDerive(seed, 'assignment'));
  const order = rng.shuffle(Array.from({ length: count }, (_, i) => i));
  const overlap = Math.round(count * overlapShare);
  const all = Array.from({ length: annotators }, (_, a) => a);
  const out: number[][] = new Array<number[]>(count);
  order.forEach((index, rank) => {
    out[index] = rank < overlap ? all : [(rank - overlap) % annotators];
  });
  return out;
}

/**
 * Generate a corpus. Same options, same output, byte for byte. Cost is linear in `count`
 * (100,000 utterances take about 7-9 s on the shared 2-core machine, over half of it in the core
 * word tokeniser; `tests/scripts/corpus.test.ts` holds it under 20 s).
 */
export function corpusGenerate(options: CorpusOptions): Corpus {
  const { seed, count } = options;
  if (!Number.isInteger(count) || count < 0) throw new RangeError('count must be a non-negative integer');
  const profiles = options.annotators ?? ANNOTATOR_PROFILES;
  const { items, typos } = truthBuild(seed, count, options.idPrefix ?? 'hr');
  const assignments = assignmentsMake(seed, count, profiles.length, options.overlapShare ?? 0.2);

  const layers: AnnotatorLayer[] = profiles.map((profile, a) => {
    const rng = new Random(seedDerive(seed, `annotator:${profile.id}`));
    const injected = injectedCountsEmpty();
    const utterances: Utterance[] = [];
    items.forEach((item, i) => {
      if (assignments[i]?.includes(a)) utterances.push(utteranceAnnotate(item.utterance, item.alt, profile, rng, injected));
    });
    return { annotator: profile.id, utterances, injected };
  });
  const overlapIds = items
    .filter((_, i) => profiles.length > 1 && (assignments[i]?.length ?? 0) === profiles.length)
    .map((item) => item.utterance.id ?? '');
  return { seed, truth: items.map((item) => item.utterance), layers, overlapIds, typos };
}
