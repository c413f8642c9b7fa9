/**
 * Layer edits. Every save names the revision it was based on; a different stored revision (another
 * tab saved first) is refused with the stored layer attached, never overwritten. The layer and its
 * history row are written in one transaction, with the database's strict durability.
 */
import { LAYER_STATUSES, type LayerContent, type LayerStatus } from '../core/backup/model';
import { annotatorEnsureIn } from './annotator-repo';
import { dbWrite, InvalidInputError, RecordMissingError, RevisionConflictError } from './errors';
import type { HistoryRow, LayerKey, LayerRow, SlotsmithDb } from './schema';
import { tokensCount } from './tokens';

export interface LayerChange {
  tags?: string[];
  intent?: string | null;
  status?: LayerStatus;
  note?: string;
}

export interface LayerSaveOptions {
  /** Revision the edit was based on: 0 when the layer did not exist yet. */
  expectedRevision: number;
  /** Who made the edit (an annotator id), for the history. */
  who: string;
}

export function layerContent(row: LayerContent): LayerContent {
  return { tags: [...row.tags], intent: row.intent, status: row.status, note: row.note, revision: row.revision, updated: row.updated };
}

function contentSame(a: LayerContent, b: LayerContent): boolean {
  return a.intent === b.intent && a.status === b.status && a.note === b.note && a.tags.length === b.tags.length && a.tags.every((t, i) => t === b.tags[i]);
}

function changeCheck(change: LayerChange, tokenCount: number): void {
  if (change.tags !== undefined) {
    if (change.tags.length !== tokenCount) throw new InvalidInputError(`${change.tags.length} tags for ${tokenCount} tokens`);
    if (!change.tags.every((t) => typeof t === 'string')) throw new InvalidInputError('every tag must be a string');
  }
  if (change.status !== undefined && !LAYER_STATUSES.includes(change.status)) throw new InvalidInputError(`unknown status ${JSON.stringify(change.status)}`);
}

/** Apply `change` to the layer `key`, creating it when missing; returns the stored row. */
export async function layerSave(db: SlotsmithDb, key: LayerKey, change: LayerChange, options: LayerSaveOptions): Promise<LayerRow> {
  const [utteranceId, annotator] = key;
  return dbWrite(db, [db.projects, db.annotators, db.utterances, db.layers, db.history], async () => {
    const utterance = await db.utterances.get(utteranceId);
    if (utterance === undefined) throw new RecordMissingError('utterance', utteranceId);
    const stored = (await db.layers.get(key)) ?? null;
    if ((stored?.revision ?? 0) !== options.expectedRevision) throw new RevisionConflictError(key, options.expectedRevision, stored);
    const count = tokensCount(utterance.tokens);
    changeCheck(change, count);
    const base: LayerRow = stored ?? {
      utteranceId,
      annotator,
      projectId: utterance.projectId,
      tags: new Array<string>(count).fill('O'),
      intent: null,
      status: 'draft',
      note: '',
      revision: 0,
      updated: 0,
    };
    const next: LayerRow = { ...base, ...change, revision: base.revision + 1, updated: db.clock() };
    if (stored !== null && contentSame(stored, next)) return stored;
    if (stored === null) await annotatorEnsureIn(db, utterance.projectId, annotator);
    await db.layers.put(next);
    const history: Omit<HistoryRow, 'id'> = {
      projectId: utterance.projectId,
      utteranceId,
      annotator,
      before: stored === null ? null : layerContent(stored),
      after: layerContent(next),
      who: options.who,
      when: next.updated,
    };
    await db.history.add(history as HistoryRow);
    return next;
  });
}

export function layerGet(db: SlotsmithDb, key: LayerKey): Promise<LayerRow | undefined> {
  return db.layers.get(key);
}

/** The layers of `annotator` on the given utterances, in the same order (undefined where none). */
export function layersOf(db: SlotsmithDb, utteranceIds: readonly number[], annotator: string): Promise<(LayerRow | undefined)[]> {
  return db.layers.bulkGet(utteranceIds.map((id): LayerKey => [id, annotator]));
}

/** Edits of one layer, newest first. */
export async function layerHistory(db: SlotsmithDb, key: LayerKey): Promise<HistoryRow[]> {
  const rows = await db.history.where('[utteranceId+annotator]').equals(key).toArray();
  return rows.sort((a, b) => b.id - a.id);
}
