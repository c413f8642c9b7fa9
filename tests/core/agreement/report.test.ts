import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { agreementCompute, LANDIS_KOCH_CAUTION, landisKoch, layersAlign, type AlignedCorpus, type AlignLayer } from '../../../src/core/agreement';
import { columnsRead } from '../../../src/core/formats';
import { tagsConvert } from '../../../src/core/schemes';

function sample(name: string): AlignLayer {
  const document = columnsRead(readFileSync(new URL(`../../../sample-corpus/${name}.iob2`, import.meta.url), 'utf8'), { scheme: 'iob2' });
  return { name, scheme: document.scheme, utterances: document.utterances };
}

function aligned(layers: readonly AlignLayer[]): AlignedCorpus {
  const result = layersAlign(layers);
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return result.corpus;
}

const annA = sample('ann-a');
const annB = sample('ann-b');
const truth = sample('truth');

describe('agreement report on the sample corpus (ann-a against ann-b)', () => {
  const report = agreementCompute(aligned([annA, annB]), { bootstrap: 0 });
  const byIdB = new Map(annB.utterances.map((u) => [u.id, u]));
  const shared = annA.utterances.filter((u) => byIdB.has(u.id));

  it('counts the 400 shared utterances and their tokens', () => {
    expect(report.utterances).toBe(400);
    expect(report.tokens).toBe(shared.reduce((n, u) => n + u.tokens.length, 0));
    expect(report.pairNames).toEqual(['ann-a', 'ann-b']);
    expect(report.fleissKappa).toBeUndefined();
  });

  it('has a slot confusion table that sums to the tokens and holds the observed agreement on its diagonal', () => {
    const { labels, counts } = report.confusion;
    expect(labels[0]).toBe('O');
    expect(counts.flat().reduce((s, c) => s + c, 0)).toBe(report.tokens);
    const diagonal = counts.reduce((s, row, i) => s + (row[i] ?? 0), 0);
    expect(diagonal / report.tokens).toBeCloseTo(report.kappa.slot.observed ?? NaN, 12);
    // Every slot in the table has its per-slot figures, and their span counts add up.
    expect(Object.keys(report.perSlot).sort()).toEqual(labels.slice(1).sort());
    const perSlot = Object.values(report.perSlot);
    expect(perSlot.reduce((s, f) => s + f.a, 0)).toBe(report.spans.a);
    expect(perSlot.reduce((s, f) => s + f.b, 0)).toBe(report.spans.b);
    expect(perSlot.reduce((s, f) => s + f.exactMatched, 0)).toBe(report.spans.exactMatched);
  });

  it('ranks disagreements by tokens differing, then corpus order, counted from the tag strings', () => {
    const expected = shared
      .map((a) => {
        const b = byIdB.get(a.id);
        const x = tagsConvert(a.tags, 'iob2');
        const y = tagsConvert(b?.tags ?? [], 'iob2');
        return { id: a.id, tokens: x.filter((t, i) => t !== y[i]).length, intent: a.intent !== b?.intent, line: a.line, lineB: b?.line };
      })
      .filter((d) => d.tokens > 0 || d.intent);
    expect(report.disagreements.total).toBe(expected.length);
    expect(report.disagreements.items).toHaveLength(100);
    const items = report.disagreements.items;
    for (let i = 1; i < items.length; i++) {
      const [p, q] = [items[i - 1], items[i]];
      expect((p?.tokensDiffering ?? 0) > (q?.tokensDiffering ?? 0) || (p?.tokensDiffering === q?.tokensDiffering && (p?.index ?? 0) < (q?.index ?? 0))).toBe(true);
    }
    for (const item of items) {
      const match = expected.find((d) => d.id === item.id);
      expect(item).toMatchObject({ tokensDiffering: match?.tokens, intentDiffers: match?.intent, line: match?.line, lineB: match?.lineB });
    }
    const limited = agreementCompute(aligned([annA, annB]), { bootstrap: 0, disagreementLimit: 7 });
    expect(limited.disagreements.items).toEqual(items.slice(0, 7));
    expect(limited.disagreements.total).toBe(expected.length);
  });

  it('reads plausibly for annotators who err a few per cent of the time', () => {
    // The generator's annotators miss or move a few per cent of spans (sample-corpus/README.md).
    expect(report.kappa.slot.value ?? 0).toBeGreaterThan(0.8);
    expect(report.kappa.slotAnnotated.value ?? 1).toBeLessThan(report.kappa.slot.value ?? 0);
    expect(report.spans.overlapF1 ?? 0).toBeGreaterThan(report.spans.exactF1 ?? 1);
    expect(report.intent?.n).toBe(400);
  });
});

describe('three layers: truth, ann-a, ann-b', () => {
  const corpus = aligned([truth, annA, annB]);
  const report = agreementCompute(corpus, { bootstrap: 0 });

  it('gives a symmetric pairwise matrix whose cells are the two-layer slot kappas', () => {
    const matrix = report.pairwise?.kappa ?? [];
    expect(report.pairwise?.layers).toEqual(['truth', 'ann-a', 'ann-b']);
    for (let a = 0; a < 3; a++) {
      expect(matrix[a]?.[a]).toBe(1);
      for (let b = 0; b < 3; b++) {
        expect(matrix[a]?.[b]).toBe(matrix[b]?.[a]);
        if (a !== b) expect(matrix[a]?.[b]).toBe(agreementCompute(corpus, { bootstrap: 0, layers: [a, b] }).kappa.slot.value);
      }
    }
    expect(report.pairwise?.tokens[1]?.[2]).toBe(agreementCompute(corpus, { bootstrap: 0, layers: [1, 2] }).tokens);
  });

  it("takes Fleiss' kappa over the utterances all three hold, and alpha over every pairable token", () => {
    expect(report.fleissKappa?.slot).toMatchObject({ utterances: 400, raters: 3 });
    // truth holds every utterance, so each token is pairable with ann-a or ann-b or both.
    expect(report.alpha?.slot.units).toBe(truth.utterances.reduce((n, u) => n + u.tokens.length, 0));
  });
});

describe('landisKoch', () => {
  it.each([
    [-0.01, 'poor'],
    [0, 'slight'],
    [0.2, 'slight'],
    [0.205, 'fair'],
    [0.21, 'fair'],
    [0.4, 'fair'],
    [0.41, 'moderate'],
    [0.6, 'moderate'],
    [0.61, 'substantial'],
    [0.8, 'substantial'],
    [0.81, 'almost perfect'],
    [1, 'almost perfect'],
  ])('bands %d as %s', (value, band) => {
    // Landis & Koch (1977), Biometrics: <0 poor, 0–.20 slight, .21–.40 fair, .41–.60 moderate,
    // .61–.80 substantial, .81–1 almost perfect (bands from memory); in-between values go up (our reading).
    expect(landisKoch(value)).toEqual({ band, caution: LANDIS_KOCH_CAUTION });
  });
});
