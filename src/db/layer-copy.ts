/**
 * A compact copy of one annotator's layers in a project: per layer only what the agreement and
 * overview figures read (utterance id, status, intent, `updated`, tags), tags and intents as codes
 * into name tables, in typed arrays ordered by utterance id. 100k layers of ~12 tokens take ~7 MB
 * and come back from IndexedDB in one read, where the rows themselves take seconds to page through
 * on a disk-backed profile. Copies live in a cache database (layer-copy-store.ts) and are brought up
 * to date from history rows (layer-copies.ts).
 */
import { LAYER_STATUSES, type LayerStatus } from '../core/backup/model';
import type { CorpusSignature } from './corpus-index';
import type { LayerRow } from './schema';

export interface LayerCopy {
  projectId: number;
  annotator: string;
  /** The project's signature the copy is up to date with (it may hold later edits too: see layer-copies.ts). */
  signature: CorpusSignature;
  /** Ascending. */
  utteranceIds: Int32Array;
  /** 1 + position in LAYER_STATUSES. */
  status: Uint8Array;
  updated: Float64Array;
  /** 0: no intent; otherwise 1 + position in `intents`. */
  intent: Int32Array;
  intents: string[];
  /** Layer k's tags are `tags[tagStart[k] .. tagStart[k + 1])`. */
  tagStart: Int32Array;
  /** Position in `tagNames`; tags as stored (illegal ones included). */
  tags: Int32Array;
  tagNames: string[];
}

/** What a copy gives back of a layer: the fields of LayerRow the figures read. */
export type LayerCopyRow = Pick<LayerRow, 'utteranceId' | 'annotator' | 'projectId' | 'tags' | 'intent' | 'status' | 'updated'>;

const STATUS_OF_CODE: readonly LayerStatus[] = LAYER_STATUSES;
const CODE_OF_STATUS = new Map(LAYER_STATUSES.map((s, i) => [s, i + 1]));

class Grow<T extends Int32Array | Float64Array | Uint8Array> {
  length = 0;
  constructor(
    public data: T,
    private readonly make: (n: number) => T,
  ) {}

  reserve(extra: number): void {
    if (this.length + extra <= this.data.length) return;
    const grown = this.make(Math.max(this.data.length * 2, this.length + extra, 16));
    grown.set(this.data.subarray(0, this.length) as never);
    this.data = grown;
  }

  push(value: number): void {
    this.reserve(1);
    this.data[this.length++] = value;
  }

  done(): T {
    return this.data.slice(0, this.length) as T;
  }
}

class Names {
  readonly names: string[];
  private readonly codes = new Map<string, number>();

  constructor(initial: readonly string[] = []) {
    this.names = [...initial];
    this.names.forEach((n, i) => this.codes.set(n, i));
  }

  code(name: string): number {
    let c = this.codes.get(name);
    if (c === undefined) {
      c = this.names.length;
      this.names.push(name);
      this.codes.set(name, c);
    }
    return c;
  }
}

/** Builds a copy from layers given in ascending utterance id (as a scan by primary key gives them). */
export class LayerCopyBuilder {
  private readonly ids = new Grow(new Int32Array(1024), (n) => new Int32Array(n));
  private readonly status = new Grow(new Uint8Array(1024), (n) => new Uint8Array(n));
  private readonly updated = new Grow(new Float64Array(1024), (n) => new Float64Array(n));
  private readonly intent = new Grow(new Int32Array(1024), (n) => new Int32Array(n));
  private readonly tagStart = new Grow(new Int32Array(1025), (n) => new Int32Array(n));
  private readonly tags = new Grow(new Int32Array(16384), (n) => new Int32Array(n));
  private readonly intentNames: Names;
  private readonly tagNames: Names;
  private lastTag: string | undefined;
  private lastCode = 0;

  /**
   * `tables`: start from a copy's name tables, so its codes can be carried over unchanged.
   * `anyOrder`: take rows in any order (an import's attached layers); the copy must then go through
   * layerCopyMerged, which orders it, before anything reads it.
   */
  constructor(
    readonly projectId: number,
    readonly annotator: string,
    tables: { intents: readonly string[]; tagNames: readonly string[] } = { intents: [], tagNames: [] },
    private readonly anyOrder = false,
  ) {
    this.intentNames = new Names(tables.intents);
    this.tagNames = new Names(tables.tagNames);
    this.tagStart.push(0);
  }

  private last(): number {
    return this.ids.length === 0 ? -Infinity : (this.ids.data[this.ids.length - 1] as number);
  }

  rowAdd(row: Pick<LayerRow, 'utteranceId' | 'tags' | 'intent' | 'status' | 'updated'>): void {
    if (!this.anyOrder && row.utteranceId <= this.last()) throw new Error(`Layer copy: utterance ${row.utteranceId} came after ${this.last()}; rows must come in ascending utterance id.`);
    this.ids.push(row.utteranceId);
    this.status.push(CODE_OF_STATUS.get(row.status) ?? 0);
    this.updated.push(row.updated);
    this.intent.push(row.intent === null ? 0 : 1 + this.intentNames.code(row.intent));
    const count = row.tags.length;
    this.tags.reserve(count);
    const out = this.tags.data;
    let at = this.tags.length;
    for (const tag of row.tags) {
      // Runs of one tag (O above all) are common: the previous tag skips most map lookups.
      if (tag !== this.lastTag) {
        this.lastCode = this.tagNames.code(tag);
        this.lastTag = tag;
      }
      out[at++] = this.lastCode;
    }
    this.tags.length = at;
    this.tagStart.push(at);
  }

  /** Layer k of `copy` as it is, codes and all (the builder must have started from its tables). */
  copiedAdd(copy: LayerCopy, k: number): void {
    const id = copy.utteranceIds[k] as number;
    if (id <= this.last()) throw new Error(`Layer copy: utterance ${id} came after ${this.last()}; rows must come in ascending utterance id.`);
    this.ids.push(id);
    this.status.push(copy.status[k] as number);
    this.updated.push(copy.updated[k] as number);
    this.intent.push(copy.intent[k] as number);
    const from = copy.tagStart[k] as number;
    const to = copy.tagStart[k + 1] as number;
    this.tags.reserve(to - from);
    this.tags.data.set(copy.tags.subarray(from, to), this.tags.length);
    this.tags.length += to - from;
    this.tagStart.push(this.tags.length);
  }

  /** Layer k of `copy` with its codes carried into this builder's tables (any tables). */
  recodedAdd(copy: LayerCopy, k: number, intentCodes: Int32Array, tagCodes: Int32Array): void {
    const id = copy.utteranceIds[k] as number;
    if (id <= this.last()) throw new Error(`Layer copy: utterance ${id} came after ${this.last()}; rows must come in ascending utterance id.`);
    this.ids.push(id);
    this.status.push(copy.status[k] as number);
    this.updated.push(copy.updated[k] as number);
    const intent = copy.intent[k] as number;
    this.intent.push(intent === 0 ? 0 : (intentCodes[intent - 1] as number) + 1);
    const from = copy.tagStart[k] as number;
    const to = copy.tagStart[k + 1] as number;
    this.tags.reserve(to - from);
    const out = this.tags.data;
    let at = this.tags.length;
    for (let t = from; t < to; t++) out[at++] = tagCodes[copy.tags[t] as number] as number;
    this.tags.length = at;
    this.tagStart.push(at);
  }

  /** This builder's code for an intent name (added to its table when new). */
  intentCode(name: string): number {
    return this.intentNames.code(name);
  }

  /** This builder's code for a tag (added to its table when new). */
  tagCode(name: string): number {
    return this.tagNames.code(name);
  }

  done(signature: CorpusSignature): LayerCopy {
    return {
      projectId: this.projectId,
      annotator: this.annotator,
      signature,
      utteranceIds: this.ids.done(),
      status: this.status.done(),
      updated: this.updated.done(),
      intent: this.intent.done(),
      intents: [...this.intentNames.names],
      tagStart: this.tagStart.done(),
      tags: this.tags.done(),
      tagNames: [...this.tagNames.names],
    };
  }
}

/**
 * `copy` with the layers of `touched` utterances replaced by `rows` (their current rows; a touched
 * utterance without a row has lost its layer), at `signature`.
 */
export function layerCopyPatched(copy: LayerCopy, touched: ReadonlySet<number>, rows: readonly LayerCopyRow[], signature: CorpusSignature): LayerCopy {
  const fresh = [...rows].sort((x, y) => x.utteranceId - y.utteranceId);
  const builder = new LayerCopyBuilder(copy.projectId, copy.annotator, copy);
  const n = copy.utteranceIds.length;
  let k = 0;
  for (const row of fresh) {
    while (k < n && (copy.utteranceIds[k] as number) < row.utteranceId) {
      if (!touched.has(copy.utteranceIds[k] as number)) builder.copiedAdd(copy, k);
      k++;
    }
    if (k < n && copy.utteranceIds[k] === row.utteranceId) k++;
    builder.rowAdd(row);
  }
  for (; k < n; k++) if (!touched.has(copy.utteranceIds[k] as number)) builder.copiedAdd(copy, k);
  return builder.done(signature);
}

/**
 * `base` (null: no layers yet) with the layers of `added` (in any order, one per utterance) put in:
 * an added layer replaces base's layer on the same utterance. Base keeps its codes; names new to it
 * are appended to its tables in the order the merge meets them (so with no base, the tables are a
 * read in utterance order's).
 */
export function layerCopyMerged(base: LayerCopy | null, added: LayerCopy, signature: CorpusSignature): LayerCopy {
  const n = added.utteranceIds.length;
  const order = new Int32Array(n);
  for (let k = 0; k < n; k++) order[k] = k;
  let ascending = true;
  for (let k = 1; k < n && ascending; k++) if ((added.utteranceIds[k] as number) <= (added.utteranceIds[k - 1] as number)) ascending = false;
  if (!ascending) order.sort((x, y) => (added.utteranceIds[x] as number) - (added.utteranceIds[y] as number));
  for (let k = 1; k < n; k++) {
    if (added.utteranceIds[order[k] as number] === added.utteranceIds[order[k - 1] as number]) throw new Error(`Layer copy: utterance ${added.utteranceIds[order[k] as number]} was added twice.`);
  }
  const builder = new LayerCopyBuilder(added.projectId, added.annotator, base ?? { intents: [], tagNames: [] });
  // Names are coded lazily, in utterance order, so an empty base gives the tables a fresh read gives.
  const intentCodes = new Int32Array(added.intents.length).fill(-1);
  const tagCodes = new Int32Array(added.tagNames.length).fill(-1);
  const addedPut = (k: number) => {
    const intent = added.intent[k] as number;
    if (intent !== 0 && intentCodes[intent - 1] === -1) intentCodes[intent - 1] = builder.intentCode(added.intents[intent - 1] as string);
    for (let t = added.tagStart[k] as number; t < (added.tagStart[k + 1] as number); t++) {
      const c = added.tags[t] as number;
      if (tagCodes[c] === -1) tagCodes[c] = builder.tagCode(added.tagNames[c] as string);
    }
    builder.recodedAdd(added, k, intentCodes, tagCodes);
  };
  const m = base?.utteranceIds.length ?? 0;
  let b = 0;
  for (let i = 0; i < n; i++) {
    const k = order[i] as number;
    const id = added.utteranceIds[k] as number;
    if (base !== null) {
      while (b < m && (base.utteranceIds[b] as number) < id) builder.copiedAdd(base, b++);
      if (b < m && base.utteranceIds[b] === id) b++;
    }
    addedPut(k);
  }
  if (base !== null) while (b < m) builder.copiedAdd(base, b++);
  return builder.done(signature);
}

export function layerCopyStatus(copy: LayerCopy, k: number): LayerStatus {
  return STATUS_OF_CODE[(copy.status[k] as number) - 1] ?? 'unlabelled';
}

/** Whether any layer of the copy has one of `statuses`. */
export function layerCopyHas(copy: LayerCopy, statuses: readonly LayerStatus[]): boolean {
  const wanted = new Uint8Array(LAYER_STATUSES.length + 1);
  for (const s of statuses) wanted[CODE_OF_STATUS.get(s) ?? 0] = 1;
  for (const code of copy.status) if (wanted[code] === 1) return true;
  return false;
}

/**
 * Every layer of `copies` with one of `statuses` (null: any), in the order a scan of the layers'
 * primary key [utteranceId+annotator] gives: by utterance id, then annotator.
 */
export function layerCopiesVisit(copies: readonly LayerCopy[], statuses: readonly LayerStatus[] | null, visit: (row: LayerCopyRow) => void): number {
  const ordered = [...copies].sort((x, y) => (x.annotator < y.annotator ? -1 : x.annotator > y.annotator ? 1 : 0));
  const wanted = new Uint8Array(LAYER_STATUSES.length + 1).fill(statuses === null ? 1 : 0);
  for (const s of statuses ?? []) wanted[CODE_OF_STATUS.get(s) ?? 0] = 1;
  const at = ordered.map(() => 0);
  let visited = 0;
  for (;;) {
    // The next utterance id among the copies' cursors (a handful of copies: a linear pick is enough).
    let next = Infinity;
    ordered.forEach((c, i) => {
      const id = c.utteranceIds[at[i] as number];
      if (id !== undefined && id < next) next = id;
    });
    if (next === Infinity) return visited;
    ordered.forEach((c, i) => {
      const k = at[i] as number;
      if (c.utteranceIds[k] !== next) return;
      at[i] = k + 1;
      const code = c.status[k] as number;
      if (wanted[code] !== 1) return;
      const from = c.tagStart[k] as number;
      const to = c.tagStart[k + 1] as number;
      const tags = new Array<string>(to - from);
      for (let t = from; t < to; t++) tags[t - from] = c.tagNames[c.tags[t] as number] as string;
      const intent = c.intent[k] as number;
      visited++;
      visit({
        utteranceId: next,
        annotator: c.annotator,
        projectId: c.projectId,
        tags,
        intent: intent === 0 ? null : (c.intents[intent - 1] as string),
        status: STATUS_OF_CODE[code - 1] ?? 'unlabelled',
        updated: c.updated[k] as number,
      });
    });
  }
}
