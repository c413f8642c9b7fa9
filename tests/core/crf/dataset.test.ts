/** The unit layout of the training data against the plain per-token attribute lists it replaces. */
import { describe, expect, it } from 'vitest';
import { AttributeEncoder, attributesOfWords, CRF_SPAN, datasetBuild, labelsFromTags, stateFeaturesCollect } from '../../../src/core/crf';
import { TINY } from './fixtures';

describe('datasetBuild units', () => {
  const labels = labelsFromTags(TINY.map((s) => s.tags));
  const encoder = new AttributeEncoder();
  const data = datasetBuild(TINY, encoder, labels);

  it('each token’s five units hold exactly the attributes attributesOfWords lists for it', () => {
    let token = 0;
    for (const sequence of TINY) {
      for (const want of attributesOfWords(sequence.words)) {
        const got: string[] = [];
        for (let k = 0; k < CRF_SPAN; k++) {
          const unit = data.tokenUnits[token * CRF_SPAN + k] as number;
          for (let i = data.unitStarts[unit] as number; i < (data.unitStarts[unit + 1] as number); i++) got.push(encoder.names[data.unitAttrs[i] as number] as string);
        }
        expect(got.sort()).toEqual([...want].sort());
        token++;
      }
    }
    expect(token).toBe(data.labels.length);
  });

  it('a repeated word shares its units, so units stay far fewer than token places', () => {
    const words = new Set(TINY.flatMap((s) => s.words));
    // Five places per distinct word plus the four sentence-edge markers (BOS at −2, −1; EOS at +1, +2).
    expect(data.unitStarts.length - 1).toBe(words.size * CRF_SPAN + 4);
  });

  it('state features are the (attribute, label) pairs of the tokens, as counted token by token', () => {
    const features = stateFeaturesCollect(data, encoder.size, labels.length);
    const want = new Set<string>();
    TINY.forEach((sequence) => attributesOfWords(sequence.words).forEach((names, t) => names.forEach((name) => want.add(`${name}|${sequence.tags[t] as string}`))));
    const got = new Set<string>();
    for (let a = 0; a < encoder.size; a++) {
      for (let f = features.starts[a] as number; f < (features.starts[a + 1] as number); f++) got.add(`${encoder.names[a] as string}|${labels[features.labels[f] as number] as string}`);
    }
    expect(got).toEqual(want);
  });
});
