import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  agreementPrepare,
  bootstrapPatchPlan,
  bootstrapPatchRange,
  bootstrapRange,
  bootstrapTotalsPatched,
  bootstrapTotalsRange,
  layersAlign,
  resampleValuesFromTotals,
} from '../../src/core/agreement';
import { columnsRead } from '../../src/core/formats';
import { bootstrapParallel, bootstrapPatchParallel, type BootstrapHelper } from '../../src/workers/agreement-parallel';
import { bootstrapHere } from '../../src/workers/agreement-run';

const A = columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances;
const B = columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances;

function job(resamples: number, b = B) {
  const aligned = layersAlign([
    { name: 'ann-a', scheme: 'iob2', utterances: A },
    { name: 'ann-b', scheme: 'iob2', utterances: b },
  ]);
  if (!aligned.ok) throw new Error('sample corpus does not align');
  const pending = agreementPrepare(aligned.corpus, { bootstrap: resamples });
  if (pending.job === null) throw new Error('no bootstrap job');
  return pending.job;
}

/** Helpers on this thread, answering later (as a worker would), recording what they were asked. */
function helpersHere(count: number, asked: [number, number][], ended: number[]): () => BootstrapHelper[] {
  return () =>
    Array.from({ length: count }, (_, k) => ({
      range: async (rows, layout, seed, from, to) => {
        asked.push([from, to]);
        await new Promise((r) => setTimeout(r, 5));
        return bootstrapTotalsRange(rows, layout, seed, from, to);
      },
      patch: async (plan, from, to) => {
        asked.push([from, to]);
        await new Promise((r) => setTimeout(r, 5));
        return bootstrapPatchRange(plan, from, to);
      },
      end: () => ended.push(k),
    }));
}

describe('bootstrapParallel', () => {
  it('gives exactly the values of one pass, whatever the number of helpers', async () => {
    const j = job(301);
    const want = await bootstrapHere(j, () => {});
    for (const count of [0, 1, 2, 3]) {
      const asked: [number, number][] = [];
      const ended: number[] = [];
      const seen: number[] = [];
      const got = await bootstrapParallel(helpersHere(count, asked, ended))(j, (d) => seen.push(d));
      expect(got).toEqual(want);
      // And the totals give the values one pass of the core's bootstrapRange gives.
      expect(resampleValuesFromTotals(got, j.layout)).toEqual(bootstrapRange(j.rows, j.layout, j.seed, 0, 301));
      // Contiguous shares from 0, this thread taking the last.
      const size = Math.ceil(301 / (count + 1));
      expect(asked.sort((x, y) => x[0] - y[0])).toEqual(Array.from({ length: count }, (_, k) => [k * size, (k + 1) * size]));
      expect(ended.sort()).toEqual(Array.from({ length: count }, (_, k) => k));
      expect(seen[0]).toBe(0);
      expect(seen.every((d) => d >= 0 && d < 301)).toBe(true);
    }
  });

  it('ends its helpers when one fails', async () => {
    const ended: number[] = [];
    const failing = () => [{ range: () => Promise.reject(new Error('helper stopped')), patch: () => Promise.reject(new Error('helper stopped')), end: () => ended.push(0) }];
    await expect(bootstrapParallel(failing)(job(50), () => {})).rejects.toThrow('helper stopped');
    expect(ended).toEqual([0]);
  });

  it('patches kept totals to exactly the one-thread patch (and a full resample), whatever the number of helpers', async () => {
    const before = job(301);
    // ann-b's first five shared utterances relabelled all O.
    const shared = new Set(A.map((u) => u.id));
    let left = 5;
    const edited = B.map((u) => (shared.has(u.id) && u.tags.some((t) => t !== 'O') && left-- > 0 ? { ...u, tags: u.tags.map(() => 'O') } : u));
    const after = job(301, edited);
    const kept = { rows: before.rows, layout: before.layout, seed: before.seed, totals: bootstrapTotalsRange(before.rows, before.layout, before.seed, 0, 301) };
    const plan = bootstrapPatchPlan(kept, after.rows, after.layout, after.seed);
    expect(plan?.positions.length).toBe(5);
    if (plan === null) return;
    const want = bootstrapTotalsPatched(kept, after.rows, after.layout, after.seed)?.totals;
    expect(want).toEqual(bootstrapTotalsRange(after.rows, after.layout, after.seed, 0, 301));
    for (const count of [0, 1, 2, 3]) {
      const asked: [number, number][] = [];
      const ended: number[] = [];
      expect(await bootstrapPatchParallel(helpersHere(count, asked, ended))(plan, kept.totals, () => {})).toEqual(want);
      expect(asked).toHaveLength(count);
      expect(ended).toHaveLength(count);
    }
  });
});
