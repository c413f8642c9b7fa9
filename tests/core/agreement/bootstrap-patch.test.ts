import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { agreementPrepare, bootstrapTotalsPatched, bootstrapTotalsRange, layersAlign, type AlignedCorpus, type AlignLayer } from '../../../src/core/agreement';
import { totalsLayout } from '../../../src/core/agreement/totals';
import { corpusArb, SLOTS } from './arbitraries';

function aligned(layers: readonly AlignLayer[]): AlignedCorpus {
  const result = layersAlign(layers);
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return result.corpus;
}

function jobOf(layers: readonly AlignLayer[], resamples: number, seed: number) {
  const job = agreementPrepare(aligned(layers), { bootstrap: resamples, seed }).job;
  if (job === null) throw new Error('no bootstrap job');
  return job;
}

/** Layer B with the tags of the chosen utterances changed (each to a legal one-slot reading or all O). */
function edited(layers: readonly AlignLayer[], picks: readonly number[], slot: number): AlignLayer[] {
  const [a, b, ...rest] = layers as AlignLayer[];
  if (a === undefined || b === undefined) return [...layers];
  const name = SLOTS[slot % SLOTS.length] as string;
  const chosen = new Set(picks.map((p) => p % Math.max(1, b.utterances.length)));
  const utterances = b.utterances.map((u, i) =>
    chosen.has(i) ? { ...u, tags: u.tags.map((_, t) => (slot % 2 === 0 ? 'O' : t === 0 ? `B-${name}` : `I-${name}`)) } : u,
  );
  return [a, { ...b, utterances }, ...rest];
}

describe('bootstrapTotalsPatched', () => {
  it('gives exactly the totals of resampling the edited rows from scratch (fast-check)', () => {
    let patchedRuns = 0;
    const prop = fc.property(
      corpusArb({ min: 2, max: 2 }, 0.1),
      fc.array(fc.nat(200), { minLength: 1, maxLength: 5 }),
      fc.nat(9),
      fc.integer({ min: 1, max: 40 }),
      fc.integer({ min: 0, max: 0xffffffff }),
      (layers, picks, slot, resamples, seed) => {
        const before = jobOf(layers, resamples, seed);
        const after = jobOf(edited(layers, picks, slot), resamples, seed);
        const totals = bootstrapTotalsRange(before.rows, before.layout, seed, 0, resamples);
        const patched = bootstrapTotalsPatched({ rows: before.rows, layout: before.layout, seed, totals }, after.rows, after.layout, seed, { maxChanged: 1000 });
        const fresh = bootstrapTotalsRange(after.rows, after.layout, seed, 0, resamples);
        // An edit may bring a new slot into the layout: then patching must refuse, never guess.
        if (after.layout.width !== before.layout.width || after.layout.tags !== before.layout.tags) expect(patched).toBeNull();
        else {
          expect(patched).not.toBeNull();
          expect(patched?.totals).toEqual(fresh);
          if ((patched?.changed ?? 0) > 0) patchedRuns++;
        }
      },
    );
    fc.assert(prop, { seed: 42, numRuns: 150 });
    // Most runs must really patch something (not only refuse or find nothing changed).
    expect(patchedRuns).toBeGreaterThan(75);
  });

  it('refuses another seed, another number of shared utterances, or more changes than allowed', () => {
    const layers = fc.sample(corpusArb({ min: 2, max: 2 }, 0), { seed: 5, numRuns: 1 })[0] ?? [];
    const job = jobOf(layers, 20, 7);
    const kept = { rows: job.rows, layout: job.layout, seed: 7, totals: bootstrapTotalsRange(job.rows, job.layout, 7, 0, 20) };
    expect(bootstrapTotalsPatched(kept, job.rows, job.layout, 8)).toBeNull();
    const fewer = layers.map((l) => ({ ...l, utterances: l.utterances.slice(1) }));
    const shorter = jobOf(fewer, 20, 7);
    expect(bootstrapTotalsPatched(kept, shorter.rows, shorter.layout, 7)).toBeNull();
    // Unchanged rows: the kept totals as they are.
    expect(bootstrapTotalsPatched(kept, job.rows, job.layout, 7)).toEqual({ totals: kept.totals, changed: 0 });
    const many = jobOf(edited(layers, Array.from({ length: 200 }, (_, i) => i), 0), 20, 7);
    expect(many.layout).toEqual(job.layout);
    expect(bootstrapTotalsPatched(kept, many.rows, many.layout, 7, { maxChanged: 0 })).toBeNull();
  });

  it('one changed utterance (the two-comparison replay), at either end of the shared ones, equals resampling from scratch', () => {
    const layers = fc.sample(corpusArb({ min: 2, max: 2 }, 0), { seed: 11, numRuns: 1 })[0] ?? [];
    const count = layers[1]?.utterances.length ?? 0;
    const before = jobOf(layers, 30, 3);
    const kept = { rows: before.rows, layout: before.layout, seed: 3, totals: bootstrapTotalsRange(before.rows, before.layout, 3, 0, 30) };
    let checked = 0;
    for (const pick of [0, count - 1, count >> 1]) {
      for (const slot of [0, 1]) {
        const after = jobOf(edited(layers, [pick], slot), 30, 3);
        const patched = bootstrapTotalsPatched(kept, after.rows, after.layout, 3);
        if (patched === null || patched.changed !== 1) continue;
        expect(patched.totals).toEqual(bootstrapTotalsRange(after.rows, after.layout, 3, 0, 30));
        checked++;
      }
    }
    expect(checked).toBeGreaterThanOrEqual(3);
  });

  it('the last and the first utterance (outputs up to 2^32 and from 0) patch exactly, on hand-made rows', () => {
    const layout = totalsLayout(2, 0);
    // Utterance u has one entry: total (u mod width) += 1 + (u mod 3).
    const rowsOf = (values: number[]) => ({
      patternOf: Int32Array.from(values.keys()),
      rowStart: Int32Array.from({ length: values.length + 1 }, (_, i) => i),
      index: Int32Array.from(values.map((_, u) => u % layout.width)),
      value: Int32Array.from(values),
    });
    const base = Array.from({ length: 997 }, (_, u) => 1 + (u % 3));
    const kept = { rows: rowsOf(base), layout, seed: 99, totals: bootstrapTotalsRange(rowsOf(base), layout, 99, 0, 50) };
    for (const u of [0, base.length - 1]) {
      const after = rowsOf(base.map((v, i) => (i === u ? v + 5 : v)));
      const patched = bootstrapTotalsPatched(kept, after, layout, 99);
      expect(patched?.changed).toBe(1);
      expect(patched?.totals).toEqual(bootstrapTotalsRange(after, layout, 99, 0, 50));
      // Drawn at least once somewhere in 50 resamples of 997 draws, so the check has teeth.
      expect(patched?.totals).not.toEqual(kept.totals);
    }
  });
});
