/**
 * The project data model as plain values: what a backup file holds and what src/db stores (its rows
 * add database ids to these shapes). Lives in core so the backup codec stays pure and the CLI can
 * read backups too.
 *
 * References inside a backup never use database ids: utterances are named by `seq` (unique and
 * stable within a project) and batches by their 1-based position in the file. A restored project
 * therefore backs up to the same bytes as the original.
 */
import type { CrossValidation } from '../crf/cross-validate';
import type { TokeniserSpec } from '../tokenise';
import type { ReadError, Scheme } from '../types';

export const BACKUP_FORMAT = 'slotsmith-backup';
/**
 * 2: the project record may carry `exchange`, `model` and `dismissed`. Bumped so that a build which
 * reads only format 1 refuses such a file instead of restoring it without them; format 1 still reads.
 */
export const BACKUP_FORMAT_VERSION = 2;

export type LayerStatus = 'unlabelled' | 'draft' | 'done' | 'skipped' | 'flagged';
export const LAYER_STATUSES: readonly LayerStatus[] = ['unlabelled', 'draft', 'done', 'skipped', 'flagged'];

export type AnnotatorRole = 'annotator' | 'adjudicator';
export const ANNOTATOR_ROLES: readonly AnnotatorRole[] = ['annotator', 'adjudicator'];

/** Layers written by processes, not people: the adjudicated result and model suggestions. */
export const ANNOTATOR_GOLD = 'gold';
export const ANNOTATOR_MODEL = 'model';
export const ANNOTATORS_RESERVED: readonly string[] = [ANNOTATOR_GOLD, ANNOTATOR_MODEL];

export type BatchState = 'importing' | 'done' | 'failed' | 'cancelled';
export const BATCH_STATES: readonly BatchState[] = ['importing', 'done', 'failed', 'cancelled'];

export interface SlotDef {
  name: string;
  /** Keyboard shortcut, one key. */
  key?: string;
  colour?: string;
  description?: string;
  examples?: string[];
  /** Intents this slot may appear with; absent means any. */
  intents?: string[];
}

export interface IntentDef {
  name: string;
  description?: string;
}

export interface ProjectSchema {
  slots: SlotDef[];
  intents: IntentDef[];
}

export interface ProjectInfo {
  name: string;
  /** Milliseconds since the Unix epoch, like every time stamp here. */
  created: number;
  updated: number;
  tokeniser: TokeniserSpec;
  /** The scheme imports are shown in and exports default to. */
  scheme: Scheme;
  schema: ProjectSchema;
}

/** A pack handed out (or opened here); the shape src/db/exchange-repo.ts keeps as `PackEntry`. */
export interface BackupPackEntry {
  /** The pack's `bodySha256`. */
  id: string;
  annotator: string;
  created: number;
  seqs: number[];
}

/** Team-work facts of a project; the shape src/db/exchange-repo.ts keeps as `ProjectExchange`. */
export interface BackupExchange {
  uid: string;
  role: 'master' | 'copy';
  name?: string;
  packs: BackupPackEntry[];
}

/** The saved tagger; the shape src/db/model-repo.ts keeps as `StoredModel`. */
export interface BackupModel {
  /** The model file text (src/core/crf/model-file.ts), exactly as trained or loaded. */
  json: string;
  saved: number;
  origin: 'trained' | 'file';
  crossValidation: CrossValidation | null;
}

/** A dismissed likely-mistake finding; the shape src/db/findings-repo.ts keeps as `Dismissal`. */
export interface BackupDismissal {
  when: number;
  who: string | null;
}

/**
 * The project row's unindexed extras, which other stores add to it. In a backup, a model-disagreement
 * finding key names its utterance by seq, not by database id (see dismissed.ts).
 */
export interface BackupProject extends ProjectInfo {
  exchange?: BackupExchange;
  model?: BackupModel;
  /** By finding key; never empty (absent instead), as src/db/findings-repo.ts stores it. */
  dismissed?: Record<string, BackupDismissal>;
}

export interface AnnotatorInfo {
  id: string;
  name: string;
  role: AnnotatorRole;
}

export interface BatchCounts {
  utterances: number;
  tokens: number;
  layers: number;
}

export interface BatchInfo {
  fileName: string;
  format: string;
  /** Annotator whose layers the file's labels went to, if any. */
  annotator?: string;
  /** Status the imported layers were given (with `annotator`). */
  layerStatus?: LayerStatus;
  counts: BatchCounts;
  /**
   * Utterances of the file that matched a stored one by id (same text and tokens) and only got a
   * layer; not in `counts.utterances`. Optional: older backups of format 1 have none.
   */
  attached?: number;
  /** Reader problems worth keeping (malformed lines…), file lines 1-based. */
  warnings: ReadError[];
  state: BatchState;
  created: number;
  finished?: number;
  /** Why a failed or cancelled batch ended, in words for the user. */
  failure?: string;
}

/** One labelling state of one utterance by one annotator; `revision` grows by one per write. */
export interface LayerContent {
  /** One tag per token, as stored: imported illegal sequences are kept exactly. */
  tags: string[];
  intent: string | null;
  status: LayerStatus;
  note: string;
  revision: number;
  updated: number;
}

export interface BackupUtterance {
  seq: number;
  text: string;
  /** Token offsets as start,end pairs in UTF-16 code units of `text` (our own format, read by us). */
  tokens: number[];
  externalId?: string;
  /** Intent found in the file when no annotator layer received it. */
  intentHint?: string;
  meta: Record<string, string>;
  /** 1-based position of the batch in the backup's batch list. */
  batch?: number;
  line?: number;
}

export interface BackupLayer extends LayerContent {
  seq: number;
  annotator: string;
  batch?: number;
}

export interface BackupHistory {
  seq: number;
  annotator: string;
  before: LayerContent | null;
  after: LayerContent;
  who: string;
  when: number;
}

export interface BackupData {
  project: BackupProject;
  annotators: AnnotatorInfo[];
  /** Never a running import: a backup holds finished, failed or cancelled batches only. */
  batches: BatchInfo[];
  utterances: BackupUtterance[];
  layers: BackupLayer[];
  history: BackupHistory[];
}

export interface BackupHeader {
  format: typeof BACKUP_FORMAT;
  formatVersion: number;
  /** ISO 8601 time the backup was made. */
  created: string;
  /** Record counts, so a truncated file is detected rather than restored in part. */
  counts: { annotators: number; batches: number; utterances: number; layers: number; history: number };
}

export type BackupRecord =
  | ({ type: 'project' } & BackupProject)
  | ({ type: 'annotator' } & AnnotatorInfo)
  | ({ type: 'batch' } & BatchInfo)
  | ({ type: 'utterance' } & BackupUtterance)
  | ({ type: 'layer' } & BackupLayer)
  | ({ type: 'history' } & BackupHistory);

export type BackupDecodeResult = { ok: true; data: BackupData; warnings: ReadError[] } | { ok: false; errors: ReadError[] };
