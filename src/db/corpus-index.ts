/**
 * The utterance table's index of one project: one pass over utterances and layers that keeps, per
 * utterance, only small codes (status, intent, rule violations, slots present, done count,
 * disagreement) in typed arrays, plus the texts lower-cased in one string for search. Filters and
 * sorts then run over these arrays in milliseconds; rows themselves are read page by page
 * (corpus-rows.ts). At 100k utterances the index is a few megabytes, mostly the search text.
 * Reading 100k utterances and their layers from IndexedDB takes seconds, so label edits update the
 * index in place (from the history rows they write) instead of rebuilding it.
 */
import Dexie from 'dexie';
import { LAYER_STATUSES, type LayerStatus } from '../core/backup/model';
import { spansFromTags } from '../core/schemes';
import type { LabelSchema } from '../core/rules';
import type { Scheme } from '../core/types';
import { annotatorIsHuman, labelSchemaOf, layersDisagree, layersDone, layerViolationCount, type LayerLike } from './corpus-facts';
import type { BatchRow, LayerRow, ProjectRow, SlotsmithDb, UtteranceRow } from './schema';

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
  /** What the index was built from (see corpusIndexUpdate). */
  signature: CorpusSignature;
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
const CHUNK = 5000;
/** More edited utterances than this since the index was built: rebuilding is as quick as updating. */
const UPDATE_MAX = 5000;

/**
 * What an index was built from; cheap to read: the project row, its import batches (a few rows) and
 * one history key — no counting, which on a disk-backed IndexedDB walks every index entry (seconds at
 * 100k). Every write to a project's layers either adds a history row (edits, merges, pre-labels,
 * repairs, schema edits), changes a batch (imports, in progress or rolled back), or changes the row.
 */
export interface CorpusSignature {
  /** The project's scheme and schema (and its last change), as JSON; 'missing' when it is gone. */
  project: string;
  /** The project's import batches as [id, state, utterances, layers], as JSON. */
  batches: string;
  /** Highest history id of the project (0: none): every label edit writes one history row. */
  historyLast: number;
}

/** One import batch as the signature lists it. */
export function corpusBatchEntry(batch: Pick<BatchRow, 'id' | 'state' | 'counts'>): [number, string, number, number] {
  return [batch.id, batch.state, batch.counts.utterances, batch.counts.layers];
}

export async function corpusIndexSignature(db: SlotsmithDb, projectId: number): Promise<CorpusSignature> {
  return db.transaction('r', [db.projects, db.batches, db.history], async () => {
    const project = await db.projects.get(projectId);
    if (project === undefined) return { project: 'missing', batches: '[]', historyLast: 0 };
    const batches = (await db.batches.where('projectId').equals(projectId).toArray()).map(corpusBatchEntry);
    const last = await db.history.where('projectId').equals(projectId).reverse().limit(1).primaryKeys();
    return { project: JSON.stringify([project.updated, project.scheme, project.schema]), batches: JSON.stringify(batches), historyLast: last[0] ?? 0 };
  });
}

export function corpusSignatureSame(a: CorpusSignature, b: CorpusSignature): boolean {
  return a.project === b.project && a.batches === b.batches && a.historyLast === b.historyLast;
}

function columnMake(n: number): LayerColumn {
  return { status: new Uint8Array(n), intent: new Uint16Array(n), violations: new Uint16Array(n), slots: new Map() };
}

interface Rules {
  scheme: Scheme;
  schema: LabelSchema | null;
  intentCode: (name: string | null | undefined) => number;
}

function rulesOf(index: CorpusIndex, project: Pick<ProjectRow, 'scheme' | 'schema'>): Rules {
  const codes = new Map(index.intents.map((name, i) => [name, i + 1]));
  return {
    scheme: project.scheme,
    schema: labelSchemaOf(project.schema),
    intentCode: (name) => {
      if (name === null || name === undefined || name === '') return 0;
      let code = codes.get(name);
      if (code === undefined) {
        code = index.intents.push(name);
        codes.set(name, code);
      }
      return code;
    },
  };
}

/** Write utterance i's layer facts into the index (after clearing what it held). */
function utteranceLayersSet(index: CorpusIndex, i: number, layers: readonly LayerLike[], rules: Rules): void {
  const n = index.intentHint.length;
  for (const column of index.layers.values()) {
    column.status[i] = 0;
    column.intent[i] = 0;
    column.violations[i] = 0;
    for (const present of column.slots.values()) present[i] = 0;
  }
  for (const layer of layers) {
    let column = index.layers.get(layer.annotator);
    if (column === undefined) {
      column = columnMake(n);
      index.layers.set(layer.annotator, column);
    }
    column.status[i] = STATUS_CODE[layer.status] ?? 0;
    column.intent[i] = rules.intentCode(layer.intent);
    column.violations[i] = Math.min(0xffff, layerViolationCount(layer, rules.scheme, rules.schema));
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

function annotatorsSorted(names: Iterable<string>): string[] {
  return [...names].sort((a, b) => Number(!annotatorIsHuman(a)) - Number(!annotatorIsHuman(b)) || (a < b ? -1 : a > b ? 1 : 0));
}

function resized<T extends Uint8Array | Uint16Array | Int32Array>(array: T, length: number): T {
  const next = new (array.constructor as new (n: number) => T)(length);
  next.set(array.subarray(0, Math.min(length, array.length)));
  return next;
}

/** Every typed array of the index at `length` entries (`textStart` one more), keeping what they hold. */
function indexResize(index: CorpusIndex, length: number): void {
  index.ids = resized(index.ids, length);
  index.intentHint = resized(index.intentHint, length);
  index.done = resized(index.done, length);
  index.humanLayers = resized(index.humanLayers, length);
  index.disagree = resized(index.disagree, length);
  index.textStart = resized(index.textStart, length + 1);
  for (const column of index.layers.values()) {
    column.status = resized(column.status, length);
    column.intent = resized(column.intent, length);
    column.violations = resized(column.violations, length);
    for (const [slot, present] of column.slots) column.slots.set(slot, resized(present, length));
  }
}

/**
 * An index filled utterance by utterance in seq order, growing as it goes (no count beforehand: on a
 * disk-backed IndexedDB counting walks every index entry). The build pass fills one from the
 * database; an import fills one from the chunks it stores (corpus-index-import.ts).
 */
export class CorpusIndexFill {
  private readonly index: CorpusIndex;
  private readonly rules: Rules;
  private readonly texts: string[] = [];
  private offset = 0;
  private count = 0;

  constructor(projectId: number, project: Pick<ProjectRow, 'scheme' | 'schema'>, capacity = 1024) {
    const n = Math.max(1, capacity);
    this.index = {
      projectId,
      signature: { project: '', batches: '[]', historyLast: 0 },
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
    this.rules = rulesOf(this.index, project);
  }

  /** Utterances added so far. */
  get size(): number {
    return this.count;
  }

  /** Add the next utterance in seq order; returns its position. */
  utteranceAdd(id: number, text: string, intentHint: string | null | undefined): number {
    const at = this.count;
    if (at >= this.index.ids.length) indexResize(this.index, this.index.ids.length * 2);
    this.index.ids[at] = id;
    this.index.intentHint[at] = this.rules.intentCode(intentHint);
    const lower = text.toLowerCase();
    this.texts.push(lower);
    this.index.textStart[at] = this.offset;
    this.offset += lower.length + 1;
    this.count += 1;
    return at;
  }

  /** The layers of the utterance at `position` (every one it has). */
  layersSet(position: number, layers: readonly LayerLike[]): void {
    utteranceLayersSet(this.index, position, layers, this.rules);
  }

  /** The finished index, arrays cut to size; the fill is not to be used afterwards. */
  finish(signature: CorpusSignature): CorpusIndex {
    const index = this.index;
    indexResize(index, this.count);
    index.textStart[this.count] = this.offset;
    index.text = this.texts.join('\u0000') + '\u0000';
    index.annotators = annotatorsSorted(index.layers.keys());
    index.signature = signature;
    return index;
  }
}

interface Chunk {
  utterances: UtteranceRow[];
  layers: LayerRow[];
}

function chunkRead(db: SlotsmithDb, projectId: number, afterSeq: number | null): Promise<Chunk> {
  const { minKey, maxKey } = Dexie;
  const lower = afterSeq === null ? [projectId, minKey] : [projectId, afterSeq];
  return db.transaction('r', [db.utterances, db.layers], async () => {
    const utterances = await db.utterances.where('[projectId+seq]').between(lower, [projectId, maxKey], afterSeq === null, true).limit(CHUNK).toArray();
    if (utterances.length === 0) return { utterances, layers: [] };
    let lo = Infinity;
    let hi = -Infinity;
    for (const u of utterances) {
      lo = Math.min(lo, u.id);
      hi = Math.max(hi, u.id);
    }
    // Ids of one import are consecutive, so one key range covers a chunk's layers (others are skipped later).
    const layers = await db.layers.where('[utteranceId+annotator]').between([lo, minKey], [hi, maxKey], true, true).toArray();
    return { utterances, layers };
  });
}

/** Layers grouped by utterance id, keeping only the utterances asked for. */
function layersByUtterance(layers: readonly LayerRow[], projectId: number, wanted: { has: (id: number) => boolean }): Map<number, LayerRow[]> {
  const by = new Map<number, LayerRow[]>();
  for (const layer of layers) {
    if (layer.projectId !== projectId || !wanted.has(layer.utteranceId)) continue;
    const list = by.get(layer.utteranceId);
    if (list === undefined) by.set(layer.utteranceId, [layer]);
    else list.push(layer);
  }
  return by;
}

/**
 * Build the index from the database in chunks of utterances (and their layers) in seq order; the
 * next chunk is read while the current one is worked through. `onProgress` gets utterances done and
 * the total once a count, taken beside the reading, comes in (until then, what was read).
 */
export async function corpusIndexBuild(db: SlotsmithDb, projectId: number, onProgress?: (done: number, total: number) => void): Promise<CorpusIndex> {
  const signature = await corpusIndexSignature(db, projectId);
  const project = await db.projects.get(projectId);
  if (project === undefined) throw new Error(`project ${projectId} does not exist`);
  const fill = new CorpusIndexFill(projectId, project, CHUNK);
  // Only for the progress note: counted beside the reading (not before it), as the walk takes about a second at 100k on disk.
  let total = 0;
  if (onProgress !== undefined) {
    db.utterances
      .where('[projectId+seq]')
      .between([projectId, Dexie.minKey], [projectId, Dexie.maxKey])
      .count()
      .then((n) => (total = n))
      .catch(() => undefined);
  }
  let pending: Promise<Chunk> | null = chunkRead(db, projectId, null);
  while (pending !== null) {
    const chunk: Chunk = await pending;
    const last = chunk.utterances[chunk.utterances.length - 1];
    pending = last === undefined || chunk.utterances.length < CHUNK ? null : chunkRead(db, projectId, last.seq);
    const position = new Map<number, number>();
    for (const u of chunk.utterances) position.set(u.id, fill.utteranceAdd(u.id, u.text, u.intentHint));
    for (const [utteranceId, layers] of layersByUtterance(chunk.layers, projectId, position)) fill.layersSet(position.get(utteranceId) as number, layers);
    onProgress?.(fill.size, Math.max(total, fill.size));
  }
  return fill.finish(signature);
}

const positions = new WeakMap<CorpusIndex, Map<number, number>>();

function positionOf(index: CorpusIndex, utteranceId: number): number | undefined {
  let map = positions.get(index);
  if (map === undefined) {
    map = new Map();
    index.ids.forEach((id, i) => (map as Map<number, number>).set(id, i));
    positions.set(index, map);
  }
  return map.get(utteranceId);
}

/**
 * Bring the index up to `next` in place when only label edits happened since it was built: the
 * same project settings and imports, so every changed layer has a history row since.
 * Returns false when that does not hold (an import, a deletion, a schema change): rebuild then.
 */
export async function corpusIndexUpdate(db: SlotsmithDb, index: CorpusIndex, next: CorpusSignature): Promise<boolean> {
  const before = index.signature;
  if (next.project !== before.project || next.batches !== before.batches || next.historyLast < before.historyLast) return false;
  const { minKey, maxKey } = Dexie;
  const projectId = index.projectId;
  const done = await db.transaction('r', [db.projects, db.history, db.layers], async () => {
    const edits = (await db.history.where(':id').above(before.historyLast).toArray()).filter((h) => h.projectId === projectId && h.id <= next.historyLast);
    const touched = [...new Set(edits.map((h) => h.utteranceId))];
    if (touched.length > UPDATE_MAX) return null;
    const project = await db.projects.get(projectId);
    if (project === undefined) return null;
    const layers: LayerRow[] = [];
    for (const id of touched) layers.push(...(await db.layers.where('[utteranceId+annotator]').between([id, minKey], [id, maxKey], true, true).toArray()));
    return { project, touched, layers };
  });
  if (done === null) return false;
  const rules = rulesOf(index, done.project);
  const by = layersByUtterance(done.layers, projectId, new Set(done.touched));
  for (const id of done.touched) {
    const i = positionOf(index, id);
    if (i !== undefined) utteranceLayersSet(index, i, by.get(id) ?? [], rules);
  }
  index.annotators = annotatorsSorted(index.layers.keys());
  index.signature = next;
  return true;
}
