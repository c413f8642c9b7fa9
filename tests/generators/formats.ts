/**
 * Shared fast-check generators for the file-format tests: utterances of the home-repair booking
 * scenario, written in scripts that stress offsets and line handling (emoji with ZWJ and skin tones,
 * combining marks, Hebrew and Arabic, CJK, Hangul), plus helpers to cut inputs into chunks.
 */
import fc from 'fast-check';
import { tagsFromSpans } from '../../src/core/schemes';
import { tokeniseWhitespace } from '../../src/core/tokenise';
import type { Scheme, Span, Token, Utterance } from '../../src/core/types';

export const SLOTS = ['service', 'problem', 'area', 'day', 'time_window', 'budget', 'contact_phone', 'día', '地区'] as const;
export const INTENTS = ['book_visit', 'reschedule', 'cancel', 'ask_price', 'check_status'] as const;

/** Whole words, each free of white space (a column file cannot hold a token with a space). */
const WORDS = [
  'book', 'a', 'plumber', 'for', 'tomorrow', 'morning', 'leaking', 'tap', 'Elm', 'Row', '?', ',', '555-0142',
  '£80', 'café', 'cafe\u0301', 'n\u0303o', 'x\u0323\u0307', '🔧', '🚿', '👩\u200d🔧', '👍🏽', '🇬🇧',
  'ברז', 'מחר', 'سباك', 'غدا', '٥٥٥', '修理', '水道', '明日', '배관공', 'ｔａｐ', '#', '#leak', 'B-day', 'O',
];

/** Pieces to build fresh tokens from: letters, marks, astral symbols and joiners, no white space. */
const PIECES = ['e', 'Z', '7', '-', '_', '=', '"', "'", '\\', '/', '\u0301', '\u05d0', '\u0628', '\u4e00', '\ud55c', '🛠', '\u200d', '\u200f', '\ufe0f', 'ß', 'İ'];

export const tokenTextArbitrary: fc.Arbitrary<string> = fc.oneof(
  { weight: 3, arbitrary: fc.constantFrom(...WORDS) },
  { weight: 1, arbitrary: fc.array(fc.constantFrom(...PIECES), { minLength: 1, maxLength: 5 }).map((p) => p.join('')) },
);

/** Gaps between tokens: mostly one space, sometimes runs, a tab, NBSP or an ideographic space. */
const gapArbitrary = fc.oneof(
  { weight: 6, arbitrary: fc.constant(' ') },
  { weight: 1, arbitrary: fc.constantFrom('  ', '\t', '\u00a0', '\u3000', ' \u2003 ') },
);

const edgeArbitrary = fc.oneof({ weight: 5, arbitrary: fc.constant('') }, { weight: 1, arbitrary: fc.constantFrom(' ', '  ', '\t') });

/** One-line field values: ids, intents, meta values (leading and trailing spaces kept on purpose). */
export const fieldValueArbitrary: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom('hr-00017', 'fx 12', ' padded ', 'ann=b', 'ברז-3', '修理#9', '🔧', 'a = b'),
  fc.array(fc.constantFrom(...PIECES, ' ', 'q'), { minLength: 1, maxLength: 6 }).map((p) => p.join('')),
);

/** Keys that a `# key = value` comment can carry ("10" and "9" check code-unit order against object key order). */
export const metaKeyArbitrary = fc.constantFrom('template', 'annotator', 'source', 'note', '10', '9', 'Zeta', 'ключ', 'é');

const metaArbitrary = fc
  .uniqueArray(fc.tuple(metaKeyArbitrary, fieldValueArbitrary), { maxLength: 3, selector: ([key]) => key })
  .map((entries) => Object.fromEntries(entries));

export interface UtteranceShape {
  text: string;
  tokens: Token[];
}

/** Tokens joined by white-space gaps; each token is the first match after the previous one. */
export const shapeArbitrary: fc.Arbitrary<UtteranceShape> = fc
  .tuple(fc.array(fc.tuple(tokenTextArbitrary, gapArbitrary), { minLength: 1, maxLength: 8 }), edgeArbitrary, edgeArbitrary)
  .map(([pieces, lead, trail]) => {
    let text = lead;
    const tokens: Token[] = [];
    pieces.forEach(([word, gap], i) => {
      if (i > 0) text += gap;
      tokens.push({ start: text.length, end: text.length + word.length });
      text += word;
    });
    return { text: text + trail, tokens };
  });

/** Non-overlapping spans over `length` tokens, sorted. */
export function spansArbitrary(length: number): fc.Arbitrary<Span[]> {
  return fc.array(fc.tuple(fc.nat(length), fc.nat(3), fc.constantFrom(...SLOTS)), { maxLength: 4 }).map((raw) => {
    const spans: Span[] = [];
    const sorted = raw.map(([start, size, slot]) => ({ start, end: start + size + 1, slot })).sort((a, b) => a.start - b.start);
    let free = 0;
    for (const span of sorted) {
      if (span.start >= free && span.end <= length) {
        spans.push(span);
        free = span.end;
      }
    }
    return spans;
  });
}

function withOptional(utterance: Utterance, id: string | null, intent: string | null): Utterance {
  if (id !== null) utterance.id = id;
  if (intent !== null) utterance.intent = intent;
  return utterance;
}

/** A labelled utterance with tags in `scheme`, legal by construction. */
export function utteranceArbitrary(scheme: Scheme): fc.Arbitrary<Utterance> {
  return shapeArbitrary.chain((shape) =>
    fc
      .record({
        spans: spansArbitrary(shape.tokens.length),
        id: fc.option(fieldValueArbitrary, { nil: null }),
        intent: fc.option(fc.constantFrom(...INTENTS), { nil: null }),
        meta: metaArbitrary,
      })
      .map(({ spans, id, intent, meta }) =>
        withOptional({ ...shape, tags: tagsFromSpans(spans, shape.tokens.length, scheme), meta }, id, intent),
      ),
  );
}

export function corpusArbitrary(scheme: Scheme, maxLength = 6): fc.Arbitrary<Utterance[]> {
  return fc.array(utteranceArbitrary(scheme), { minLength: 1, maxLength });
}

/**
 * Utterances a text-only format can carry: no tags, tokens as the whitespace tokeniser finds them.
 * Line breaks inside texts are LF only: the CSV reader normalises CRLF, quoted ones included.
 */
export function plainUtteranceArbitrary(options: { ids: boolean; meta: boolean; lineBreaks: boolean }): fc.Arbitrary<Utterance> {
  const text = shapeArbitrary.chain((shape) =>
    options.lineBreaks ? fc.constantFrom(shape.text, `${shape.text}\nsecond ${shape.text}`, `a,"b"\n\n${shape.text}`) : fc.constant(shape.text),
  );
  return fc
    .record({
      text,
      id: options.ids ? fc.option(fc.constantFrom('hr-1', 'hr-2', 'x,y', 'say "hi"', 'ברז'), { nil: null }) : fc.constant(null),
      intent: options.ids ? fc.option(fc.constantFrom(...INTENTS), { nil: null }) : fc.constant(null),
      meta: options.meta ? metaArbitrary.map((m) => Object.fromEntries(Object.entries(m).filter(([, v]) => v !== ''))) : fc.constant({}),
    })
    .map(({ text: t, id, intent, meta }) => {
      const tokens = tokeniseWhitespace(t);
      return withOptional({ text: t, tokens, tags: tokens.map(() => 'O'), meta }, id, intent);
    });
}

/** Strip what only a reader knows (file lines), to compare with generated utterances. */
export function utteranceCore(utterance: Utterance): Utterance {
  const { line: _line, tokenLines: _tokenLines, ...rest } = utterance;
  return rest;
}

/** Cut points for splitting an input of `length` units into chunks (sorted, distinct, inside). */
export function cutsArbitrary(length: number): fc.Arbitrary<number[]> {
  return fc.uniqueArray(fc.integer({ min: 1, max: Math.max(1, length - 1) }), { maxLength: 12 }).map((cuts) =>
    cuts.filter((c) => c < length).sort((a, b) => a - b),
  );
}

export function chunksCut<T extends string | Uint8Array>(input: T, cuts: readonly number[]): T[] {
  const out: T[] = [];
  let from = 0;
  for (const cut of [...cuts, input.length]) {
    out.push(input.slice(from, cut) as T);
    from = cut;
  }
  return out;
}
