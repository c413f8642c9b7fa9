import { describe, expect, it } from 'vitest';
import {
  findingKey,
  findingLocations,
  identicalFind,
  modelDisagreementsFind,
  slotOutliersFind,
  variationFind,
  type Finding,
  type LabelledUtterance,
  type ModelComparedUtterance,
} from '../../../src/core/error-detect';
import { spansFromTags } from '../../../src/core/schemes';
import type { Utterance } from '../../../src/core/types';
import { corpusGenerate } from '../../../scripts/corpus/generate';

function labelled(utterance: Utterance, layer: string): LabelledUtterance {
  const tokens = utterance.tokens.map((t) => utterance.text.slice(t.start, t.end));
  const base = { id: utterance.id ?? '', layer, tokens, tags: utterance.tags };
  return utterance.intent === undefined ? base : { ...base, intent: utterance.intent };
}

const sameSpans = (a: readonly string[], b: readonly string[]): boolean =>
  JSON.stringify(spansFromTags(a)) === JSON.stringify(spansFromTags(b));

describe('error detection on 20k generated utterances (correctness only, no timing)', () => {
  it('finds the injected slips, in range, and stably', () => {
    const corpus = corpusGenerate({ seed: 42, count: 20_000 });
    // One annotator layer per utterance: the first annotator who labelled it.
    const chosen = new Map<string, LabelledUtterance>();
    for (const layer of corpus.layers) {
      for (const u of layer.utterances) if (!chosen.has(u.id ?? '')) chosen.set(u.id ?? '', labelled(u, layer.annotator));
    }
    const done = corpus.truth.map((t) => chosen.get(t.id ?? '')).filter((u): u is LabelledUtterance => u !== undefined);
    expect(done).toHaveLength(20_000);

    const variation = variationFind(done);
    const identical = identicalFind(done);
    const outliers = slotOutliersFind(done);
    // The reference labels play a confident model, so every span difference is a disagreement.
    const truthById = new Map(corpus.truth.map((t) => [t.id ?? '', t.tags]));
    const compared: ModelComparedUtterance[] = done.map((u) => ({ ...u, modelTags: truthById.get(u.id) ?? [], confidences: u.tokens.map(() => 0.95) }));
    const disagreements = modelDisagreementsFind(compared);
    const all: Finding[] = [...variation, ...identical, ...outliers, ...disagreements];

    // The generator injects annotator slips, so each kind turns up.
    expect(variation.length).toBeGreaterThan(0);
    expect(identical.length).toBeGreaterThan(0);
    expect(outliers.length).toBeGreaterThan(0);
    expect(disagreements.length).toBeGreaterThan(0);

    const byId = new Map(done.map((u) => [u.id, u]));
    const outOfRange = all
      .flatMap(findingLocations)
      .filter((l) => !(l.start >= 0 && l.start < l.end && l.end <= (byId.get(l.id)?.tokens.length ?? -1)));
    expect(outOfRange).toEqual([]);
    for (const kind of ['variation', 'identical', 'slot-outlier'] as const) {
      const keys = all.filter((f) => f.kind === kind).map(findingKey);
      expect(new Set(keys).size).toBe(keys.length);
    }
    const differing = new Set(compared.filter((u) => !sameSpans(u.tags, u.modelTags)).map((u) => u.id));
    expect(new Set(disagreements.map((f) => f.location.id))).toEqual(differing);

    const reversed = [...done].reverse();
    expect(variationFind(reversed).map(findingKey)).toEqual(variation.map(findingKey));
    expect(identicalFind(reversed)).toEqual(identical);
  }, 120_000);
});
