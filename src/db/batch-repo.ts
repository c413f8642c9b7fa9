/**
 * Imports as batches: begin, append chunks (each one transaction: all of it or none), finish, or roll
 * back everything tagged with the batch. Big files stream in chunks so one huge transaction never
 * holds the whole file in memory; the batch id makes the chunks undoable as one.
 */
import Dexie from 'dexie';
import type { LayerStatus } from '../core/backup/model';
import type { ReadError, Utterance } from '../core/types';
import { annotatorEnsureIn } from './annotator-repo';
import { BatchStateError, dbWrite, InvalidInputError, RecordMissingError } from './errors';
import type { BatchRow, LayerRow, SlotsmithDb, UtteranceRow } from './schema';
import { tokensPack, tokensProblem } from './tokens';

export interface BatchBeginMeta {
  fileName: string;
  format: string;
  /** Annotator whose layers receive the file's tags and intents; none for text-only imports. */
  annotator?: string;
  /** Status of the imported layers; 'done' by default (labels from a file are finished work). */
  layerStatus?: LayerStatus;
}

export interface BatchChunk {
  utterances: readonly Utterance[];
  /** Overrides the batch's annotator for this chunk. */
  annotator?: string;
}

export interface BatchAppendResult {
  utteranceIds: number[];
  seqFirst: number;
}

export interface BatchRollbackReport {
  batchId: number;
  utterances: number;
  layers: number;
  history: number;
}

export async function batchBegin(db: SlotsmithDb, projectId: number, meta: BatchBeginMeta): Promise<number> {
  return dbWrite(db, [db.projects, db.annotators, db.batches], async () => {
    if ((await db.projects.get(projectId)) === undefined) throw new RecordMissingError('project', projectId);
    if (meta.annotator !== undefined) await annotatorEnsureIn(db, projectId, meta.annotator);
    const row: Omit<BatchRow, 'id'> = {
      projectId,
      fileName: meta.fileName,
      format: meta.format,
      counts: { utterances: 0, tokens: 0, layers: 0 },
      warnings: [],
      state: 'importing',
      created: db.clock(),
    };
    if (meta.annotator !== undefined) {
      row.annotator = meta.annotator;
      row.layerStatus = meta.layerStatus ?? 'done';
    }
    return db.batches.add(row);
  });
}

async function batchImporting(db: SlotsmithDb, batchId: number): Promise<BatchRow> {
  const batch = await db.batches.get(batchId);
  if (batch === undefined) throw new RecordMissingError('import batch', batchId);
  if (batch.state !== 'importing') throw new BatchStateError(`Import batch ${batchId} is ${batch.state}, no longer importing.`);
  return batch;
}

function chunkCheck(utterances: readonly Utterance[], withLayers: boolean): void {
  utterances.forEach((u, i) => {
    const where = `utterance ${i + 1} of the chunk${u.line === undefined ? '' : ` (file line ${u.line})`}`;
    const problem = tokensProblem(u.tokens, u.text.length);
    if (problem !== null) throw new InvalidInputError(`${where}: ${problem}`);
    if (withLayers && u.tags.length !== u.tokens.length) throw new InvalidInputError(`${where}: ${u.tags.length} tags for ${u.tokens.length} tokens`);
  });
}

function utteranceRow(u: Utterance, projectId: number, seq: number, batchId: number, withLayer: boolean): Omit<UtteranceRow, 'id'> {
  const row: Omit<UtteranceRow, 'id'> = { projectId, seq, text: u.text, tokens: tokensPack(u.tokens), meta: { ...u.meta }, source: { batchId } };
  if (u.line !== undefined) row.source.line = u.line;
  if (u.id !== undefined) row.externalId = u.id;
  if (!withLayer && u.intent !== undefined) row.intentHint = u.intent;
  return row;
}

/** Store one chunk: its utterances and, with an annotator, their layers with the tags exactly as given. */
export async function batchAppend(db: SlotsmithDb, batchId: number, chunk: BatchChunk): Promise<BatchAppendResult> {
  return dbWrite(db, [db.projects, db.annotators, db.batches, db.utterances, db.layers], async () => {
    const batch = await batchImporting(db, batchId);
    const { projectId } = batch;
    const annotator = chunk.annotator ?? batch.annotator;
    chunkCheck(chunk.utterances, annotator !== undefined);
    if (annotator !== undefined) await annotatorEnsureIn(db, projectId, annotator);
    const last = await db.utterances.where('[projectId+seq]').between([projectId, Dexie.minKey], [projectId, Dexie.maxKey]).last();
    const seqFirst = (last?.seq ?? 0) + 1;
    const rows = chunk.utterances.map((u, i) => utteranceRow(u, projectId, seqFirst + i, batchId, annotator !== undefined));
    const utteranceIds = await db.utterances.bulkAdd(rows as UtteranceRow[], { allKeys: true });
    let tokens = 0;
    for (const u of chunk.utterances) tokens += u.tokens.length;
    if (annotator !== undefined) {
      const now = db.clock();
      const status = batch.layerStatus ?? 'done';
      const layers = chunk.utterances.map(
        (u, i): LayerRow => ({
          utteranceId: utteranceIds[i] as number,
          annotator,
          projectId,
          tags: [...u.tags],
          intent: u.intent ?? null,
          status,
          note: '',
          revision: 1,
          updated: now,
          batchId,
        }),
      );
      await db.layers.bulkAdd(layers);
    }
    const c = batch.counts;
    const layers = annotator === undefined ? 0 : rows.length;
    await db.batches.update(batchId, { counts: { utterances: c.utterances + rows.length, tokens: c.tokens + tokens, layers: c.layers + layers } });
    return { utteranceIds, seqFirst };
  });
}

/**
 * Mark the batch done. `report.utterances` is what the reader handed over; it must equal what was
 * stored, so a lost chunk is caught here instead of leaving a silently short import.
 */
export async function batchFinish(db: SlotsmithDb, batchId: number, report: { utterances: number; warnings?: ReadError[] }): Promise<BatchRow> {
  return dbWrite(db, [db.projects, db.batches], async () => {
    const batch = await batchImporting(db, batchId);
    if (batch.counts.utterances !== report.utterances) {
      throw new BatchStateError(`Import batch ${batchId}: ${report.utterances} utterances were read but ${batch.counts.utterances} stored.`);
    }
    const now = db.clock();
    const done: BatchRow = { ...batch, state: 'done', finished: now, warnings: report.warnings ?? batch.warnings };
    await db.batches.put(done);
    await db.projects.update(batch.projectId, { updated: now });
    return done;
  });
}

/** Maximal runs of consecutive ids: one chunk's bulkAdd takes consecutive keys, so runs are few. */
export function idRuns(ids: readonly number[]): [number, number][] {
  const sorted = [...ids].sort((a, b) => a - b);
  const runs: [number, number][] = [];
  for (const id of sorted) {
    const run = runs[runs.length - 1];
    if (run !== undefined && run[1] + 1 === id) run[1] = id;
    else runs.push([id, id]);
  }
  return runs;
}

/**
 * Delete every utterance of the batch with all layers and history on them, in one transaction, and
 * mark it failed or cancelled. A finished import is refused: it may carry later work.
 */
export async function batchRollback(
  db: SlotsmithDb,
  batchId: number,
  outcome: { state?: 'failed' | 'cancelled'; failure?: string; onlyIfImporting?: boolean } = {},
): Promise<BatchRollbackReport> {
  const { minKey, maxKey } = Dexie;
  return dbWrite(db, [db.batches, db.utterances, db.layers, db.history], async () => {
    const batch = await db.batches.get(batchId);
    if (batch === undefined) throw new RecordMissingError('import batch', batchId);
    if (batch.state === 'done') throw new BatchStateError(`Import batch ${batchId} is finished; it is not rolled back.`);
    if (outcome.onlyIfImporting === true && batch.state !== 'importing') throw new BatchStateError(`Import batch ${batchId} already ended.`);
    const ids = (await db.utterances.where('source.batchId').equals(batchId).primaryKeys()) as number[];
    const report: BatchRollbackReport = { batchId, utterances: ids.length, layers: 0, history: 0 };
    for (const [lo, hi] of idRuns(ids)) {
      report.layers += await db.layers.where('[utteranceId+annotator]').between([lo, minKey], [hi, maxKey], true, true).delete();
      report.history += await db.history.where('[utteranceId+annotator]').between([lo, minKey], [hi, maxKey], true, true).delete();
    }
    await db.utterances.bulkDelete(ids);
    const state = batch.state === 'importing' ? (outcome.state ?? 'cancelled') : batch.state;
    const ended: BatchRow = { ...batch, state, finished: db.clock() };
    const failure = outcome.failure ?? batch.failure;
    if (failure !== undefined) ended.failure = failure;
    await db.batches.put(ended);
    return report;
  });
}
