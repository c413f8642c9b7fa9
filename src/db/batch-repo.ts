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
import type { BatchRow, LayerKey, LayerRow, SlotsmithDb, UtteranceRow } from './schema';
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
  /**
   * 'external-id': an utterance whose id an earlier batch of the project already stored, with the
   * same text and token offsets, only gets this annotator's layer on that row. A different text or
   * token grid, several rows with the id, or a layer of this annotator already there is an error
   * (refused rather than overwritten: the stored layer may hold edits). Utterances of this same
   * batch are never targets, so a file repeating an id imports as before. Needs an annotator.
   */
  attach?: 'external-id';
}

export interface BatchAppendResult {
  /** One per chunk utterance, in order: the new row or the existing row the layer went to. */
  utteranceIds: number[];
  seqFirst: number;
  /** How many of the chunk went to existing rows. */
  attached: number;
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

function tokensSame(a: Int32Array, b: Int32Array): boolean {
  return a.length === b.length && a.every((v, i) => v === b[i]);
}

/** For each chunk utterance, the existing row it attaches to (or undefined for a new row). */
async function attachTargets(db: SlotsmithDb, projectId: number, batchId: number, annotator: string, utterances: readonly Utterance[]): Promise<(UtteranceRow | undefined)[]> {
  const ids = [...new Set(utterances.map((u) => u.id).filter((id): id is string => id !== undefined))];
  if (ids.length === 0) return utterances.map(() => undefined);
  const found = await db.utterances.where('[projectId+externalId]').anyOf(ids.map((id) => [projectId, id])).toArray();
  const byId = new Map<string, UtteranceRow[]>();
  for (const row of found) {
    if (row.source.batchId === batchId || row.externalId === undefined) continue;
    byId.set(row.externalId, [...(byId.get(row.externalId) ?? []), row]);
  }
  const targets = utterances.map((u, i) => {
    const rows = u.id === undefined ? undefined : byId.get(u.id);
    if (rows === undefined) return undefined;
    const where = `utterance ${i + 1} of the chunk${u.line === undefined ? '' : ` (file line ${u.line})`}, id ${JSON.stringify(u.id)}`;
    if (rows.length > 1) throw new InvalidInputError(`${where}: ${rows.length} stored utterances carry this id; cannot tell which one to label.`);
    const row = rows[0] as UtteranceRow;
    if (row.text !== u.text) throw new InvalidInputError(`${where}: the stored text ${JSON.stringify(row.text)} differs from the file's ${JSON.stringify(u.text)}.`);
    if (!tokensSame(row.tokens, tokensPack(u.tokens))) throw new InvalidInputError(`${where}: same text ${JSON.stringify(u.text)} but different tokens than the stored utterance.`);
    return row;
  });
  const seen = new Set<number>();
  targets.forEach((row, i) => {
    if (row === undefined) return;
    if (seen.has(row.id)) throw new InvalidInputError(`id ${JSON.stringify(utterances[i]?.id)} appears twice in the chunk; one annotator gives one layer per utterance.`);
    seen.add(row.id);
  });
  const keys = targets.flatMap((row) => (row === undefined ? [] : [[row.id, annotator] as LayerKey]));
  const existing = await db.layers.bulkGet(keys);
  const taken = existing.findIndex((layer) => layer !== undefined);
  if (taken >= 0) {
    const row = targets.filter((t) => t !== undefined)[taken] as UtteranceRow;
    throw new InvalidInputError(`id ${JSON.stringify(row.externalId)}: the stored utterance already has a layer by ${JSON.stringify(annotator)}; it is not overwritten.`);
  }
  return targets;
}

/** Store one chunk: its utterances and, with an annotator, their layers with the tags exactly as given. */
export async function batchAppend(db: SlotsmithDb, batchId: number, chunk: BatchChunk): Promise<BatchAppendResult> {
  return dbWrite(db, [db.projects, db.annotators, db.batches, db.utterances, db.layers], async () => {
    const batch = await batchImporting(db, batchId);
    const { projectId } = batch;
    const annotator = chunk.annotator ?? batch.annotator;
    chunkCheck(chunk.utterances, annotator !== undefined);
    if (chunk.attach !== undefined && annotator === undefined) throw new InvalidInputError('Attaching to existing utterances needs an annotator: there is no layer to attach.');
    if (annotator !== undefined) await annotatorEnsureIn(db, projectId, annotator);
    const targets = chunk.attach === 'external-id' && annotator !== undefined ? await attachTargets(db, projectId, batchId, annotator, chunk.utterances) : chunk.utterances.map(() => undefined);
    const fresh = chunk.utterances.filter((_, i) => targets[i] === undefined);
    const last = await db.utterances.where('[projectId+seq]').between([projectId, Dexie.minKey], [projectId, Dexie.maxKey]).last();
    const seqFirst = (last?.seq ?? 0) + 1;
    const rows = fresh.map((u, i) => utteranceRow(u, projectId, seqFirst + i, batchId, annotator !== undefined));
    const freshIds = await db.utterances.bulkAdd(rows as UtteranceRow[], { allKeys: true });
    let next = 0;
    const utteranceIds = targets.map((row) => row?.id ?? (freshIds[next++] as number));
    let tokens = 0;
    for (const u of fresh) tokens += u.tokens.length;
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
    const attached = chunk.utterances.length - rows.length;
    const layers = annotator === undefined ? 0 : chunk.utterances.length;
    const update: Partial<BatchRow> = { counts: { utterances: c.utterances + rows.length, tokens: c.tokens + tokens, layers: c.layers + layers } };
    if (attached > 0) update.attached = (batch.attached ?? 0) + attached;
    await db.batches.update(batchId, update);
    return { utteranceIds, seqFirst, attached };
  });
}

/**
 * Mark the batch done. `report.utterances` is what the reader handed over; it must equal what was
 * stored (new rows plus attached ones), so a lost chunk is caught here instead of a silently short import.
 */
export async function batchFinish(db: SlotsmithDb, batchId: number, report: { utterances: number; warnings?: ReadError[] }): Promise<BatchRow> {
  return dbWrite(db, [db.projects, db.batches], async () => {
    const batch = await batchImporting(db, batchId);
    const stored = batch.counts.utterances + (batch.attached ?? 0);
    if (stored !== report.utterances) {
      throw new BatchStateError(`Import batch ${batchId}: ${report.utterances} utterances were read but ${stored} stored.`);
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
 * Delete every utterance of the batch with all layers and history on them, and the layers it attached
 * to older utterances (with their history; the older rows stay), in one transaction, and mark it
 * failed or cancelled. A finished import is refused: it may carry later work.
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
    const attachedKeys = (await db.layers.where('batchId').equals(batchId).primaryKeys()) as LayerKey[];
    for (const key of attachedKeys) report.history += await db.history.where('[utteranceId+annotator]').equals(key).delete();
    await db.layers.bulkDelete(attachedKeys);
    report.layers += attachedKeys.length;
    const state = batch.state === 'importing' ? (outcome.state ?? 'cancelled') : batch.state;
    const ended: BatchRow = { ...batch, state, finished: db.clock() };
    const failure = outcome.failure ?? batch.failure;
    if (failure !== undefined) ended.failure = failure;
    await db.batches.put(ended);
    return report;
  });
}
