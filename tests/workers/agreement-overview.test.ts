import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { columnsRead } from '../../src/core/formats';
import { overviewRun } from '../../src/workers/agreement-overview';
import { dbTest } from '../db/helpers';
import { agreementSeed } from './agreement-seed';

const A = columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances;
const B = columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances;
const overlap = new Set(readFileSync('sample-corpus/overlap-ids.txt', 'utf8').split(/\r?\n/).filter((l) => l !== ''));

/**
 * Spans counted straight from the IOB2 columns, the CoNLL-2000 way (a stray I-X opens a span;
 * conlleval.pl's startOfChunk, from memory): written here apart from the core's spansFromTags.
 */
function spansByHand(tags: readonly string[]): string[] {
  const slots: string[] = [];
  let open: string | null = null;
  for (const tag of tags) {
    if (tag === 'O') {
      open = null;
      continue;
    }
    const [prefix, slot] = [tag.slice(0, 1), tag.slice(2)];
    if (prefix === 'B' || open !== slot) slots.push(slot);
    open = slot;
  }
  return slots;
}

function tally(values: string[]): Map<string, number> {
  const counts = new Map<string, number>();
  for (const v of values) counts.set(v, (counts.get(v) ?? 0) + 1);
  return counts;
}

describe('overviewRun on the sample corpus', () => {
  const DAY = 86_400_000;
  const start = Date.UTC(2025, 3, 1);

  async function seeded() {
    const db = dbTest();
    const seed = await agreementSeed(db, [
      { annotator: 'ann-a', utterances: A, updatedOf: (_, i) => start + (i % 3) * DAY + 3_600_000 },
      { annotator: 'ann-b', utterances: B, statusOf: (_, i) => (i < 200 ? 'draft' : 'done') },
    ]);
    return { db, ...seed };
  }

  it('counts slots and intents of every person’s done layers', async () => {
    const { db, projectId } = await seeded();
    const got = await overviewRun(db, { projectId, source: null, statuses: ['done'] });
    const counted = [...A, ...B.slice(200)];
    expect(got.countedLayers).toBe(counted.length);
    expect(new Map(got.slots.map((s) => [s.slot, s.spans]))).toEqual(tally(counted.flatMap((u) => spansByHand(u.tags))));
    expect(new Map(got.intents.map((i) => [i.intent, i.count]))).toEqual(tally(counted.map((u) => u.intent ?? '(none)')));
    // Most first.
    const spans = got.slots.map((s) => s.spans);
    expect(spans).toEqual([...spans].sort((x, y) => y - x));
  });

  it('counts one annotator’s layers when asked, drafts included', async () => {
    const { db, projectId } = await seeded();
    const got = await overviewRun(db, { projectId, source: 'ann-b', statuses: ['done', 'draft'] });
    expect(got.countedLayers).toBe(B.length);
    expect(new Map(got.slots.map((s) => [s.slot, s.spans]))).toEqual(tally(B.flatMap((u) => spansByHand(u.tags))));
  });

  it('gives progress per annotator, done layers by day and the headline numbers', async () => {
    const { db, projectId } = await seeded();
    const got = await overviewRun(db, { projectId, source: null, statuses: ['done'] });
    const allIds = new Set([...A, ...B].map((u) => u.id));
    expect(got.utterances).toBe(allIds.size);
    expect(got.annotators.map((a) => [a.annotator, a.statuses.done, a.statuses.draft])).toEqual([
      ['ann-a', A.length, 0],
      ['ann-b', B.length - 200, 200],
    ]);
    // ann-a's layers were finished over three days, a third each (positions mod 3).
    const third = (r: number) => A.filter((_, i) => i % 3 <= r).length;
    expect(got.annotators[0]?.doneByDay).toEqual([0, 1, 2].map((r) => ({ day: start + r * DAY, done: third(r) })));
    const bDone = new Set(B.slice(200).map((u) => u.id));
    const aIds = new Set(A.map((u) => u.id));
    expect(got.headline).toEqual({
      people: 2,
      layers: A.length + B.length,
      doneLayers: A.length + B.length - 200,
      overlapDone: [...overlap].filter((id) => aIds.has(id) && bDone.has(id)).length,
      goldLayers: 0,
      untouched: 0,
    });
  });
});
