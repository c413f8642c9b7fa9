/**
 * One page of the utterance table, read by id for the visible window. In blind mode only the shown
 * layer's labels leave this function; other layers contribute counts, never tags or intents.
 */
import Dexie from 'dexie';
import type { LayerStatus } from '../core/backup/model';
import { annotatorIsHuman, labelSchemaOf, layersDisagree, layersDone, layerViolationCount } from './corpus-facts';
import { layerKeysDistinct } from './layer-keys';
import type { LayerRow, SlotsmithDb } from './schema';

export interface CorpusRow {
  id: number;
  seq: number;
  externalId: string | null;
  text: string;
  /** start,end pairs (UTF-16), as stored. */
  tokens: Int32Array;
  /** The shown layer's tags; null when it has no layer here. */
  tags: string[] | null;
  intent: string | null;
  /** True when the intent comes from the file (no layer took it), not from the shown layer. */
  intentFromFile: boolean;
  status: LayerStatus;
  done: number;
  layers: number;
  violations: number;
  /** Null in blind mode: whether others disagree is their labels' business. */
  disagreement: boolean | null;
}

export interface CorpusRowsContext {
  projectId: number;
  layer: string | null;
  blind: boolean;
}

/** The rows for `ids`, in the same order; ids that no longer exist are left out. */
export async function corpusRowsRead(db: SlotsmithDb, ids: ArrayLike<number>, context: CorpusRowsContext): Promise<CorpusRow[]> {
  const wanted = Array.from(ids);
  if (wanted.length === 0) return [];
  const { minKey, maxKey } = Dexie;
  return db.transaction('r', [db.projects, db.utterances, db.layers], async () => {
    const project = await db.projects.get(context.projectId);
    if (project === undefined) return [];
    const schema = labelSchemaOf(project.schema);
    const utterances = await db.utterances.bulkGet(wanted);
    const lo = Math.min(...wanted);
    const hi = Math.max(...wanted);
    const byUtterance = new Map<number, LayerRow[]>(wanted.map((id) => [id, []]));
    const add = (layer: LayerRow) => byUtterance.get(layer.utteranceId)?.push(layer);
    // A window in seq order is one key range; a sorted window scattered over the project is read id by id.
    if (hi - lo < 4 * wanted.length) {
      (await db.layers.where('[utteranceId+annotator]').between([lo, minKey], [hi, maxKey], true, true).toArray()).forEach(add);
    } else {
      for (const id of wanted) (await db.layers.where('[utteranceId+annotator]').between([id, minKey], [id, maxKey], true, true).toArray()).forEach(add);
    }
    const rows: CorpusRow[] = [];
    for (const u of utterances) {
      if (u === undefined || u.projectId !== context.projectId) continue;
      const layers = byUtterance.get(u.id) ?? [];
      const shown = context.layer === null ? undefined : layers.find((l) => l.annotator === context.layer);
      const counts = layersDone(layers);
      rows.push({
        id: u.id,
        seq: u.seq,
        externalId: u.externalId ?? null,
        text: u.text,
        tokens: u.tokens,
        tags: shown === undefined ? null : [...shown.tags],
        intent: shown === undefined ? (u.intentHint ?? null) : shown.intent,
        intentFromFile: shown === undefined && u.intentHint !== undefined,
        status: shown?.status ?? 'unlabelled',
        done: counts.done,
        layers: counts.layers,
        violations: shown === undefined ? 0 : layerViolationCount(shown, project.scheme, schema),
        disagreement: context.blind ? null : layersDisagree(layers),
      });
    }
    return rows;
  });
}

/** The first `count` rows in seq order: the unfiltered table's first screen, read without the id list. */
export async function corpusRowsFirst(db: SlotsmithDb, count: number, context: CorpusRowsContext): Promise<CorpusRow[]> {
  const { minKey, maxKey } = Dexie;
  const ids = await db.utterances.where('[projectId+seq]').between([context.projectId, minKey], [context.projectId, maxKey]).limit(count).primaryKeys();
  return corpusRowsRead(db, ids, context);
}

/** Every utterance id of the project in seq order, from the index keys alone (the unfiltered table). */
export async function corpusIdsInSeqOrder(db: SlotsmithDb, projectId: number): Promise<Int32Array> {
  const { minKey, maxKey } = Dexie;
  const keys = await db.utterances.where('[projectId+seq]').between([projectId, minKey], [projectId, maxKey]).primaryKeys();
  return Int32Array.from(keys);
}

/** The layer owners of the project, from the index keys alone: people sorted, then gold and model. */
export async function corpusAnnotators(db: SlotsmithDb, projectId: number): Promise<string[]> {
  const names = [...new Set((await layerKeysDistinct(db, projectId)).map((k) => k[1]))];
  return names.sort((a, b) => Number(!annotatorIsHuman(a)) - Number(!annotatorIsHuman(b)) || (a < b ? -1 : a > b ? 1 : 0));
}
