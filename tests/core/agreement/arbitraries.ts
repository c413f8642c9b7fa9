import fc from 'fast-check';
import { Random } from '../../../scripts/corpus/random';
import type { AlignLayer } from '../../../src/core/agreement';
import { tagsConvert } from '../../../src/core/schemes';
import type { Scheme, Token, Utterance } from '../../../src/core/types';

/** Invented home-repair labels for random corpora. */
export const SLOTS = ['area', 'day', 'problem', 'service', 'time_window'] as const;
export const INTENTS = ['ask_price', 'book_visit', 'cancel', 'check_status', 'reschedule'] as const;
const WORDS = ['fix', 'the', 'leaky', 'tap', 'on', 'monday', 'morning', 'in', 'leeds', 'please', 'boiler', 'quote', '555-0142'];
const SCHEMES: readonly Scheme[] = ['iob1', 'iob2', 'bioes'];

export interface CorpusPlan {
  layers: number;
  /** Largest utterance count (at least 1). */
  utterances: number;
  /** Chance a layer lacks an utterance. */
  missing: number;
  /** Chance a layer's token tag is redrawn at random (disagreement). */
  noise: number;
  /** 'all': every utterance has an intent; 'some': a few lack one; 'none': no intents. */
  intents: 'all' | 'some' | 'none';
  /** Number of slot types in use (1..5). */
  slots: number;
  /** Shuffle each layer's utterance order (alignment by id must not care). */
  shuffle: boolean;
}

function tokensOf(words: readonly string[]): { text: string; tokens: Token[] } {
  const tokens: Token[] = [];
  let text = '';
  for (const word of words) {
    if (text.length > 0) text += ' ';
    tokens.push({ start: text.length, end: text.length + word.length });
    text += word;
  }
  return { text, tokens };
}

function tagDraw(rng: Random, slots: number): string {
  const r = rng.int(5);
  if (r < 2) return 'O';
  const slot = SLOTS[rng.int(slots)] ?? 'day';
  return `${r < 4 ? 'B' : 'I'}-${slot}`;
}

/** Annotation layers over shared texts: each layer copies a base labelling, then errs at random. */
export function layersBuild(seed: number, plan: CorpusPlan): AlignLayer[] {
  const rng = new Random(seed);
  const count = 1 + rng.int(plan.utterances);
  const base = Array.from({ length: count }, (_, u) => {
    const length = 1 + rng.int(8);
    const words = Array.from({ length }, () => rng.pick(WORDS));
    const tags = words.map(() => tagDraw(rng, plan.slots));
    return { id: `hr-${String(u + 1).padStart(3, '0')}`, words, tags, intent: rng.pick(INTENTS) as string };
  });
  return Array.from({ length: plan.layers }, (_, l) => {
    const scheme = SCHEMES[rng.int(3)] ?? 'iob2';
    const utterances: Utterance[] = [];
    for (const item of base) {
      if (rng.float() < plan.missing) continue;
      const raw = item.tags.map((tag) => (rng.float() < plan.noise ? tagDraw(rng, plan.slots) : tag));
      // IOB2 layers keep any illegal sequence as drawn; the others are written legally in their scheme.
      const tags = scheme === 'iob2' ? raw : tagsConvert(raw, scheme);
      const utterance: Utterance = { id: item.id, ...tokensOf(item.words), tags, meta: {}, line: 1 + 10 * utterances.length };
      const intentRoll = rng.float();
      if (plan.intents === 'all' || (plan.intents === 'some' && intentRoll > 0.1)) {
        utterance.intent = rng.float() < plan.noise ? rng.pick(INTENTS) : item.intent;
      }
      utterances.push(utterance);
    }
    return { name: `ann-${String.fromCharCode(97 + l)}`, scheme, utterances: plan.shuffle ? rng.shuffle(utterances) : utterances };
  });
}

export const planArb = (layers: { min: number; max: number }, missing: number): fc.Arbitrary<CorpusPlan> =>
  fc.record({
    layers: fc.integer(layers),
    utterances: fc.integer({ min: 1, max: 14 }),
    missing: fc.constantFrom(0, missing),
    noise: fc.constantFrom(0, 0.1, 0.3, 0.7),
    intents: fc.constantFrom('all', 'some', 'none'),
    slots: fc.integer({ min: 1, max: 5 }),
    shuffle: fc.boolean(),
  });

/** A seed and a plan: the corpus itself is built by `layersBuild`, so a failing case prints compactly. */
export const corpusArb = (layers: { min: number; max: number }, missing: number): fc.Arbitrary<AlignLayer[]> =>
  fc.tuple(fc.integer({ min: 0, max: 0x7fffffff }), planArb(layers, missing)).map(([seed, plan]) => layersBuild(seed, plan));

/** Tag strings of a layer's utterance in IOB2, by id (what the core compares). */
export function iob2ById(layer: AlignLayer): Map<string, Utterance & { iob2: string[] }> {
  return new Map(layer.utterances.map((u) => [u.id ?? '', { ...u, iob2: tagsConvert(u.tags, 'iob2') }]));
}

export function slotOf(tag: string): string {
  return tag === 'O' ? 'O' : tag.slice(2);
}
