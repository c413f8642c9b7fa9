/**
 * The two phases of an import over any database instance (the worker's own, or fake-indexeddb in
 * tests): `importPreview` reads the file and reports; `importCommit` reads it again and stores it in
 * chunks under one batch, rolled back on cancel or error so nothing partial remains.
 */
import type { IntentDef, ProjectSchema, SlotDef } from '../core/backup/model';
import type { Utterance } from '../core/types';
import {
  BATCH_BEGIN_LOCK,
  batchBegin,
  batchAppend,
  batchFinish,
  batchLockName,
  batchRollback,
  projectGet,
  projectSchemaSet,
  RecordMissingError,
  type BatchBeginMeta,
  type BatchRow,
  type ProjectRow,
  type SlotsmithDb,
} from '../db';
import { CorpusIndexImport } from '../db/corpus-index-import';
import type { CorpusIndexStore } from '../db/corpus-index-store';
import { LayerCopyImport } from '../db/layer-copy-import';
import type { LayerCopyStore } from '../db/layer-copy-store';
import { PreviewCollector, type ImportPreview } from './import-preview';
import { copiesPatch } from './layer-copies';
import { fileStreamRead, formatHasLabels, ImportCancelledError, importReaderCreate, type ImportFileOptions } from './import-read';

/** Utterances per stored chunk: big enough that transactions are few, small enough to keep memory flat. */
export const IMPORT_CHUNK_UTTERANCES = 2000;

export interface ImportRequest extends ImportFileOptions {
  projectId: number;
  fileName: string;
  /** Whose layer receives the file's labels; required for formats with labels. */
  annotator?: string;
}

export interface CommitRequest extends ImportRequest {
  /** Utterances the preview counted, for the progress bar. */
  total: number;
  /** Labels to add to the project's schema along with the data. */
  labelsAdd?: { slots: string[]; intents: string[] };
}

export interface ImportProgress {
  phase: 'reading' | 'storing';
  done: number;
  total: number;
}

export interface ImportControl {
  cancelled?: () => boolean;
  onProgress?: (progress: ImportProgress) => void;
  /** Runs `work` while holding the named exclusive lock (Web Locks in the browser). */
  lock?: <T>(name: string, work: () => Promise<T>) => Promise<T>;
  /** Where the utterance table's index made during an import into an empty project is saved (none: not made). */
  indexStore?: CorpusIndexStore;
  /** Where the layer copies made or signed again by the import are saved (none: not made). */
  copyStore?: LayerCopyStore;
}

export interface ImportSummary {
  batchId: number;
  utterances: number;
  tokens: number;
  layers: number;
  /** Utterances that matched an existing one by id (same text and tokens) and only got a layer. */
  attached: number;
  annotator: string | null;
  labelsAdded: { slots: string[]; intents: string[] };
}

/** Malformed input stores nothing: the preview lists the lines, and the commit refuses the file. */
export class ImportRefusedError extends Error {
  override name = 'ImportRefusedError';
}

async function projectLoad(db: SlotsmithDb, projectId: number): Promise<ProjectRow> {
  const project = await projectGet(db, projectId);
  if (project === undefined) throw new RecordMissingError('project', projectId);
  return project;
}

function readerSettings(request: ImportFileOptions, project: ProjectRow) {
  return { ...request, tokeniser: project.tokeniser, projectScheme: project.scheme };
}

export async function importPreview(db: SlotsmithDb, file: Blob, request: ImportRequest, control: ImportControl = {}): Promise<ImportPreview> {
  const project = await projectLoad(db, request.projectId);
  const known = { slots: project.schema.slots.map((s) => s.name), intents: project.schema.intents.map((i) => i.name) };
  const collector = new PreviewCollector(request.fileName, request.format, request.format === 'columns' ? request.scheme : (request.scheme ?? project.scheme), known);
  const reader = importReaderCreate(readerSettings(request, project), (u) => collector.add(u));
  const hooks = {
    afterChunk: (bytes: number) => control.onProgress?.({ phase: 'reading', done: bytes, total: file.size }),
    ...(control.cancelled === undefined ? {} : { cancelled: control.cancelled }),
  };
  const document = await fileStreamRead(file, reader, hooks);
  return collector.finish(document.errors, document.scheme);
}

/** The project's schema with the given labels appended (names already there are skipped). */
export function schemaWithLabels(schema: ProjectSchema, labels: { slots: readonly string[]; intents: readonly string[] }): ProjectSchema {
  const slotNames = new Set(schema.slots.map((s) => s.name));
  const intentNames = new Set(schema.intents.map((i) => i.name));
  const slots: SlotDef[] = labels.slots.filter((n) => !slotNames.has(n)).map((name) => ({ name }));
  const intents: IntentDef[] = labels.intents.filter((n) => !intentNames.has(n)).map((name) => ({ name }));
  return { slots: [...schema.slots, ...slots], intents: [...schema.intents, ...intents] };
}

const lockNone = <T>(_name: string, work: () => Promise<T>): Promise<T> => work();

type Lock = NonNullable<ImportControl['lock']>;

/**
 * Create the batch row and run `work` under the batch's own lock, holding BATCH_BEGIN_LOCK from
 * before the row exists until the batch lock is granted, so a cleanup never sees the row unlocked.
 */
export async function batchLocked<T>(lock: Lock, begin: () => Promise<number>, work: (batchId: number) => Promise<T>): Promise<T> {
  let running: Promise<T> | undefined;
  await lock(BATCH_BEGIN_LOCK, async () => {
    const batchId = await begin();
    await new Promise<void>((granted, failed) => {
      running = lock(batchLockName(batchId), () => {
        granted();
        return work(batchId);
      });
      // A lock request refused outright never grants: let go of the begin lock all the same.
      running.catch(failed);
    });
  });
  return running as Promise<T>;
}

/** Save the index the import made, when it still fits the project; awaited, so a visit right after finds it. */
async function indexSave(db: SlotsmithDb, index: CorpusIndexImport | null, batch: BatchRow, store: CorpusIndexStore | undefined): Promise<void> {
  if (index === null || store === undefined) return;
  try {
    const made = await index.finish(db, batch);
    if (made !== null) await store.save(made);
  } catch {
    // Only a cache: the table builds the index itself then.
  }
}

/** Save the layer copies the import made or carried over, when they still fit the project; awaited like the index. */
async function copiesSave(db: SlotsmithDb, copies: LayerCopyImport | null, batch: BatchRow, store: LayerCopyStore | undefined): Promise<void> {
  if (copies === null || store === undefined) return;
  try {
    await store.save(await copies.finish(db, batch));
  } catch {
    // Only a cache: the dashboard reads the layers itself then.
  }
}

export async function importCommit(db: SlotsmithDb, file: Blob, request: CommitRequest, control: ImportControl = {}): Promise<ImportSummary> {
  const project = await projectLoad(db, request.projectId);
  const withLabels = formatHasLabels(request.format);
  if (withLabels && (request.annotator === undefined || request.annotator.trim() === '')) {
    throw new ImportRefusedError('Name the annotator whose labels these are.');
  }
  const meta: BatchBeginMeta = { fileName: request.fileName, format: request.format };
  if (withLabels && request.annotator !== undefined) meta.annotator = request.annotator.trim();
  const lock = control.lock ?? lockNone;
  const cancelled = control.cancelled ?? (() => false);
  const labelsAdded = { slots: [...(request.labelsAdd?.slots ?? [])], intents: [...(request.labelsAdd?.intents ?? [])] };
  const labelsAny = labelsAdded.slots.length + labelsAdded.intents.length > 0;
  let index: CorpusIndexImport | null = null;
  let copies: LayerCopyImport | null = null;
  const schemaFinal = (schema: ProjectSchema) => (labelsAny ? schemaWithLabels(schema, labelsAdded) : schema);
  const begin = async () => {
    // Looked at right before the batch exists: the index is made only when the import is all the project holds.
    if (control.indexStore !== undefined) {
      index = await CorpusIndexImport.start(db, request.projectId, { schemaFinal }).catch(() => null);
    }
    // Likewise the project's signature and the copies that match it, for the copies the import leaves.
    if (control.copyStore !== undefined) {
      const settings = meta.annotator === undefined ? { schemaFinal, patch: copiesPatch } : { schemaFinal, patch: copiesPatch, annotator: meta.annotator };
      copies = await LayerCopyImport.start(db, control.copyStore, request.projectId, settings).catch(() => null);
    }
    return batchBegin(db, request.projectId, meta);
  };
  // The batch lock tells other tabs' start-up cleanup that this batch is alive, for as long as it runs.
  return batchLocked(lock, begin, async (batchId) => {
    const batchRow = index === null && copies === null ? undefined : await db.batches.get(batchId);
    copies?.statusSet(batchRow?.layerStatus);
    let pending: Utterance[] = [];
    let read = 0;
    let stored = 0;
    let tokens = 0;
    /** Store pending utterances in chunks of at most IMPORT_CHUNK_UTTERANCES, checking for cancel between them. */
    const flush = async (all: boolean) => {
      // A stream chunk may hold tens of thousands of utterances; one transaction per slice keeps cancel and progress prompt.
      let from = 0;
      while (pending.length - from >= (all ? 1 : IMPORT_CHUNK_UTTERANCES)) {
        if (cancelled()) throw new ImportCancelledError();
        const chunk = pending.slice(from, from + IMPORT_CHUNK_UTTERANCES);
        from += chunk.length;
        // Labelled files attach by id, so a second annotator's file of the same utterances adds layers, not rows.
        const appended = await batchAppend(db, batchId, meta.annotator === undefined ? { utterances: chunk } : { utterances: chunk, attach: 'external-id' });
        if (batchRow !== undefined) index?.chunkAdd(batchRow, { utterances: chunk, ...appended });
        if (copies?.building === true && meta.annotator !== undefined) {
          // batchAppend stamps a chunk's layers with one clock reading: one layer tells it.
          const first = appended.utteranceIds[0];
          const layer = first === undefined ? undefined : await db.layers.get([first, meta.annotator]);
          copies.chunkAdd({ utterances: chunk, utteranceIds: appended.utteranceIds, updated: layer?.updated });
        }
        stored += chunk.length;
        control.onProgress?.({ phase: 'storing', done: stored, total: Math.max(request.total, stored) });
      }
      pending = pending.slice(from);
    };
    try {
      const reader = importReaderCreate(readerSettings(request, project), (u) => {
        read++;
        tokens += u.tokens.length;
        pending.push(u);
      });
      const document = await fileStreamRead(file, reader, {
        cancelled,
        afterChunk: () => flush(false),
      });
      if (document.errors.length > 0) {
        const first = document.errors[0];
        throw new ImportRefusedError(`The file has ${document.errors.length} malformed line(s) (first: line ${first?.line}: ${first?.message}); nothing was stored.`);
      }
      await flush(true);
      if (cancelled()) throw new ImportCancelledError();
      if (labelsAny) {
        const current = await projectLoad(db, request.projectId);
        await projectSchemaSet(db, request.projectId, schemaWithLabels(current.schema, labelsAdded));
      }
      const done = await batchFinish(db, batchId, { utterances: read });
      await indexSave(db, index, done, control.indexStore);
      await copiesSave(db, copies, done, control.copyStore);
      return { batchId, utterances: stored, tokens, layers: done.counts.layers, attached: done.attached ?? 0, annotator: meta.annotator ?? null, labelsAdded };
    } catch (error) {
      index?.abandon();
      copies?.abandon();
      const isCancel = error instanceof ImportCancelledError;
      await batchRollback(db, batchId, { state: isCancel ? 'cancelled' : 'failed', failure: (error as Error).message });
      throw error;
    }
  });
}
