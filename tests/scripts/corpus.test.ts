import { readdirSync, readFileSync } from 'node:fs';
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { ANNOTATOR_PROFILES, type AnnotatorProfile } from '../../scripts/corpus/annotators';
import { SAMPLE_CORPUS, corpusFiles, sampleCorpusFiles, type CorpusFile } from '../../scripts/corpus/files';
import { corpusGenerate, type Corpus } from '../../scripts/corpus/generate';
import { Random, mulberry32Next } from '../../scripts/corpus/random';
import { CORPUS_INTENTS, CORPUS_INTENT_SLOTS, CORPUS_SLOTS, type CorpusSchemaJson } from '../../scripts/corpus/schema';
import { TEMPLATES } from '../../scripts/corpus/templates';
import { columnsRead, jsonlRead } from '../../src/core/formats';
import { spansFromTags, tagParse } from '../../src/core/schemes';
import { tokenise } from '../../src/core/tokenise';
import type { Span, Utterance } from '../../src/core/types';

const FOLDER = new URL('../../sample-corpus/', import.meta.url);
const RUNS = { seed: 42, numRuns: 200 };
/** NANP numbers reserved for fiction are 555-0100..555-0199 (common practice, no source), in our spellings. */
const FICTIONAL_PHONE = /^(?:\(555\) ?|555[-. ]?)01\d\d$/u;

let sample: Corpus;
let fresh: CorpusFile[];
beforeAll(() => {
  sample = corpusGenerate(SAMPLE_CORPUS);
  fresh = corpusFiles(sample);
});

function spanText(u: Utterance, span: Span): string {
  return u.text.slice(u.tokens[span.start]?.start ?? 0, u.tokens[span.end - 1]?.end ?? 0);
}

function spanKey(span: Span): string {
  return `${span.start}:${span.end}:${span.slot}`;
}

/** Count of utterances with an I-X not preceded by B-X or I-X, the IOB2 rule (Tjong Kim Sang & Veenstra, EACL 1999). */
function illegalIob2Count(utterances: readonly Utterance[]): number {
  return utterances.filter((u) =>
    u.tags.some((tag, i) => {
      const parsed = tagParse(tag);
      if (parsed?.prefix !== 'I') return false;
      const previous = tagParse(u.tags[i - 1] ?? 'O');
      return previous === null || previous.prefix === 'O' || previous.slot !== parsed.slot;
    }),
  ).length;
}

function idsInColumns(content: string): string[] {
  return [...content.matchAll(/^# id = (.+)$/gmu)].map((m) => m[1] ?? '');
}

describe('mulberry32', () => {
  it('matches the reference C implementation', () => {
    // Expected outputs from Tommy Ettinger's mulberry32 in C (written down from memory), compiled with cc.
    const expected: Record<number, number[]> = {
      0: [1144304738, 1416247, 958946056, 627933444, 2007157716],
      42: [2581720956, 1925393290, 3661312704, 2876485805, 750819978],
      4294967295: [3850105811, 813802916, 3073704848, 4054706436, 3630262831],
    };
    for (const [seed, values] of Object.entries(expected)) {
      const rng = new Random(Number(seed));
      expect(values.map(() => rng.uint32())).toEqual(values);
    }
    expect(mulberry32Next(0).value).toBe(1144304738);
  });

  it('keeps draws in range and shuffles into permutations', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 0xffffffff }), fc.integer({ min: 1, max: 50 }), (seed, n) => {
        const rng = new Random(seed);
        for (let i = 0; i < 20; i++) {
          const f = rng.float();
          const k = rng.int(n);
          if (!(f >= 0 && f < 1 && Number.isInteger(k) && k >= 0 && k < n)) return false;
        }
        const items = Array.from({ length: n }, (_, i) => i);
        return rng.shuffle(items).sort((a, b) => a - b).every((v, i) => v === i);
      }),
      RUNS,
    );
  });

  it('spreads floats evenly (chi-square over 10 bins)', () => {
    const rng = new Random(7);
    const bins = new Array<number>(10).fill(0);
    const n = 100_000;
    for (let i = 0; i < n; i++) {
      const bin = Math.floor(rng.float() * 10);
      bins[bin] = (bins[bin] ?? 0) + 1;
    }
    const chi = bins.reduce((sum, observed) => sum + (observed - n / 10) ** 2 / (n / 10), 0);
    // 27.88 is the chi-square 0.999 quantile for 9 degrees of freedom (standard statistical tables, from memory).
    expect(chi).toBeLessThan(27.88);
  });
});

describe('corpusGenerate', () => {
  it('is deterministic: the same seed gives byte-identical files', () => {
    const again = corpusFiles(corpusGenerate(SAMPLE_CORPUS));
    expect(again).toEqual(fresh);
    const other = corpusGenerate({ ...SAMPLE_CORPUS, seed: SAMPLE_CORPUS.seed + 1, count: 200 });
    expect(other.truth.map((u) => u.text)).not.toEqual(sample.truth.slice(0, 200).map((u) => u.text));
  });

  it('gives the same first utterances whatever the count', () => {
    const small = corpusGenerate({ ...SAMPLE_CORPUS, count: 50 });
    expect(small.truth).toEqual(sample.truth.slice(0, 50));
  });

  it('honours count, overlapShare and the annotator list', () => {
    expect(corpusGenerate({ seed: 1, count: 0 }).truth).toEqual([]);
    const half = corpusGenerate({ seed: 1, count: 400, overlapShare: 0.5 });
    expect(half.overlapIds).toHaveLength(200);
    expect(half.layers.map((l) => l.utterances.length)).toEqual([300, 300]);
    const none = corpusGenerate({ seed: 1, count: 10, annotators: [] });
    expect(none.layers).toEqual([]);
    expect(none.truth).toHaveLength(10);
    expect(() => corpusGenerate({ seed: 1, count: 10, overlapShare: 1.5 })).toThrow(RangeError);
  });

  it('numbers ids hr-00001 onwards, widening past 99,999', () => {
    expect(sample.truth[0]?.id).toBe('hr-00001');
    expect(sample.truth[1999]?.id).toBe('hr-02000');
    expect(new Set(sample.truth.map((u) => u.id)).size).toBe(2000);
  });

  it('uses every template in the sample', () => {
    const used = new Set(sample.truth.map((u) => u.meta.template));
    const all = Object.values(TEMPLATES).flat().map((t) => t.id);
    expect(all.filter((id) => !used.has(id))).toEqual([]);
  });
});

describe('committed sample-corpus/', () => {
  it('equals a fresh generation byte for byte (run `npm run corpus` after changing the generator)', () => {
    const committed = readdirSync(FOLDER).sort();
    expect(committed).toEqual(fresh.map((f) => f.name).sort());
    for (const file of sampleCorpusFiles()) {
      expect(readFileSync(new URL(file.name, FOLDER), 'utf8'), file.name).toBe(file.content);
    }
  });

  it('has a 20 % overlap labelled by both annotators and the rest split between them', () => {
    const overlap = readFileSync(new URL('overlap-ids.txt', FOLDER), 'utf8').trim().split('\n');
    const truthIds = idsInColumns(readFileSync(new URL('truth.iob2', FOLDER), 'utf8'));
    const a = new Set(idsInColumns(readFileSync(new URL('ann-a.iob2', FOLDER), 'utf8')));
    const b = new Set(idsInColumns(readFileSync(new URL('ann-b.iob2', FOLDER), 'utf8')));
    const both = truthIds.filter((id) => a.has(id) && b.has(id));
    expect(both).toEqual(overlap);
    expect(Math.abs(both.length / truthIds.length - 0.2)).toBeLessThanOrEqual(0.01);
    expect(truthIds.every((id) => a.has(id) || b.has(id))).toBe(true);
    const onlyA = truthIds.filter((id) => a.has(id) && !b.has(id)).length;
    const onlyB = truthIds.filter((id) => b.has(id) && !a.has(id)).length;
    expect(Math.abs(onlyA - onlyB)).toBeLessThanOrEqual(1);
  });

  it('reads back through the core readers with the same texts, tags and intents', () => {
    const layers = [{ name: 'truth', utterances: sample.truth }, ...sample.layers.map((l) => ({ name: l.annotator, utterances: l.utterances }))];
    for (const { name, utterances } of layers) {
      const columns = columnsRead(readFileSync(new URL(`${name}.iob2`, FOLDER), 'utf8'), { scheme: 'iob2' });
      expect(columns.errors, name).toEqual([]);
      const brief = (u: Utterance) => ({ id: u.id, text: u.text, tags: u.tags, intent: u.intent, meta: u.meta });
      expect(columns.utterances.map(brief)).toEqual(utterances.map(brief));
      const jsonl = jsonlRead(readFileSync(new URL(`${name}.jsonl`, FOLDER), 'utf8'));
      expect(jsonl.errors, name).toEqual([]);
      // JSON Lines keeps spans, read leniently, so compare decoded spans rather than raw tags.
      expect(jsonl.utterances.map((u) => spansFromTags(u.tags))).toEqual(utterances.map((u) => spansFromTags(u.tags)));
    }
  });

  it('writes schema.json from the declared schema', () => {
    const schema = JSON.parse(readFileSync(new URL('schema.json', FOLDER), 'utf8')) as CorpusSchemaJson;
    expect(schema.intents.map((i) => i.name)).toEqual([...CORPUS_INTENTS]);
    expect(schema.slots.map((s) => s.name)).toEqual([...CORPUS_SLOTS]);
    for (const intent of schema.intents) expect(intent.slots).toEqual([...CORPUS_INTENT_SLOTS[intent.name]]);
  });

  it('says in its README that the data is invented and how to regenerate it', () => {
    const readme = readFileSync(new URL('README.md', FOLDER), 'utf8');
    expect(readme).toContain('npm run corpus');
    expect(readme).toContain(String(SAMPLE_CORPUS.seed));
    expect(readme).toMatch(/invented/u);
    expect(readme).toContain('555-0100 to 555-0199');
  });
});

describe('labels', () => {
  it('tokens reproduce tokenise(text) in every layer', () => {
    const all = [...sample.truth, ...sample.layers.flatMap((l) => l.utterances)];
    const differing = all.filter(
      (u) => JSON.stringify(u.tokens) !== JSON.stringify(tokenise(u.text, { kind: 'words' })) || u.tags.length !== u.tokens.length,
    );
    expect(differing.map((u) => u.id)).toEqual([]);
  });

  it('keeps the reference layer legal IOB2 and inside the schema', () => {
    expect(illegalIob2Count(sample.truth)).toBe(0);
    const problems: string[] = [];
    for (const u of sample.truth) {
      const intent = u.intent as (typeof CORPUS_INTENTS)[number];
      if (!CORPUS_INTENTS.includes(intent)) problems.push(`${u.id}: intent ${intent}`);
      for (const tag of u.tags) if (!/^[OBI]$/u.test(tagParse(tag)?.prefix ?? 'bad')) problems.push(`${u.id}: tag ${tag}`);
      for (const span of spansFromTags(u.tags)) {
        if (!CORPUS_INTENT_SLOTS[intent].includes(span.slot as never)) problems.push(`${u.id}: ${span.slot} under ${intent}`);
      }
    }
    expect(problems).toEqual([]);
  });

  it('keeps annotator layers to declared slots and intents', () => {
    const intents = new Set(sample.layers.flatMap((l) => l.utterances.map((u) => u.intent)));
    const tags = new Set(sample.layers.flatMap((l) => l.utterances.flatMap((u) => u.tags)));
    expect([...intents].filter((i) => !CORPUS_INTENTS.includes(i as never))).toEqual([]);
    const allowed = new Set(['O', ...CORPUS_SLOTS.flatMap((slot) => [`B-${slot}`, `I-${slot}`])]);
    expect([...tags].filter((t) => !allowed.has(t))).toEqual([]);
    // Each declared slot shows up, so the check above is not vacuous.
    expect(CORPUS_SLOTS.filter((slot) => !tags.has(`B-${slot}`))).toEqual([]);
  });

  it('writes only fictional 555-01xx phone numbers', () => {
    const phones = sample.truth.flatMap((u) => spansFromTags(u.tags).filter((s) => s.slot === 'contact_phone').map((s) => spanText(u, s)));
    expect(phones.length).toBeGreaterThan(100);
    for (const phone of phones) expect(phone).toMatch(FICTIONAL_PHONE);
    // Any phone-shaped digit run anywhere in the texts must be one of ours too.
    const text = readFileSync(new URL('utterances.txt', FOLDER), 'utf8');
    const shaped = [...text.matchAll(/\(?\d{3}\)?[-. ]?\d{4}/gu)].map((m) => m[0]);
    expect(shaped.length).toBe(phones.length);
    for (const found of shaped) expect(found).toMatch(FICTIONAL_PHONE);
  });
});

interface Measured {
  spans: number;
  boundary: number;
  slotType: number;
  missed: number;
}

/** Classify each reference span against an annotator's spans, independently of the generator's own log. */
function disagreementsMeasure(truth: readonly Utterance[], labelled: readonly Utterance[]): Measured {
  const byId = new Map(truth.map((u) => [u.id, u]));
  const out: Measured = { spans: 0, boundary: 0, slotType: 0, missed: 0 };
  for (const u of labelled) {
    const reference = spansFromTags(byId.get(u.id)?.tags ?? []);
    const theirs = spansFromTags(u.tags);
    const exact = new Set(theirs.map(spanKey));
    for (const span of reference) {
      out.spans++;
      if (exact.has(spanKey(span))) continue;
      const overlapping = theirs.filter((s) => s.start < span.end && s.end > span.start);
      if (overlapping.some((s) => s.start === span.start && s.end === span.end)) out.slotType++;
      else if (overlapping.some((s) => s.slot === span.slot)) out.boundary++;
      else if (overlapping.length === 0) out.missed++;
    }
  }
  return out;
}

describe('injected disagreements', () => {
  const profileOf = (id: string): AnnotatorProfile => ANNOTATOR_PROFILES.find((p) => p.id === id) as AnnotatorProfile;

  it('puts span errors near the configured rates', () => {
    for (const layer of sample.layers) {
      const profile = profileOf(layer.annotator);
      const m = disagreementsMeasure(sample.truth, layer.utterances);
      // Wide bands: a boundary move is skipped where no neighbouring word can move, and ~2,500 spans give sampling noise.
      expect(m.missed / m.spans).toBeGreaterThan(profile.missed * 0.6);
      expect(m.missed / m.spans).toBeLessThan(profile.missed * 1.5);
      expect(m.slotType / m.spans).toBeGreaterThan(profile.slotType * 0.6);
      expect(m.slotType / m.spans).toBeLessThan(profile.slotType * 1.5);
      expect(m.boundary / m.spans).toBeGreaterThan(profile.boundary * 0.5);
      expect(m.boundary / m.spans).toBeLessThan(profile.boundary * 1.5);
    }
  });

  it('changes intents mostly on ambiguous utterances', () => {
    const truthById = new Map(sample.truth.map((u) => [u.id, u]));
    for (const layer of sample.layers) {
      const profile = profileOf(layer.annotator);
      const ambiguous = layer.utterances.filter((u) => truthById.get(u.id)?.meta.alt_intent !== undefined);
      const plain = layer.utterances.filter((u) => truthById.get(u.id)?.meta.alt_intent === undefined);
      const tookAlt = ambiguous.filter((u) => u.intent === truthById.get(u.id)?.meta.alt_intent).length;
      const slipped = plain.filter((u) => u.intent !== truthById.get(u.id)?.intent).length;
      expect(ambiguous.length).toBeGreaterThan(100);
      expect(Math.abs(tookAlt / ambiguous.length - profile.ambiguousIntent)).toBeLessThan(0.1);
      expect(slipped / plain.length).toBeLessThan(profile.intentSlip * 2 + 0.005);
      expect(slipped).toBeGreaterThan(0);
    }
  });

  it('breaks IOB2 in about 1 % of each annotator layer, never in the reference', () => {
    for (const layer of sample.layers) {
      const rate = illegalIob2Count(layer.utterances) / layer.utterances.length;
      expect(rate).toBeGreaterThanOrEqual(0.003);
      expect(rate).toBeLessThanOrEqual(0.02);
    }
    const kinds = sample.layers.map((l) => l.injected.illegalAfterO + l.injected.illegalAfterOther);
    expect(kinds.every((k) => k > 0)).toBe(true);
    expect(sample.layers.some((l) => l.injected.illegalAfterO > 0 && l.injected.illegalAfterOther > 0)).toBe(true);
  });

  it('makes the two annotators agree on the overlap about as often as their rates predict', () => {
    const [a, b] = sample.layers;
    const overlap = new Set(sample.overlapIds);
    const aById = new Map(a?.utterances.map((u) => [u.id, u]));
    const bById = new Map(b?.utterances.map((u) => [u.id, u]));
    const pa = profileOf('ann-a');
    const pb = profileOf('ann-b');
    // Per span, both must leave it alone (one draw each for missed, type or boundary); ignore the rarer intent and IOB2 noise.
    const keep = (1 - pa.missed - pa.slotType - pa.boundary) * (1 - pb.missed - pb.slotType - pb.boundary);
    let expected = 0;
    let same = 0;
    let expectedIntent = 0;
    let sameIntent = 0;
    for (const u of sample.truth) {
      if (!overlap.has(u.id ?? '')) continue;
      expected += keep ** spansFromTags(u.tags).length;
      if (aById.get(u.id)?.tags.join(' ') === bById.get(u.id)?.tags.join(' ')) same++;
      // Both keep the reference intent or both take the alternative; slips to the same intent are ignored.
      const ambiguous = u.meta.alt_intent !== undefined;
      expectedIntent += ambiguous
        ? pa.ambiguousIntent * pb.ambiguousIntent + (1 - pa.ambiguousIntent) * (1 - pb.ambiguousIntent)
        : (1 - pa.intentSlip) * (1 - pb.intentSlip);
      if (aById.get(u.id)?.intent === bById.get(u.id)?.intent) sameIntent++;
    }
    expect(Math.abs(sameIntent - expectedIntent) / overlap.size).toBeLessThan(0.04);
    expect(overlap.size).toBe(400);
    expect(Math.abs(same - expected) / overlap.size).toBeLessThan(0.07);
  });
});
