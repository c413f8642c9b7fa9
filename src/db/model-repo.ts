/**
 * The project's tagger: the model file (src/core/crf/model-file.ts) lives in an extra `model` field
 * of the project row, as exchange-repo keeps `exchange`: IndexedDB stores unindexed fields as they
 * come, so no schema version is needed. Pre-labels go to the reserved `model` layer, whose note
 * holds the least confidence of the best path as decimal text, so a queue can sort by it later.
 */
import Dexie from 'dexie';
import { ANNOTATOR_GOLD, ANNOTATOR_MODEL, type LayerStatus } from '../core/backup/model';
import type { CrfSequence, CrossValidation } from '../core/crf';
import { crfSequenceFromUtterance } from '../core/crf';
import { tagsConvert } from '../core/schemes';
import type { Scheme } from '../core/types';
import { dbWrite, RecordMissingError } from './errors';
import { layerSave } from './layer-repo';
import type { LayerKey, LayerRow, ProjectRow, SlotsmithDb, UtteranceRow } from './schema';
import { tokensUnpack } from './tokens';

export interface StoredModel {
  /** The model file text, exactly as trained or loaded. */
  json: string;
  saved: number;
  origin: 'trained' | 'file';
  /** The cross-validation run before training, when there was one. */
  crossValidation: CrossValidation | null;
}

type ModelProjectRow = ProjectRow & { model?: StoredModel };

export async function projectModel(db: SlotsmithDb, projectId: number): Promise<StoredModel | null> {
  const row = (await db.projects.get(projectId)) as ModelProjectRow | undefined;
  if (row === undefined) throw new RecordMissingError('project', projectId);
  return row.model ?? null;
}

/** Store (or, with null, forget) the project's model; one transaction re-reads the row so no other field is lost. */
export async function projectModelSave(db: SlotsmithDb, projectId: number, model: Omit<StoredModel, 'saved'> | null): Promise<StoredModel | null> {
  return dbWrite(db, [db.projects], async () => {
    const row = (await db.projects.get(projectId)) as ModelProjectRow | undefined;
    if (row === undefined) throw new RecordMissingError('project', projectId);
    const { model: _old, ...rest } = row;
    const stored = model === null ? null : { ...model, saved: db.clock() };
    await db.projects.put((stored === null ? rest : { ...rest, model: stored }) as ModelProjectRow);
    return stored;
  });
}

async function projectUtterances(db: SlotsmithDb, projectId: number): Promise<UtteranceRow[]> {
  return db.utterances.where('[projectId+seq]').between([projectId, Dexie.minKey], [projectId, Dexie.maxKey]).toArray();
}

async function projectLayers(db: SlotsmithDb, projectId: number): Promise<LayerRow[]> {
  return db.layers.where('[projectId+annotator+status]').between([projectId, Dexie.minKey, Dexie.minKey], [projectId, Dexie.maxKey, Dexie.maxKey], true, true).toArray();
}

export interface TrainingSet {
  sequences: CrfSequence[];
  /** Ids of the utterances used, in project order (one sequence each). */
  utteranceIds: number[];
  fromGold: number;
  fromDone: number;
}

/**
 * One sequence per utterance: its gold layer when it has one, else the done layer of the
 * alphabetically first annotator (a fixed choice, so training repeats); the model layer never counts.
 */
export async function modelTrainingSet(db: SlotsmithDb, projectId: number): Promise<TrainingSet> {
  const utterances = await projectUtterances(db, projectId);
  const chosen = new Map<number, LayerRow>();
  for (const layer of await projectLayers(db, projectId)) {
    if (layer.annotator === ANNOTATOR_MODEL) continue;
    const isGold = layer.annotator === ANNOTATOR_GOLD;
    if (!isGold && layer.status !== 'done') continue;
    const held = chosen.get(layer.utteranceId);
    const heldGold = held?.annotator === ANNOTATOR_GOLD;
    if (held === undefined || (isGold && !heldGold) || (!heldGold && !isGold && layer.annotator < held.annotator)) chosen.set(layer.utteranceId, layer);
  }
  const set: TrainingSet = { sequences: [], utteranceIds: [], fromGold: 0, fromDone: 0 };
  for (const u of utterances) {
    const layer = chosen.get(u.id);
    if (layer === undefined) continue;
    const tokens = tokensUnpack(u.tokens);
    if (tokens.length === 0 || layer.tags.length !== tokens.length) continue;
    set.sequences.push(crfSequenceFromUtterance({ text: u.text, tokens, tags: layer.tags }));
    set.utteranceIds.push(u.id);
    if (layer.annotator === ANNOTATOR_GOLD) set.fromGold++;
    else set.fromDone++;
  }
  return set;
}

const LABELLED: readonly LayerStatus[] = ['done', 'draft'];

export interface UnlabelledUtterance {
  id: number;
  words: string[];
}

/** Utterances with no done or draft layer of anyone (the model's own layer aside), in project order. */
export async function modelUnlabelled(db: SlotsmithDb, projectId: number): Promise<UnlabelledUtterance[]> {
  const labelled = new Set<number>();
  for (const layer of await projectLayers(db, projectId)) {
    if (layer.annotator !== ANNOTATOR_MODEL && LABELLED.includes(layer.status)) labelled.add(layer.utteranceId);
  }
  const out: UnlabelledUtterance[] = [];
  for (const u of await projectUtterances(db, projectId)) {
    if (labelled.has(u.id)) continue;
    const words = tokensUnpack(u.tokens).map((t) => u.text.slice(t.start, t.end));
    if (words.length > 0) out.push({ id: u.id, words });
  }
  return out;
}

export interface ModelSuggestion {
  utteranceId: number;
  /** IOB2, as the tagger emits them; stored in the project's scheme. */
  tags: string[];
  leastConfidence: number;
}

/** Least confidence as stored in the note: plain decimal text, `Number(note)` reads it back. */
export function leastConfidenceNote(value: number): string {
  return String(Math.round(value * 1e6) / 1e6);
}

export function leastConfidenceFromNote(note: string): number | null {
  const value = note.trim() === '' ? NaN : Number(note);
  return Number.isFinite(value) ? value : null;
}

/**
 * Write suggestions into the `model` layer through the ordinary layer save (history included), as
 * drafts, so they never count as anyone's finished work. `who` goes into the history rows.
 */
export async function modelLayersWrite(db: SlotsmithDb, scheme: Scheme, suggestions: readonly ModelSuggestion[], who: string = ANNOTATOR_MODEL): Promise<number> {
  const stored = await db.layers.bulkGet(suggestions.map((s): LayerKey => [s.utteranceId, ANNOTATOR_MODEL]));
  let written = 0;
  for (const [i, s] of suggestions.entries()) {
    const change = { tags: tagsConvert(s.tags, scheme), status: 'draft' as const, note: leastConfidenceNote(s.leastConfidence) };
    await layerSave(db, [s.utteranceId, ANNOTATOR_MODEL], change, { expectedRevision: stored[i]?.revision ?? 0, who });
    written++;
  }
  return written;
}

export interface QueueEntry {
  utteranceId: number;
  seq: number;
  text: string;
  leastConfidence: number;
}

/** Model layers of the project, most uncertain first (ties: project order); `limit` of them. */
export async function modelQueue(db: SlotsmithDb, projectId: number, limit = 20): Promise<{ total: number; top: QueueEntry[] }> {
  const layers = await db.layers.where('[projectId+annotator+status]').between([projectId, ANNOTATOR_MODEL, Dexie.minKey], [projectId, ANNOTATOR_MODEL, Dexie.maxKey], true, true).toArray();
  const scored = layers.map((l) => ({ utteranceId: l.utteranceId, leastConfidence: leastConfidenceFromNote(l.note) ?? 0 }));
  const rows = new Map((await db.utterances.bulkGet(scored.map((s) => s.utteranceId))).filter((r): r is UtteranceRow => r !== undefined).map((r) => [r.id, r]));
  const entries = scored.flatMap((s) => {
    const row = rows.get(s.utteranceId);
    return row === undefined ? [] : [{ ...s, seq: row.seq, text: row.text }];
  });
  entries.sort((a, b) => b.leastConfidence - a.leastConfidence || a.seq - b.seq);
  return { total: layers.length, top: entries.slice(0, limit) };
}
