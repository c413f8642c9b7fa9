/**
 * The utterance table's index of one project: one pass over utterances and layers that keeps, per
 * utterance, only small codes (status, intent, rule violations, slots present, done count,
 * disagreement) in typed arrays, plus the texts lower-cased in one string for search. Filters and
 * sorts then run over these arrays in milliseconds; rows themselves are read page by page
 * (corpus-rows.ts). At 100k utterances the index is a few megabytes, mostly the search text.
 */
import Dexie from 'dexie';
import { LAYER_STATUSES, type LayerStatus } from '../core/backup/model';
import type { Scheme } from '../core/types';
import { annotatorIsHuman, labelSchemaOf, layersDisagree, layersDone, layerViolationCount } from './corpus-facts';
import type { LayerRow, SlotsmithDb } from './schema';
import { spansFromTags } from '../core/schemes';

/** One annotator's layer over all utterances (index i = the i-th utterance in seq order). */
export interface LayerColumn {
  /** 0: no layer; otherwise 1 + position in LAYER_STATUSES. */
  status: Uint8Array;
  /** 0: no intent; otherwise 1 + position in `CorpusIndex.intents`. */
  intent: Uint16Array;
  violations: Uint16Array;
  /** Per slot name: 1 where the layer has a span of that slot. */
  slots: Map<string, Uint8Array>;
}

export interface CorpusIndex {
  projectId: number;
  /** What the index was built from; a different signature means it is stale. */
  signature: string;
  scheme: Scheme;
  /** Utterance ids in seq order. */
  ids: Int32Array;
  /** Intent names met, in order of first appearance (codes are 1 + position). */
  intents: string[];
  /** Intent from the file when no annotator's layer took it. */
  intentHint: Uint16Array;
  /** Layer owners in the project, sorted; people first, then gold and model. */
  annotators: string[];
  layers: Map<string, LayerColumn>;
  done: Uint8Array;
  humanLayers: Uint8Array;
  disagree: Uint8Array;
  /** Lower-cased texts joined by U+0000; `textStart[i]` is where text i begins (length n + 1). */
  text: string;
  textStart: Int32Array;
}

export const STATUS_CODE: Readonly<Record<LayerStatus, number>> = Object.fromEntries(LAYER_STATUSES.map((s, i) => [s, i + 1])) as Record<LayerStatus, number>;

/** Rows read per transaction: big enough to be quick, small enough not to hold the whole project at once. */
const CHUNK = 2000;

/**
 * Cheap to compute (index counts and the project row only): changes with every import, edit
 * (history grows), deletion and schema change.
 */
export async function corpusIndexSignature(db: SlotsmithDb, projectId: number): Promise<string> {
  const { minKey, maxKey } = Dexie;
  return db.transaction('r', [db.projects, db.utterances, db.layers, db.history], async () => {
    const project = await db.projects.get(projectId);
    if (project === undefined) return 'missing';
    const utterances = await db.utterances.where('[projectId+seq]').between([projectId, minKey], [projectId, maxKey]).count();
    const layers = await db.layers.where('[projectId+annotator+status]').between([projectId, minKey, minKey], [projectId, maxKey, maxKey]).count();
    const edits = await db.history.where('projectId').equals(projectId).count();
    return JSON.stringify([utterances, layers, edits, project.updated, project.scheme, project.schema]);
  });
}

function columnMake(n: number): LayerColumn {
  return { status: new Uint8Array(n), intent: new Uint16Array(n), violations: new Uint16Array(n), slots: new Map() };
}

/** Build the index from the database in chunks of utterances (and their layers) in seq order. */
export async function corpusIndexBuild(db: SlotsmithDb, projectId: number): Promise<CorpusIndex> {
  const { minKey, maxKey } = Dexie;
  const signature = await corpusIndexSignature(db, projectId);
  const project = await db.projects.get(projectId);
  if (project === undefined) throw new Error(`project ${projectId} does not exist`);
  const n = await db.utterances.where('[projectId+seq]').between([projectId, minKey], [projectId, maxKey]).count();
  const schema = labelSchemaOf(project.schema);
  const index: CorpusIndex = {
    projectId,
    signature,
    scheme: project.scheme,
    ids: new Int32Array(n),
    intents: [],
    intentHint: new Uint16Array(n),
    annotators: [],
    layers: new Map(),
    done: new Uint8Array(n),
    humanLayers: new Uint8Array(n),
    disagree: new Uint8Array(n),
    text: '',
    textStart: new Int32Array(n + 1),
  };
  const intentCodes = new Map<string, number>();
  const intentCode = (name: string | null | undefined): number => {
    if (name === null || name === undefined || name === '') return 0;
    let code = intentCodes.get(name);
    if (code === undefined) {
      code = index.intents.push(name);
      intentCodes.set(name, code);
    }
    return code;
  };
  const texts: string[] = [];
  let offset = 0;
  let at = 0;
  let afterSeq: number | null = null;
  while (at < n) {
    const lower: [number, number] = afterSeq === null ? [projectId, minKey as number] : [projectId, afterSeq];
    const chunk = await db.transaction('r', [db.utterances, db.layers], async () => {
      const utterances = await db.utterances.where('[projectId+seq]').between(lower, [projectId, maxKey], afterSeq === null, true).limit(CHUNK).toArray();
      if (utterances.length === 0) return { utterances, layers: [] as LayerRow[] };
      let lo = Infinity;
      let hi = -Infinity;
      for (const u of utterances) {
        lo = Math.min(lo, u.id);
        hi = Math.max(hi, u.id);
      }
      // Ids of one import are consecutive, so one key range covers a chunk's layers (others are skipped below).
      const layers = await db.layers.where('[utteranceId+annotator]').between([lo, minKey], [hi, maxKey], true, true).toArray();
      return { utterances, layers };
    });
    if (chunk.utterances.length === 0) break;
    const position = new Map<number, number>();
    for (const u of chunk.utterances) {
      if (at >= n) break;
      index.ids[at] = u.id;
      index.intentHint[at] = intentCode(u.intentHint);
      const text = u.text.toLowerCase();
      texts.push(text);
      index.textStart[at] = offset;
      offset += text.length + 1;
      position.set(u.id, at);
      at += 1;
      afterSeq = u.seq;
    }
    const byUtterance = new Map<number, LayerRow[]>();
    for (const layer of chunk.layers) {
      if (layer.projectId !== projectId || !position.has(layer.utteranceId)) continue;
      const list = byUtterance.get(layer.utteranceId);
      if (list === undefined) byUtterance.set(layer.utteranceId, [layer]);
      else list.push(layer);
    }
    for (const [utteranceId, layers] of byUtterance) {
      const i = position.get(utteranceId) as number;
      for (const layer of layers) {
        let column = index.layers.get(layer.annotator);
        if (column === undefined) {
          column = columnMake(n);
          index.layers.set(layer.annotator, column);
        }
        column.status[i] = STATUS_CODE[layer.status] ?? 0;
        column.intent[i] = intentCode(layer.intent);
        column.violations[i] = Math.min(0xffff, layerViolationCount(layer, project.scheme, schema));
        for (const span of spansFromTags(layer.tags)) {
          let present = column.slots.get(span.slot);
          if (present === undefined) {
            present = new Uint8Array(n);
            column.slots.set(span.slot, present);
          }
          present[i] = 1;
        }
      }
      const counts = layersDone(layers);
      index.done[i] = Math.min(255, counts.done);
      index.humanLayers[i] = Math.min(255, counts.layers);
      index.disagree[i] = layersDisagree(layers) ? 1 : 0;
    }
  }
  // A count taken before a concurrent delete may exceed what the pass met; trim to what was read.
  if (at < n) {
    index.ids = index.ids.slice(0, at);
    index.textStart = index.textStart.slice(0, at + 1);
  }
  index.textStart[at] = offset;
  index.text = texts.join('\u0000') + '\u0000';
  index.annotators = [...index.layers.keys()].sort((a, b) => Number(!annotatorIsHuman(a)) - Number(!annotatorIsHuman(b)) || (a < b ? -1 : a > b ? 1 : 0));
  return index;
}

/** Number of utterances in the index. */
export function corpusIndexSize(index: CorpusIndex): number {
  return index.ids.length;
}
