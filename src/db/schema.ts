/**
 * The one Dexie schema and typed database. Row shapes are the core model (src/core/backup/model.ts)
 * plus database keys. Decisions beyond ARCHITECTURE.md:
 * - Auto-increment number keys (projects, utterances, batches, history): compact, never reused after
 *   a delete, so a stale link cannot open a different project.
 * - Utterance tokens are an Int32Array of start,end pairs (structured clone keeps typed arrays): far
 *   smaller than objects for 100k utterances; `tokensUnpack` gives core `Token[]`.
 * - `seq` orders a project's utterances and is unique per project (`&[projectId+seq]`), for keyset
 *   paging and as the stable reference inside backups.
 * - Layers are keyed [utteranceId+annotator]; the index [projectId+annotator+status] serves both
 *   "one annotator's layers" (prefix) and progress counts by status without reading rows.
 * - `[projectId+externalId]` (version 2) is not unique: files without ids, or repeating one, stay importable.
 * - Gold and model layers have no annotator row: the annotators table lists people only.
 * - Durability: every read-write transaction of an instance is 'strict' by default. Dexie 4 takes
 *   durability per database (`chromeTransactionDurability`), not per transaction, and label edits
 *   must survive a crash; imports write big chunks, so the extra flushes are few.
 *
 * Upgrades: append a version to SCHEMA_VERSIONS (never edit an old one), and add a frozen fixture
 * tests/fixtures/db/v<N>-sample.json plus a case in tests/db/upgrade.test.ts.
 */
import Dexie, { type EntityTable, type Table, type Transaction } from 'dexie';
import type { AnnotatorInfo, BatchInfo, LayerContent, ProjectInfo } from '../core/backup/model';

export interface ProjectRow extends ProjectInfo {
  id: number;
}

export interface UtteranceRow {
  id: number;
  projectId: number;
  seq: number;
  text: string;
  /** start,end pairs, UTF-16 code units; never changed after import (tags refer to token indices). */
  tokens: Int32Array;
  externalId?: string;
  intentHint?: string;
  meta: Record<string, string>;
  source: { batchId?: number; line?: number };
}

export interface LayerRow extends LayerContent {
  utteranceId: number;
  annotator: string;
  projectId: number;
  /** The import that created the layer; kept after edits, as provenance. */
  batchId?: number;
}

export type LayerKey = [utteranceId: number, annotator: string];

export interface AnnotatorRow extends AnnotatorInfo {
  projectId: number;
}

export interface BatchRow extends BatchInfo {
  id: number;
  projectId: number;
  /** Utterances of the file that matched an existing one and only got a layer (not in `counts.utterances`). */
  attached?: number;
}

export interface HistoryRow {
  id: number;
  projectId: number;
  utteranceId: number;
  annotator: string;
  before: LayerContent | null;
  after: LayerContent;
  who: string;
  when: number;
}

export interface SchemaVersion {
  version: number;
  stores: Record<string, string>;
  upgrade?: (tx: Transaction) => Promise<void>;
}

export const SCHEMA_VERSIONS: readonly SchemaVersion[] = [
  {
    version: 1,
    stores: {
      projects: '++id',
      utterances: '++id, &[projectId+seq], source.batchId',
      layers: '[utteranceId+annotator], [projectId+annotator+status], batchId',
      annotators: '[projectId+id]',
      batches: '++id, projectId, state',
      history: '++id, projectId, [utteranceId+annotator]',
    },
  },
  {
    // [projectId+externalId] finds the utterance a second annotator's file labels (attach on import).
    version: 2,
    stores: {
      utterances: '++id, &[projectId+seq], source.batchId, [projectId+externalId]',
    },
  },
];

export const SCHEMA_VERSION_CURRENT = SCHEMA_VERSIONS[SCHEMA_VERSIONS.length - 1]?.version ?? 1;
export const DB_NAME_DEFAULT = 'slotsmith';

export type Durability = 'strict' | 'relaxed' | 'default';

export interface DbOpenOptions {
  /** Injected for tests (fake-indexeddb); the browser's own otherwise. */
  indexedDB?: IDBFactory;
  IDBKeyRange?: typeof IDBKeyRange;
  durability?: Durability;
  /** Milliseconds since the epoch; injected so tests are deterministic. */
  clock?: () => number;
  /** Open at an older schema version (upgrade tests only). */
  versionMax?: number;
}

export class SlotsmithDb extends Dexie {
  projects!: EntityTable<ProjectRow, 'id'>;
  utterances!: EntityTable<UtteranceRow, 'id'>;
  layers!: Table<LayerRow, LayerKey>;
  annotators!: Table<AnnotatorRow, [number, string]>;
  batches!: EntityTable<BatchRow, 'id'>;
  history!: EntityTable<HistoryRow, 'id'>;
  readonly clock: () => number;

  constructor(name: string, options: DbOpenOptions = {}) {
    const dexieOptions: ConstructorParameters<typeof Dexie>[1] = { chromeTransactionDurability: options.durability ?? 'strict' };
    if (options.indexedDB !== undefined) dexieOptions.indexedDB = options.indexedDB;
    if (options.IDBKeyRange !== undefined) dexieOptions.IDBKeyRange = options.IDBKeyRange;
    super(name, dexieOptions);
    this.clock = options.clock ?? Date.now;
    for (const v of SCHEMA_VERSIONS) {
      if (v.version > (options.versionMax ?? Infinity)) break;
      const version = this.version(v.version).stores(v.stores);
      if (v.upgrade !== undefined) version.upgrade(v.upgrade);
    }
  }
}

/** The typed database; Dexie opens it on first use. */
export function dbOpen(name: string = DB_NAME_DEFAULT, options: DbOpenOptions = {}): SlotsmithDb {
  return new SlotsmithDb(name, options);
}

/** Every table, for transactions that must see them all (cascade delete, restore). */
export function dbTablesAll(db: SlotsmithDb): Table[] {
  return [db.projects, db.utterances, db.layers, db.annotators, db.batches, db.history];
}
