import { describe, expect, it } from 'vitest';
import { exportSelect, exportWrite, type ExportItem } from '../../src/core/export';
import { tokeniseWhitespace } from '../../src/core/tokenise';
import type { Utterance } from '../../src/core/types';
import { backupRestore } from '../../src/db/backup-repo';
import { layerSave } from '../../src/db/layer-repo';
import type { SlotsmithDb } from '../../src/db/schema';
import { batchAppend, batchBegin, batchFinish } from '../../src/db/batch-repo';
import { projectCreate } from '../../src/db/project-repo';
import { EXPORT_PAGE_SIZE, exportFinish, exportGather, exportGatherKey, exportRun, type ExportOutcome, type ExportRequest } from '../../src/workers/export-run';
import { backupSeed } from '../../e2e/backup-seed';
import { dbTest } from '../db/helpers';

const INTENTS = ['book_visit', 'reschedule', 'ask_price'];

/** Enough invented utterances to cross several read pages, with phone numbers to mask. */
function corpus(size: number): Utterance[] {
  return Array.from({ length: size }, (_, i) => {
    const text = `book a plumber for Friday call 555-01${String(i % 100).padStart(2, '0')}`;
    const tokens = tokeniseWhitespace(text);
    return { id: `hr-${i + 1}`, text, tokens, tags: ['O', 'O', 'B-service', 'O', 'B-day', 'O', 'B-contact_phone'], intent: INTENTS[i % 3] as string, meta: {} };
  });
}

async function seeded(utterances: Utterance[], statusOf?: (u: Utterance, i: number) => 'done' | 'draft'): Promise<{ db: SlotsmithDb; projectId: number }> {
  const db = dbTest();
  const result = await backupRestore(db, backupSeed(utterances, { projectName: 'Plumbing', annotator: 'ann-a', time: Date.UTC(2025, 0, 1), ...(statusOf ? { statusOf } : {}) }));
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return { db, projectId: result.projectId };
}

const request = (projectId: number, extra: Partial<ExportRequest> = {}): ExportRequest => ({
  projectId,
  policy: { kind: 'annotator', annotator: 'ann-a' },
  statuses: ['done'],
  format: 'iob2',
  mask: [],
  asIs: false,
  ...extra,
});

async function texts(outcome: ExportOutcome): Promise<Record<string, string>> {
  if (outcome.kind !== 'written') throw new Error(`expected files, got ${outcome.kind}`);
  return Object.fromEntries(await Promise.all(outcome.files.map(async (f) => [f.part, await f.blob.text()] as const)));
}

/** The core's one-shot export of the same utterances: what the paged, chunked run must equal. */
function oneShot(utterances: Utterance[], options: Parameters<typeof exportWrite>[1]): Record<string, string> {
  const items: ExportItem[] = utterances.map((u) => ({ id: u.id, text: u.text, tokens: u.tokens, meta: u.meta, layers: [{ annotator: 'ann-a', tags: u.tags, intent: u.intent ?? null, status: 'done' }] }));
  const selection = exportSelect(items, { policy: { kind: 'annotator', annotator: 'ann-a' } });
  return Object.fromEntries(exportWrite(selection, options).map((f) => [f.part, f.content]));
}

describe('exportRun', () => {
  const size = EXPORT_PAGE_SIZE * 2 + 37;

  it('reads every page and writes what the one-shot core export writes, in each format', async () => {
    const utterances = corpus(size);
    const { db, projectId } = await seeded(utterances);
    for (const format of ['iob2', 'bioes', 'jsonl'] as const) {
      const progress: number[] = [];
      const outcome = await exportRun(db, request(projectId, { format }), (p) => progress.push(p.done));
      expect(await texts(outcome)).toEqual(oneShot(utterances, { format }));
      expect(outcome.report).toMatchObject({ total: size, kept: size });
      expect(progress.at(-1)).toBe(size);
    }
    db.close();
  });

  it('splits by seed and ratios like the core, and masks digits', async () => {
    const utterances = corpus(size);
    const { db, projectId } = await seeded(utterances);
    const split = { ratios: { train: 0.8, dev: 0.1, test: 0.1 }, seed: 7 };
    const outcome = await exportRun(db, request(projectId, { format: 'jsonl', split, mask: ['digits'] }));
    const files = await texts(outcome);
    expect(files).toEqual(oneShot(utterances, { format: 'jsonl', split, mask: ['digits'] }));
    expect(Object.keys(files)).toEqual(['train', 'dev', 'test']);
    expect(files.train).toContain('call 000-0000');
    expect(files.train).not.toMatch(/"text":"[^"]*[1-9]/);
    db.close();
  });

  it('leaves out layers whose status is not chosen, and says why', async () => {
    const utterances = corpus(10);
    const { db, projectId } = await seeded(utterances, (_, i) => (i < 4 ? 'draft' : 'done'));
    const outcome = await exportRun(db, request(projectId));
    expect(outcome.report).toMatchObject({ total: 10, kept: 6, missingLayer: 0 });
    expect(outcome.report.filteredByStatus.draft).toBe(4);
    const gold = await exportRun(db, request(projectId, { policy: { kind: 'gold' } }));
    expect(gold).toMatchObject({ kind: 'empty', report: { kept: 0, missingLayer: 10 } });
    db.close();
  });

  it('prefers gold over the annotator under gold-else', async () => {
    const utterances = corpus(3);
    const { db, projectId } = await seeded(utterances);
    const second = await db.utterances.where('[projectId+seq]').equals([projectId, 2]).first();
    const tags = ['O', 'O', 'B-service', 'O', 'O', 'O', 'O'];
    await layerSave(db, [second?.id ?? 0, 'gold'], { tags, intent: 'cancel', status: 'done' }, { expectedRevision: 0, who: 'lead' });
    const files = await texts(await exportRun(db, request(projectId, { policy: { kind: 'gold-else', annotator: 'ann-a' } })));
    const expected = oneShot([utterances[0] as Utterance, { ...(utterances[1] as Utterance), tags, intent: 'cancel' }, utterances[2] as Utterance], { format: 'iob2' });
    expect(files).toEqual(expected);
    db.close();
  });

  it('refuses illegal transitions with the utterance, token and rule, and writes them when asked to', async () => {
    const utterances = corpus(EXPORT_PAGE_SIZE + 5);
    const bad = EXPORT_PAGE_SIZE + 2;
    // I-day after O (IOB2 forbids an inside tag that does not continue a span of its type).
    utterances[bad] = { ...(utterances[bad] as Utterance), tags: ['O', 'O', 'B-service', 'O', 'I-day', 'O', 'B-contact_phone'] };
    const { db, projectId } = await seeded(utterances);
    const outcome = await exportRun(db, request(projectId));
    if (outcome.kind !== 'refused') throw new Error(`expected a refusal, got ${outcome.kind}`);
    expect(outcome.utterances).toBe(1);
    expect(outcome.violations).toHaveLength(1);
    expect(outcome.violations[0]).toMatchObject({ seq: bad + 1, id: `hr-${bad + 1}`, annotator: 'ann-a', tokenIndex: 4, token: 'Friday', tag: 'I-day' });
    expect(outcome.violations[0]?.message).not.toBe('');
    const asIs = await texts(await exportRun(db, request(projectId, { asIs: true })));
    expect(asIs.all).toContain('Friday\tI-day');
    db.close();
  });

  it("'as they are' from the refused run's snapshot writes what a fresh as-is run writes; the gather key ignores format, split and masking", async () => {
    const utterances = corpus(40);
    utterances[7] = { ...(utterances[7] as Utterance), tags: ['O', 'O', 'B-service', 'O', 'I-day', 'O', 'B-contact_phone'] };
    const { db, projectId } = await seeded(utterances);
    const gathered = await exportGather(db, request(projectId));
    expect(exportFinish(gathered, request(projectId)).kind).toBe('refused');
    for (const format of ['iob2', 'bioes', 'jsonl'] as const) {
      const again = request(projectId, { format, asIs: true, mask: ['digits'] });
      expect(await texts(exportFinish(gathered, again))).toEqual(await texts(await exportRun(db, again)));
      expect(exportGatherKey(again)).toBe(exportGatherKey(request(projectId)));
    }
    expect(exportGatherKey(request(projectId, { statuses: ['done', 'draft'] }))).not.toBe(exportGatherKey(request(projectId)));
    expect(exportGatherKey(request(projectId, { policy: { kind: 'gold' } }))).not.toBe(exportGatherKey(request(projectId)));
    db.close();
  });

  it('reads the right layers when projects interleave their utterance ids, narrowly (key range) or widely (one get per key)', async () => {
    const db = dbTest();
    const all = corpus(EXPORT_PAGE_SIZE + 60);
    const mine = (await projectCreate(db, { name: 'Mine' })).id;
    const other = (await projectCreate(db, { name: 'Other' })).id;
    const batchOf = async (projectId: number, annotator: string) => batchBegin(db, projectId, { fileName: `${annotator}.iob`, format: 'columns', annotator });
    const mineBatch = await batchOf(mine, 'ann-a');
    const otherBatch = await batchOf(other, 'ann-a');
    // First page: runs of ten of mine with one other-project row between (spread 1.1: read by key range,
    // the other row filtered out); then each of mine between nine of the other's (spread > 4: read per key).
    const kept: Utterance[] = [];
    for (let i = 0; i < all.length; ) {
      const run = all.slice(i, i + (i < EXPORT_PAGE_SIZE ? 10 : 1));
      await batchAppend(db, mineBatch, { utterances: run });
      kept.push(...run);
      i += run.length;
      const u = run[0] as Utterance;
      const noise = Array.from({ length: i <= EXPORT_PAGE_SIZE ? 1 : 9 }, () => ({ ...u, tags: u.tags.map(() => 'O'), intent: 'cancel' }));
      await batchAppend(db, otherBatch, { utterances: noise });
    }
    await batchFinish(db, mineBatch, { utterances: all.length });
    await batchFinish(db, otherBatch, { utterances: (await db.batches.get(otherBatch))?.counts.utterances ?? 0 });
    const files = await texts(await exportRun(db, request(mine)));
    expect(files).toEqual(oneShot(kept, { format: 'iob2' }));
    db.close();
  }, 60_000);
});
