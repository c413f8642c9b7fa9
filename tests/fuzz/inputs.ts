/**
 * Fuzz inputs: valid files from our own writers, then mutated byte- or text-wise (truncation, random
 * bytes, invalid UTF-8, other encodings, huge lines, CR/LF mixes, stray quotes and brackets), plus
 * wholly random bytes and strings. Every input comes as the bytes a file would hold and as the text a
 * caller might pass instead.
 */
import fc from 'fast-check';

const encoder = new TextEncoder();
const lenient = new TextDecoder('utf-8', { fatal: false, ignoreBOM: true });

export interface FuzzInput {
  bytes: Uint8Array;
  text: string;
}

/**
 * Byte sequences that are not UTF-8: a lone continuation byte, a lead byte cut short, an overlong
 * slash, an encoded surrogate, bytes above F4 (Unicode 15, ch. 3, table 3-7 "Well-Formed UTF-8 Byte
 * Sequences").
 */
const INVALID_UTF8: readonly number[][] = [[0x80], [0xc3], [0xe2, 0x82], [0xc0, 0xaf], [0xed, 0xa0, 0x80], [0xf5, 0x80, 0x80, 0x80], [0xff], [0xfe, 0xff]];

/** Text fragments that break one format or another. */
const NASTY_TEXT: readonly string[] = [
  '"',
  '""',
  '"a,b"',
  '"x\n"',
  ',',
  '\t',
  '\r',
  '\r\n',
  '\n\n',
  '{',
  '}',
  '[',
  '{"text":',
  '{"text": "fix", "tokens": [{"start": 0, "end": 9}]}',
  '{"text": "fix", "spans": [{"start": 2, "end": 1, "slot": "day"}]}',
  'null',
  '# text = something else entirely',
  '# text = ',
  '# id = ',
  '# intent = book_visit',
  '# = ',
  '-DOCSTART- -X- O O',
  'tap\tB-',
  'tap\tE-day',
  'tap\tS-budget',
  'tap\tI-area',
  'tap\tB-day\tB-area',
  'tap B-day',
  '\uFEFF',
  '\uD800',
  '\uDFFF',
  '\u202E',
  '\u200B',
  '\u0000',
  '\u2028',
  '🔧',
  '=1+1',
  '{"format":"slotsmith-backup","formatVersion":1}',
  '{"type":"utterance","seq":1,"text":"x","tokens":[0,1],"meta":{}}',
  '{"type":"layer","seq":1,"annotator":"ana","tags":["O"],"intent":null,"status":"done","note":"","revision":1,"updated":1}',
  '{"format":"slotsmith-backup","formatVersion":99}',
  '{"type":"history"}',
  '\t{"sha256":"00"}',
];

type Mutation = (bytes: Uint8Array) => Uint8Array;

function concat(...parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}

/** A position in `bytes` picked from a fraction, so the arbitrary needs no length up front. */
function at(bytes: Uint8Array, fraction: number): number {
  return Math.min(bytes.length, Math.floor(fraction * (bytes.length + 1)));
}

function lineStarts(bytes: Uint8Array): number[] {
  const starts = [0];
  bytes.forEach((b, i) => {
    if (b === 10) starts.push(i + 1);
  });
  return starts;
}

/** UTF-16 code units as little-endian bytes (a file saved "as Unicode"), BOM first. */
function utf16le(text: string): Uint8Array {
  const out = new Uint8Array(2 + text.length * 2);
  out[0] = 0xff;
  out[1] = 0xfe;
  for (let i = 0; i < text.length; i++) {
    const unit = text.charCodeAt(i);
    out[2 + 2 * i] = unit & 0xff;
    out[3 + 2 * i] = unit >> 8;
  }
  return out;
}

/** Code points below 256 as single bytes, others as '?': a file saved as Latin-1. */
function latin1(text: string): Uint8Array {
  return Uint8Array.from([...text], (c) => {
    const cp = c.codePointAt(0) ?? 63;
    return cp < 256 ? cp : 63;
  });
}

const fraction = fc.double({ min: 0, max: 1, noNaN: true });

const mutationArbitrary: fc.Arbitrary<Mutation> = fc.oneof(
  fraction.map((f): Mutation => (b) => b.slice(0, at(b, f))),
  fc.tuple(fraction, fc.uint8Array({ minLength: 1, maxLength: 12 })).map(([f, extra]): Mutation => (b) => concat(b.slice(0, at(b, f)), extra, b.slice(at(b, f)))),
  fc.tuple(fraction, fc.nat(255)).map(([f, value]): Mutation => (b) => {
    const out = b.slice();
    const i = Math.min(at(b, f), out.length - 1);
    if (i >= 0) out[i] = value;
    return out;
  }),
  fc.tuple(fraction, fraction).map(([f, g]): Mutation => (b) => concat(b.slice(0, at(b, Math.min(f, g))), b.slice(at(b, Math.max(f, g))))),
  fc.tuple(fraction, fc.constantFrom(...INVALID_UTF8)).map(([f, bad]): Mutation => (b) => concat(b.slice(0, at(b, f)), Uint8Array.from(bad), b.slice(at(b, f)))),
  fc.tuple(fraction, fc.constantFrom(...NASTY_TEXT)).map(([f, text]): Mutation => (b) => concat(b.slice(0, at(b, f)), encoder.encode(text), b.slice(at(b, f)))),
  // A line duplicated or two lines swapped: repeated ids, records out of order, counts off by one.
  fc.tuple(fraction, fraction).map(([f, g]): Mutation => (b) => {
    const starts = lineStarts(b);
    const i = Math.min(starts.length - 1, Math.floor(f * starts.length));
    const j = Math.min(starts.length - 1, Math.floor(g * starts.length));
    const line = (k: number) => b.slice(starts[k], starts[k + 1] ?? b.length);
    if (i === j) return concat(b.slice(0, starts[i]), line(i), b.slice(starts[i]));
    const [lo, hi] = i < j ? [i, j] : [j, i];
    return concat(b.slice(0, starts[lo]), line(hi), b.slice(starts[lo + 1] ?? b.length, starts[hi]), line(lo), b.slice(starts[hi + 1] ?? b.length));
  }),
  fc.constantFrom<Mutation>(
    (b) => utf16le(lenient.decode(b)),
    (b) => latin1(lenient.decode(b)),
    (b) => encoder.encode(lenient.decode(b).replaceAll('\n', '\r\n')),
    (b) => encoder.encode(lenient.decode(b).replaceAll('\n', '\r')),
    (b) => concat(Uint8Array.of(0xef, 0xbb, 0xbf), b),
    (b) => Uint8Array.from(b.filter((x) => x !== 10)),
  ),
);

/**
 * A huge line: one long word or a long run of separators (memory and offset paths). Kept rare: word
 * segmentation of a many-token line costs far more than the rest of a case (see HUGE_WEIGHT).
 */
const hugeLineArbitrary: fc.Arbitrary<Mutation> = fc
  .tuple(fraction, fc.constantFrom('w', ' ', '\t', '"', 'é', '🔧', 'a\tO ', '{"', '\\'), fc.integer({ min: 2_000, max: 12_000 }))
  .map(([f, unit, count]): Mutation => (b) => concat(b.slice(0, at(b, f)), encoder.encode(unit.repeat(Math.ceil(count / unit.length))), b.slice(at(b, f))));

/** One mutation in about 100 inserts a huge line. */
const HUGE_WEIGHT = 1;
const anyMutationArbitrary = fc.oneof({ weight: 100 - HUGE_WEIGHT, arbitrary: mutationArbitrary }, { weight: HUGE_WEIGHT, arbitrary: hugeLineArbitrary });

/** Text-level mutations the byte path cannot carry: lone surrogates survive only in strings. */
const textMutationArbitrary: fc.Arbitrary<(text: string) => string> = fc.oneof(
  fc.tuple(fraction, fc.string({ unit: 'binary', maxLength: 6 })).map(([f, extra]) => (t: string) => {
    const i = Math.floor(f * (t.length + 1));
    return t.slice(0, i) + extra + t.slice(i);
  }),
  fraction.map((f) => (t: string) => t.slice(0, Math.floor(f * (t.length + 1)))),
);

/** Mutants of the files `valid` writes, and random bytes and strings now and then. */
export function fuzzInputArbitrary(valid: fc.Arbitrary<string>): fc.Arbitrary<FuzzInput> {
  const mutated = fc.tuple(valid, fc.array(anyMutationArbitrary, { minLength: 1, maxLength: 4 }), fc.option(textMutationArbitrary, { freq: 3 })).map(([text, mutations, textMutation]): FuzzInput => {
    const bytes = mutations.reduce<Uint8Array>((b, m) => m(b), encoder.encode(text));
    const decoded = lenient.decode(bytes);
    return { bytes, text: textMutation === null ? decoded : textMutation(decoded) };
  });
  const randomBytes = fc.uint8Array({ maxLength: 400 }).map((bytes): FuzzInput => ({ bytes, text: lenient.decode(bytes) }));
  const randomText = fc
    .array(fc.oneof(fc.string({ unit: 'binary', maxLength: 20 }), fc.constantFrom(...NASTY_TEXT)), { maxLength: 25 })
    .map((parts): FuzzInput => {
      const text = parts.join('');
      return { bytes: encoder.encode(text), text };
    });
  return fc.oneof({ weight: 6, arbitrary: mutated }, { weight: 1, arbitrary: randomBytes }, { weight: 1, arbitrary: randomText });
}

/** Cut points for splitting an input into chunks, as fractions of its length. */
export const cutFractionsArbitrary = fc.array(fraction, { maxLength: 6 });

export function chunksAt<T extends string | Uint8Array>(input: T, fractions: readonly number[]): T[] {
  const cuts = [...new Set(fractions.map((f) => Math.floor(f * input.length)))].sort((a, b) => a - b);
  const out: T[] = [];
  let from = 0;
  for (const cut of cuts) {
    out.push(input.slice(from, cut) as T);
    from = cut;
  }
  out.push(input.slice(from) as T);
  return out;
}

/** Upper bound on a reader's line numbers: LF-separated lines, plus lone CRs for readers that split on them. */
export function lineCount(input: string | Uint8Array, loneCarriageReturns: boolean): number {
  let lines = 1;
  const length = input.length;
  const code = typeof input === 'string' ? (i: number) => input.charCodeAt(i) : (i: number) => input[i] ?? 0;
  for (let i = 0; i < length; i++) {
    const c = code(i);
    if (c === 10) lines++;
    else if (loneCarriageReturns && c === 13 && code(i + 1) !== 10) lines++;
  }
  return lines;
}
