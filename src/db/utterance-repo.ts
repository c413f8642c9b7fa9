/** Reading utterances: keyset pages in project order, single rows, and progress counts. */
import Dexie from 'dexie';
import { LAYER_STATUSES, type LayerStatus } from '../core/backup/model';
import { layerKeysDistinct } from './layer-keys';
import type { SlotsmithDb, UtteranceRow } from './schema';

/**
 * Up to `limit` utterances of the project with seq > `afterSeq` (null: from the start), in seq order.
 * Keyset rather than offset paging: each page is one index range, however deep the table scrolls.
 */
export function utterancePage(db: SlotsmithDb, projectId: number, afterSeq: number | null, limit: number): Promise<UtteranceRow[]> {
  const lower = afterSeq === null ? [projectId, Dexie.minKey] : [projectId, afterSeq];
  return db.utterances
    .where('[projectId+seq]')
    .between(lower, [projectId, Dexie.maxKey], afterSeq === null, true)
    .limit(limit)
    .toArray();
}

export function utteranceGet(db: SlotsmithDb, id: number): Promise<UtteranceRow | undefined> {
  return db.utterances.get(id);
}

export function utteranceCount(db: SlotsmithDb, projectId: number): Promise<number> {
  return db.utterances.where('[projectId+seq]').between([projectId, Dexie.minKey], [projectId, Dexie.maxKey]).count();
}

export interface ProjectCounts {
  utterances: number;
  /** Layers per annotator (gold and model included) and status; an utterance without a layer counts as unlabelled only in `utterances`. */
  layers: Record<string, Record<LayerStatus, number>>;
}

/** Counts from the indexes alone, without reading rows. */
export async function projectCounts(db: SlotsmithDb, projectId: number): Promise<ProjectCounts> {
  return db.transaction('r', [db.utterances, db.layers], async () => {
    const keys = await layerKeysDistinct(db, projectId);
    const layers: ProjectCounts['layers'] = {};
    for (const [, annotator, status] of keys) {
      layers[annotator] ??= Object.fromEntries(LAYER_STATUSES.map((s) => [s, 0])) as Record<LayerStatus, number>;
      layers[annotator][status] = await db.layers.where('[projectId+annotator+status]').equals([projectId, annotator, status]).count();
    }
    return { utterances: await utteranceCount(db, projectId), layers };
  });
}
