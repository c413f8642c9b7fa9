/**
 * Team work without a server: packs out, layer files back (formats in src/core/exchange). Exchange
 * facts live in an extra `exchange` field of the project row: IndexedDB stores unindexed fields as
 * they come, so no schema version is needed. Hashing (Web Crypto) is awaited before a transaction
 * starts, never inside one: IndexedDB commits a transaction as soon as it waits on anything else.
 */
import Dexie from 'dexie';
import { ANNOTATOR_MODEL, type LayerContent, type LayerStatus } from '../core/backup/model';
import {
  layersRead,
  layersWrite,
  mergePlan,
  packRead,
  packWrite,
  uidRandom,
  type ExchangeProblem,
  type LayerRecord,
  type MergeAction,
  type MergeUtterance,
  type PackUtterance,
} from '../core/exchange';
import { arrayShuffle, randomMulberry32 } from '../core/export/random';
import { annotatorEnsureIn } from './annotator-repo';
import { dbWrite, RecordMissingError } from './errors';
import type { HistoryRow, LayerKey, ProjectRow, SlotsmithDb, UtteranceRow } from './schema';
import { tokensCount, tokensPack } from './tokens';

export interface PackEntry {
  /** The pack's `bodySha256`. */
  id: string;
  annotator: string;
  created: number;
  seqs: number[];
}

export interface ProjectExchange {
  /** The fingerprint shared by the master and every copy opened from its packs. */
  uid: string;
  /** master: packs were made here; copy: made by opening packs. */
  role: 'master' | 'copy';
  /** The master project's name, which hand-backs carry (a copy's own name may differ). */
  name?: string;
  packs: PackEntry[];
}

type ExchangeRow = ProjectRow & { exchange?: ProjectExchange };

export async function projectExchange(db: SlotsmithDb, projectId: number): Promise<ProjectExchange | null> {
  const row = (await db.projects.get(projectId)) as ExchangeRow | undefined;
  if (row === undefined) throw new RecordMissingError('project', projectId);
  return row.exchange ?? null;
}

/** Utterance choice for packs: an optional layer filter, then an optional seeded sample. */
export interface ExchangeChoice {
  annotator?: string;
  /** With `annotator`: that annotator's layer status; 'none' = no layer of theirs. Alone: any layer's status; 'none' = no layer at all. */
  status?: LayerStatus | 'none';
  sample?: { size: number; seed: number };
}

async function seqIds(db: SlotsmithDb, projectId: number): Promise<{ seqs: number[]; ids: number[] }> {
  const range = db.utterances.where('[projectId+seq]').between([projectId, Dexie.minKey], [projectId, Dexie.maxKey]);
  const keys = (await range.keys()) as unknown as [number, number][];
  const ids = (await range.primaryKeys()) as number[];
  return { seqs: keys.map((k) => k[1]), ids };
}

async function layerUtteranceIds(db: SlotsmithDb, projectId: number, annotator: string | undefined, status: LayerStatus | undefined): Promise<Set<number>> {
  const { minKey, maxKey } = Dexie;
  const index = db.layers.where('[projectId+annotator+status]');
  if (annotator !== undefined) {
    const keys = (await index.between([projectId, annotator, status ?? minKey], [projectId, annotator, status ?? maxKey], true, true).primaryKeys()) as unknown as LayerKey[];
    return new Set(keys.map((k) => k[0]));
  }
  // Any annotator: the index orders by annotator before status, so one range cannot pick a status.
  const all = index.between([projectId, minKey, minKey], [projectId, maxKey, maxKey], true, true);
  if (status === undefined) return new Set(((await all.primaryKeys()) as unknown as LayerKey[]).map((k) => k[0]));
  return new Set((await all.filter((l) => l.status === status).toArray()).map((l) => l.utteranceId));
}

/** Seqs of the chosen utterances, in project order. A sample uses mulberry32 (Fisher–Yates), so a seed repeats it. */
export async function exchangeChoose(db: SlotsmithDb, projectId: number, choice: ExchangeChoice = {}): Promise<number[]> {
  const { seqs, ids } = await seqIds(db, projectId);
  let chosen = seqs.map((seq, i) => ({ seq, id: ids[i] as number }));
  if (choice.annotator !== undefined || choice.status !== undefined) {
    const none = choice.status === 'none';
    const having = await layerUtteranceIds(db, projectId, choice.annotator, choice.status === 'none' ? undefined : choice.status);
    chosen = chosen.filter((u) => having.has(u.id) !== none);
  }
  if (choice.sample !== undefined && choice.sample.size < chosen.length) {
    chosen = arrayShuffle([...chosen], randomMulberry32(choice.sample.seed)).slice(0, Math.max(0, choice.sample.size));
    chosen.sort((a, b) => a.seq - b.seq);
  }
  return chosen.map((u) => u.seq);
}

async function utterancesBySeq(db: SlotsmithDb, projectId: number, seqs: readonly number[]): Promise<Map<number, UtteranceRow>> {
  const rows = await db.utterances.where('[projectId+seq]').anyOf(seqs.map((s) => [projectId, s])).toArray();
  return new Map(rows.map((r) => [r.seq, r]));
}

/** The project's fingerprint, made (and stored as master) the first time it is needed. */
export async function projectExchangeEnsure(db: SlotsmithDb, projectId: number): Promise<ProjectExchange> {
  return dbWrite(db, [db.projects], async () => {
    const row = (await db.projects.get(projectId)) as ExchangeRow | undefined;
    if (row === undefined) throw new RecordMissingError('project', projectId);
    if (row.exchange !== undefined) return row.exchange;
    const exchange: ProjectExchange = { uid: uidRandom(), role: 'master', packs: [] };
    await db.projects.put({ ...row, exchange } as ExchangeRow);
    return exchange;
  });
}

export interface PackMade {
  annotator: string;
  id: string;
  count: number;
  text: string;
}

export interface PacksMakeOptions {
  /** Copy this layer (e.g. `model`) into the packs as suggestions, where it exists. */
  suggestionsFrom?: string;
  names?: Record<string, string>;
}

/** One pack per annotator from `assignment` (annotator → seqs); each is recorded on the project for progress. */
export async function packsMake(db: SlotsmithDb, projectId: number, assignment: ReadonlyMap<string, readonly number[]>, options: PacksMakeOptions = {}): Promise<PackMade[]> {
  const exchange = await projectExchangeEnsure(db, projectId);
  const project = (await db.projects.get(projectId)) as ExchangeRow;
  const now = db.clock();
  const made: PackMade[] = [];
  for (const [annotator, seqs] of assignment) {
    const rows = await utterancesBySeq(db, projectId, seqs);
    const ordered = [...seqs].sort((a, b) => a - b).map((s) => rows.get(s)).filter((r): r is UtteranceRow => r !== undefined);
    const suggestions = options.suggestionsFrom === undefined ? [] : await db.layers.bulkGet(ordered.map((r): LayerKey => [r.id, options.suggestionsFrom as string]));
    const utterances = ordered.map((r, i): PackUtterance => {
      const u: PackUtterance = { seq: r.seq, text: r.text, tokens: Array.from(r.tokens), meta: r.meta };
      if (r.externalId !== undefined) u.externalId = r.externalId;
      const s = suggestions[i];
      if (s !== undefined) u.suggestion = { tags: s.tags, intent: s.intent };
      return u;
    });
    const { name, created, updated, tokeniser, scheme, schema } = project;
    const text = await packWrite({
      created: new Date(now).toISOString(),
      project: { uid: exchange.uid, name },
      annotator: { id: annotator, name: options.names?.[annotator] ?? annotator },
      setup: { name, created, updated, tokeniser, scheme, schema },
      ...(options.suggestionsFrom !== undefined && { suggestionsFrom: options.suggestionsFrom }),
      utterances,
    });
    const id = JSON.parse(text.slice(0, text.indexOf('\n'))).bodySha256 as string;
    made.push({ annotator, id, count: utterances.length, text });
  }
  await dbWrite(db, [db.projects], async () => {
    const row = (await db.projects.get(projectId)) as ExchangeRow;
    const packs = [...(row.exchange?.packs ?? exchange.packs)];
    for (const m of made) {
      const entry: PackEntry = { id: m.id, annotator: m.annotator, created: now, seqs: [...(assignment.get(m.annotator) ?? [])].sort((a, b) => a - b) };
      const at = packs.findIndex((p) => p.id === m.id && p.annotator === m.annotator);
      if (at === -1) packs.push(entry);
      else packs[at] = entry;
    }
    await db.projects.put({ ...row, exchange: { ...(row.exchange ?? exchange), packs } } as ExchangeRow);
  });
  return made;
}

export type PackOpenOutcome =
  | { ok: true; projectId: number; name: string; annotator: string; created: boolean; added: number; count: number }
  | { ok: false; errors: ExchangeProblem[] };

function sameUtterance(row: UtteranceRow, u: PackUtterance): boolean {
  return row.text === u.text && row.externalId === u.externalId && row.tokens.length === u.tokens.length && u.tokens.every((t, i) => row.tokens[i] === t);
}

/**
 * Open a pack: a new project with its utterances and schema, or the project of the same fingerprint
 * already here, which gets the utterances it lacks and the pack's schema. One transaction.
 */
export async function packOpen(db: SlotsmithDb, text: string): Promise<PackOpenOutcome> {
  const read = await packRead(text);
  if (!read.ok) return read;
  const { header, utterances } = read.file;
  return dbWrite(db, [db.projects, db.utterances, db.layers, db.annotators, db.history], async (): Promise<PackOpenOutcome> => {
    const projects = (await db.projects.toArray()) as ExchangeRow[];
    const existing = projects.find((p) => p.exchange?.uid === header.project.uid);
    const now = db.clock();
    let row: ExchangeRow;
    if (existing === undefined) {
      const name = `${header.project.name} (pack for ${header.annotator.name})`;
      const fresh: Omit<ExchangeRow, 'id'> = { ...header.setup, name, created: now, updated: now, exchange: { uid: header.project.uid, role: 'copy', name: header.project.name, packs: [] } };
      row = { ...fresh, id: await db.projects.add(fresh as ExchangeRow) } as ExchangeRow;
    } else {
      row = existing;
      if (row.exchange?.role === 'copy') row = { ...row, schema: header.setup.schema, updated: now };
    }
    const stored = await utterancesBySeq(db, row.id, utterances.map((u) => u.seq));
    const clash = utterances.find((u) => stored.has(u.seq) && !sameUtterance(stored.get(u.seq) as UtteranceRow, u));
    if (clash !== undefined) {
      const line = utterances.indexOf(clash) + 2;
      // Abort the transaction: a project made above must not stay.
      throw new PackClashError({ line, message: `utterance ${clash.seq} differs from the one already in “${row.name}”: this pack does not fit that project` });
    }
    const fresh = utterances.filter((u) => !stored.has(u.seq));
    const ids = (await db.utterances.bulkAdd(
      fresh.map((u) => {
        const r: Omit<UtteranceRow, 'id'> = { projectId: row.id, seq: u.seq, text: u.text, tokens: tokensPack(tokenPairs(u.tokens)), meta: u.meta, source: {} };
        if (u.externalId !== undefined) r.externalId = u.externalId;
        return r as UtteranceRow;
      }),
      { allKeys: true },
    )) as number[];
    await annotatorEnsureIn(db, row.id, header.annotator.id, { name: header.annotator.name });
    for (const [i, u] of fresh.entries()) {
      if (u.suggestion === undefined) continue;
      const content: LayerContent = { tags: u.suggestion.tags, intent: u.suggestion.intent, status: 'draft', note: '', revision: 1, updated: now };
      await db.layers.put({ ...content, utteranceId: ids[i] as number, annotator: ANNOTATOR_MODEL, projectId: row.id });
      await db.history.add({ projectId: row.id, utteranceId: ids[i] as number, annotator: ANNOTATOR_MODEL, before: null, after: content, who: ANNOTATOR_MODEL, when: now } as HistoryRow);
    }
    const exchange = row.exchange as ProjectExchange;
    const packs = exchange.packs.filter((p) => !(p.id === header.bodySha256 && p.annotator === header.annotator.id));
    packs.push({ id: header.bodySha256, annotator: header.annotator.id, created: now, seqs: utterances.map((u) => u.seq).sort((a, b) => a - b) });
    await db.projects.put({ ...row, exchange: { ...exchange, packs } } as ExchangeRow);
    return { ok: true, projectId: row.id, name: row.name, annotator: header.annotator.id, created: existing === undefined, added: fresh.length, count: utterances.length };
  }).catch((error: unknown) => {
    if (error instanceof PackClashError) return { ok: false, errors: [error.problem] };
    throw error;
  });
}

class PackClashError extends Error {
  constructor(readonly problem: ExchangeProblem) {
    super(problem.message);
  }
}

function tokenPairs(flat: readonly number[]): { start: number; end: number }[] {
  const out: { start: number; end: number }[] = [];
  for (let i = 0; i + 1 < flat.length; i += 2) out.push({ start: flat[i] as number, end: flat[i + 1] as number });
  return out;
}

/** Hand back: `annotator`'s layers on this project as a layer file (only layers they have written). */
export async function handBackMake(db: SlotsmithDb, projectId: number, annotator: string): Promise<{ text: string; count: number }> {
  const exchange = await projectExchange(db, projectId);
  if (exchange === null) throw new RecordMissingError('pack of project', projectId);
  const project = (await db.projects.get(projectId)) as ExchangeRow;
  const rows = await db.utterances.where('[projectId+seq]').between([projectId, Dexie.minKey], [projectId, Dexie.maxKey]).toArray();
  const layers = await db.layers.bulkGet(rows.map((r): LayerKey => [r.id, annotator]));
  const records: LayerRecord[] = [];
  rows.forEach((r, i) => {
    const l = layers[i];
    if (l === undefined) return;
    const record: LayerRecord = { seq: r.seq, tokenCount: tokensCount(r.tokens), annotator, tags: l.tags, intent: l.intent, status: l.status, note: l.note, revision: l.revision, updated: l.updated };
    if (r.externalId !== undefined) record.externalId = r.externalId;
    records.push(record);
  });
  const pack = [...exchange.packs].reverse().find((p) => p.annotator === annotator)?.id;
  const text = await layersWrite({
    created: new Date(db.clock()).toISOString(),
    project: { uid: exchange.uid, name: exchange.name ?? project.name },
    annotator,
    ...(pack !== undefined && { pack }),
    layers: records,
  });
  return { text, count: records.length };
}

export interface MergeSummary {
  annotator: string;
  received: number;
  done: number;
  skipped: number;
  added: number;
  replaced: number;
  unchanged: number;
  /** Older than the stored layer: ignored, with the file lines. */
  older: number[];
  /** Same revision, other content (the layer was edited on two machines); lines. */
  conflicts: number[];
  /** Utterances where this annotator now differs from another person's layer and did not before. */
  newDisagreements: number;
}

export type MergeOutcome = { ok: true; summary: MergeSummary } | { ok: false; errors: ExchangeProblem[] };

const COMPARED: readonly LayerStatus[] = ['draft', 'done', 'flagged'];

/** Two people's layers disagree when both hold labels (not unlabelled, not skipped) and tags or intent differ. */
function layersDiffer(a: LayerContent, b: LayerContent): boolean {
  if (!COMPARED.includes(a.status) || !COMPARED.includes(b.status)) return false;
  return a.intent !== b.intent || a.tags.length !== b.tags.length || a.tags.some((t, i) => t !== b.tags[i]);
}

/**
 * Merge a layer file into the project in one transaction: all of it or, on any refusal, nothing.
 * Each written layer gets a history row whose `who` is the file's annotator.
 */
export async function layersMerge(db: SlotsmithDb, projectId: number, text: string): Promise<MergeOutcome> {
  const read = await layersRead(text);
  if (!read.ok) return read;
  const file = read.file;
  const annotator = file.header.annotator;
  return dbWrite(db, [db.projects, db.utterances, db.layers, db.annotators, db.history], async (): Promise<MergeOutcome> => {
    const row = (await db.projects.get(projectId)) as ExchangeRow | undefined;
    if (row === undefined) throw new RecordMissingError('project', projectId);
    if (row.exchange === undefined) {
      return { ok: false, errors: [{ line: 1, message: `this project has handed out no packs, so no layer file belongs to it (the file is for “${file.header.project.name}”)` }] };
    }
    const rows = await utterancesBySeq(db, projectId, file.layers.map((l) => l.seq));
    const known = new Map<number, MergeUtterance>([...rows.values()].map((r) => [r.seq, { seq: r.seq, tokenCount: tokensCount(r.tokens), ...(r.externalId !== undefined && { externalId: r.externalId }) }]));
    const storedRows = await db.layers.bulkGet(file.layers.map((l): LayerKey => [rows.get(l.seq)?.id ?? -1, annotator]));
    const stored = new Map<number, LayerContent>();
    storedRows.forEach((l, i) => l !== undefined && stored.set((file.layers[i] as LayerRecord).seq, l));
    const plan = mergePlan(file, row.exchange.uid, known, stored);
    if (!plan.ok) return plan;
    const count = (action: MergeAction) => plan.decisions.filter((d) => d.action === action).length;
    const summary: MergeSummary = {
      annotator,
      received: file.layers.length,
      done: file.layers.filter((l) => l.status === 'done').length,
      skipped: file.layers.filter((l) => l.status === 'skipped').length,
      added: count('add'),
      replaced: count('replace'),
      unchanged: count('same'),
      older: [],
      conflicts: [],
      newDisagreements: 0,
    };
    const now = db.clock();
    const changed = plan.decisions.filter((d) => d.action === 'add' || d.action === 'replace');
    if (changed.length > 0) await annotatorEnsureIn(db, projectId, annotator);
    for (const [i, d] of plan.decisions.entries()) {
      if (d.action === 'older') summary.older.push(i + 2);
      if (d.conflict) summary.conflicts.push(i + 2);
    }
    for (const d of changed) {
      const utteranceId = (rows.get(d.seq) as UtteranceRow).id;
      const others = (await db.layers.where('[utteranceId+annotator]').between([utteranceId, Dexie.minKey], [utteranceId, Dexie.maxKey]).toArray()).filter(
        (l) => l.annotator !== annotator && l.annotator !== ANNOTATOR_MODEL,
      );
      const before = d.stored !== null && others.some((o) => layersDiffer(d.stored as LayerContent, o));
      if (!before && others.some((o) => layersDiffer(d.incoming, o))) summary.newDisagreements++;
      await db.layers.put({ ...d.incoming, utteranceId, annotator, projectId });
      await db.history.add({ projectId, utteranceId, annotator, before: d.stored, after: d.incoming, who: annotator, when: now } as HistoryRow);
    }
    return { ok: true, summary };
  });
}

export interface PackProgress {
  id: string;
  annotator: string;
  created: number;
  total: number;
  /** Layers of the pack's annotator on the pack's utterances, by status; `unlabelled` includes missing layers. */
  statuses: Record<LayerStatus, number>;
}

/** Per pack: how far its annotator's layer has come on its utterances (as far as merged here). */
export async function packProgress(db: SlotsmithDb, projectId: number): Promise<PackProgress[]> {
  const exchange = await projectExchange(db, projectId);
  if (exchange === null) return [];
  const out: PackProgress[] = [];
  for (const pack of exchange.packs) {
    const rows = await utterancesBySeq(db, projectId, pack.seqs);
    const layers = await db.layers.bulkGet([...rows.values()].map((r): LayerKey => [r.id, pack.annotator]));
    const statuses: Record<LayerStatus, number> = { unlabelled: 0, draft: 0, done: 0, skipped: 0, flagged: 0 };
    for (const l of layers) statuses[l?.status ?? 'unlabelled']++;
    statuses.unlabelled += pack.seqs.length - layers.length;
    out.push({ id: pack.id, annotator: pack.annotator, created: pack.created, total: pack.seqs.length, statuses });
  }
  return out;
}
