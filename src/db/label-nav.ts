/** Moving through a project's utterances while labelling: by position, and to the next one still to do. */
import Dexie from 'dexie';
import { ANNOTATOR_MODEL } from '../core/backup/model';
import { leastConfidenceFromNote } from './model-repo';
import type { LayerKey, SlotsmithDb, UtteranceRow } from './schema';
import { utterancePage } from './utterance-repo';

/** The utterance after (1) or before (-1) position `seq` in project order; undefined at either end. */
export function labelUtteranceStep(db: SlotsmithDb, projectId: number, seq: number, direction: 1 | -1): Promise<UtteranceRow | undefined> {
  const index = db.utterances.where('[projectId+seq]');
  if (direction === 1) return index.between([projectId, seq], [projectId, Dexie.maxKey], false, true).first();
  return index.between([projectId, Dexie.minKey], [projectId, seq], true, false).last();
}

// Pages of this size keep one bulkGet of layers cheap while a 100k-row scan stays a few hundred reads.
const SCAN_PAGE = 500;

/**
 * In project order, the first utterance with `from` < seq ≤ `until` (nulls: open ends) that
 * `annotator` has not started and `skip` does not exclude.
 */
async function scanInOrder(db: SlotsmithDb, projectId: number, annotator: string, from: number | null, until: number | null, skip?: (id: number) => boolean): Promise<UtteranceRow | undefined> {
  let after = from;
  for (;;) {
    const page = await utterancePage(db, projectId, after, SCAN_PAGE);
    if (page.length === 0) return undefined;
    const wanted = page.filter((u) => (until === null || u.seq <= until) && skip?.(u.id) !== true);
    const layers = await db.layers.bulkGet(wanted.map((u): LayerKey => [u.id, annotator]));
    for (const [i, u] of wanted.entries()) {
      const layer = layers[i];
      if (layer === undefined || layer.status === 'unlabelled') return u;
    }
    const last = page[page.length - 1] as UtteranceRow;
    if (until !== null && last.seq >= until) return undefined;
    after = last.seq;
  }
}

/**
 * The first utterance after `afterSeq` (null: from the start) that `annotator` has not started: no
 * layer, or a layer still `unlabelled`. Wraps round to the start once; undefined when none is left.
 */
export async function labelNextUnlabelled(db: SlotsmithDb, projectId: number, annotator: string, afterSeq: number | null): Promise<UtteranceRow | undefined> {
  return (await scanInOrder(db, projectId, annotator, afterSeq, null)) ?? (afterSeq === null ? undefined : scanInOrder(db, projectId, annotator, null, afterSeq));
}

/** Utterances the model pre-labelled, least sure first, with their position in that order. */
export interface UncertainOrder {
  ids: readonly number[];
  /** Least confidence per id, as stored in the model layer's note. */
  scores: ReadonlyMap<number, number>;
  at: ReadonlyMap<number, number>;
}

/**
 * The project's `model` layers ordered by the least confidence in their note, highest (least sure)
 * first; ties by utterance id, which follows project order (both grow with each import). A note
 * that is not a number leaves its utterance out, as if it had no model layer.
 */
export async function labelUncertainOrder(db: SlotsmithDb, projectId: number): Promise<UncertainOrder> {
  const layers = await db.layers
    .where('[projectId+annotator+status]')
    .between([projectId, ANNOTATOR_MODEL, Dexie.minKey], [projectId, ANNOTATOR_MODEL, Dexie.maxKey], true, true)
    .toArray();
  const scored: { id: number; score: number }[] = [];
  for (const l of layers) {
    const score = leastConfidenceFromNote(l.note);
    if (score !== null) scored.push({ id: l.utteranceId, score });
  }
  scored.sort((a, b) => b.score - a.score || a.id - b.id);
  const ids = scored.map((s) => s.id);
  return { ids, scores: new Map(scored.map((s) => [s.id, s.score])), at: new Map(ids.map((id, i) => [id, i])) };
}

/** In `ids[from, to)`, the first utterance `annotator` has not started (still in the project). */
async function scanIds(db: SlotsmithDb, projectId: number, annotator: string, ids: readonly number[], from: number, to: number): Promise<UtteranceRow | undefined> {
  for (let start = from; start < to; start += SCAN_PAGE) {
    const slice = ids.slice(start, Math.min(to, start + SCAN_PAGE));
    const layers = await db.layers.bulkGet(slice.map((id): LayerKey => [id, annotator]));
    for (const [i, id] of slice.entries()) {
      const layer = layers[i];
      if (layer !== undefined && layer.status !== 'unlabelled') continue;
      const row = await db.utterances.get(id);
      if (row?.projectId === projectId) return row;
    }
  }
  return undefined;
}

/**
 * "Next not started", least sure first: the utterances of `order` (the model's least sure first),
 * then the others in project order. From one of the model's utterances it goes on down that list
 * (then the rest, then round to the top), so passing one over moves on; from any other utterance
 * (or none) the least sure not-started one comes first, so switching the order on takes effect at
 * the next step. Passing an utterance over without any edit may bring it back; marking it skipped
 * does not. Undefined when `annotator` has started everything.
 */
export async function labelNextUncertain(db: SlotsmithDb, projectId: number, annotator: string, order: UncertainOrder, current: UtteranceRow | null): Promise<UtteranceRow | undefined> {
  const { ids, at } = order;
  const inOrder = (id: number) => at.has(id);
  const head = (from: number, to: number) => scanIds(db, projectId, annotator, ids, from, to);
  const tail = (from: number | null, until: number | null) => scanInOrder(db, projectId, annotator, from, until, inOrder);
  if (current === null) return (await head(0, ids.length)) ?? tail(null, null);
  const i = at.get(current.id);
  if (i !== undefined) return (await head(i + 1, ids.length)) ?? (await tail(null, null)) ?? head(0, i + 1);
  return (await head(0, ids.length)) ?? (await tail(current.seq, null)) ?? tail(null, current.seq);
}
