import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  agreementCompute,
  agreementIntervalsAdd,
  agreementPrepare,
  bootstrapRange,
  layersAlign,
  resampleValuesJoin,
  type AlignedCorpus,
} from '../../../src/core/agreement';
import { corpusArb } from './arbitraries';

function aligned(layers: Parameters<typeof layersAlign>[0]): AlignedCorpus {
  const result = layersAlign(layers);
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return result.corpus;
}

describe('bootstrap in ranges', () => {
  it('ranges computed apart join into exactly the one-pass values and report', () => {
    const prop = fc.property(
      corpusArb({ min: 2, max: 3 }, 0.2),
      fc.integer({ min: 1, max: 60 }),
      fc.integer({ min: 0, max: 0xffffffff }),
      fc.array(fc.integer({ min: 0, max: 60 }), { maxLength: 4 }),
      (layers, resamples, seed, cuts) => {
        const corpus = aligned(layers);
        const pending = agreementPrepare(corpus, { bootstrap: resamples, seed });
        const job = pending.job;
        expect(job).not.toBeNull();
        if (job === null) return;
        const bounds = [0, ...cuts.map((c) => Math.min(c, resamples)).sort((a, b) => a - b), resamples];
        const parts = bounds.slice(1).map((to, i) => bootstrapRange(job.rows, job.layout, job.seed, bounds[i] ?? 0, to));
        const whole = bootstrapRange(job.rows, job.layout, job.seed, 0, resamples);
        expect(resampleValuesJoin(parts)).toEqual(whole);
        expect(agreementIntervalsAdd(pending, resampleValuesJoin(parts))).toEqual(agreementCompute(corpus, { bootstrap: resamples, seed }));
      },
    );
    fc.assert(prop, { seed: 42, numRuns: 60 });
  });

  it('resample r starts at call r × utterances of one mulberry32 stream', () => {
    const corpus = aligned(fc.sample(corpusArb({ min: 2, max: 2 }, 0), { seed: 3, numRuns: 1 })[0] ?? []);
    const job = agreementPrepare(corpus, { bootstrap: 5, seed: 11 }).job;
    if (job === null) throw new Error('no bootstrap job');
    // The seeked start of resample 3 must equal the state a pass through resamples 0–2 reaches.
    const direct = bootstrapRange(job.rows, job.layout, 11, 3, 4);
    const viaStream = bootstrapRange(job.rows, job.layout, 11, 0, 4);
    expect(direct.tag[0]).toEqual(viaStream.tag[3]);
    expect(direct.exactF1[0]).toEqual(viaStream.exactF1[3]);
    expect(bootstrapRange(job.rows, job.layout, 11, 2, 2).tag).toHaveLength(0);
  });
});
