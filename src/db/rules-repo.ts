/**
 * Rule review: every transition-rule and schema-rule finding across a project's layers (every
 * owner: people, gold and model), and repairs applied to a chosen set of layers in one transaction,
 * with an undo that restores the exact previous tags, also in one transaction. Both write a history
 * row and a new revision per changed layer; a layer changed since it was scanned (another tab, a
 * label edit) stops the whole write, so nothing is repaired from a stale reading.
 */
import Dexie from 'dexie';
import { layerTagsRepair } from '../core/adjudication';
import type { ProjectSchema } from '../core/backup/model';
import { schemaValidate, transitionsValidate, type LabelSchema, type RepairStrategy, type RuleId } from '../core/rules';
import type { Scheme } from '../core/types';
import { dbWrite, InvalidInputError, RecordMissingError, RevisionConflictError } from './errors';
import { layerContent } from './layer-repo';
import type { HistoryRow, LayerKey, LayerRow, SlotsmithDb } from './schema';
import { tokensUnpack } from './tokens';

export interface RuleFinding {
  rule: RuleId;
  kind: 'transition' | 'schema';
  /** The later token of an illegal transition, the first token of a span, or null for the intent. */
  index: number | null;
  message: string;
}

/** A layer with at least one finding, with what the review screen shows and the repair needs. */
export interface RuleLayer {
  utteranceId: number;
  seq: number;
  annotator: string;
  revision: number;
  tags: string[];
  intent: string | null;
  /** The utterance's tokens as text. */
  words: string[];
  findings: RuleFinding[];
}

export interface RulesScan {
  projectId: number;
  scheme: Scheme;
  /** The rule checker's reading of the project schema; null while it names no slot or intent. */
  schema: LabelSchema | null;
  /** Layers with findings, in project order (then by owner). */
  layers: RuleLayer[];
  layersScanned: number;
  findings: number;
}

export interface RulesScanProgress {
  done: number;
  total: number;
}

/** The project schema as the rule checker reads it: a slot without an intent list goes with any intent. */
export function ruleSchemaOf(schema: ProjectSchema): LabelSchema | null {
  if (schema.slots.length === 0 && schema.intents.length === 0) return null;
  const restricted = schema.slots.some((s) => s.intents !== undefined);
  const named = new Set([...schema.intents.map((i) => i.name), ...schema.slots.flatMap((s) => s.intents ?? [])]);
  const allowed: Record<string, string[]> = {};
  if (restricted) for (const intent of named) allowed[intent] = schema.slots.filter((s) => s.intents === undefined || s.intents.includes(intent)).map((s) => s.name);
  return { slots: schema.slots.map((s) => s.name), intents: schema.intents.length === 0 ? undefined : schema.intents.map((i) => i.name), allowedSlotsByIntent: allowed };
}

/** Findings of one layer: illegal transitions first, then schema issues. */
export function layerFindings(layer: Pick<LayerRow, 'tags' | 'intent'>, scheme: Scheme, schema: LabelSchema | null): RuleFinding[] {
  const findings: RuleFinding[] = transitionsValidate(layer.tags, scheme).map((v) => ({ rule: v.rule, kind: 'transition', index: v.index, message: v.message }));
  if (schema !== null) {
    for (const issue of schemaValidate({ tags: layer.tags, intent: layer.intent ?? undefined }, schema)) {
      findings.push({ rule: issue.rule, kind: 'schema', index: issue.index, message: issue.message });
    }
  }
  return findings;
}

// Slices keep a 100k-layer project out of memory at once, and let progress be reported.
const CHUNK = 1000;

async function projectLayerKeys(db: SlotsmithDb, projectId: number): Promise<LayerKey[]> {
  const { minKey, maxKey } = Dexie;
  return db.layers.where('[projectId+annotator+status]').between([projectId, minKey, minKey], [projectId, maxKey, maxKey]).primaryKeys();
}

/** Every finding in the project's layers. Reads slice by slice, outside one long transaction. */
export async function rulesScan(db: SlotsmithDb, projectId: number, onProgress: (p: RulesScanProgress) => void = () => {}): Promise<RulesScan> {
  const project = await db.projects.get(projectId);
  if (project === undefined) throw new RecordMissingError('project', projectId);
  const schema = ruleSchemaOf(project.schema);
  const keys = await projectLayerKeys(db, projectId);
  const found: { row: LayerRow; findings: RuleFinding[] }[] = [];
  let findings = 0;
  for (let i = 0; i < keys.length; i += CHUNK) {
    const rows = await db.layers.bulkGet(keys.slice(i, i + CHUNK));
    for (const row of rows) {
      if (row === undefined) continue;
      const list = layerFindings(row, project.scheme, schema);
      if (list.length === 0) continue;
      found.push({ row, findings: list });
      findings += list.length;
    }
    onProgress({ done: Math.min(keys.length, i + CHUNK), total: keys.length });
  }
  const layers: RuleLayer[] = [];
  for (let i = 0; i < found.length; i += CHUNK) {
    const slice = found.slice(i, i + CHUNK);
    const utterances = await db.utterances.bulkGet(slice.map((f) => f.row.utteranceId));
    slice.forEach(({ row, findings: list }, j) => {
      const u = utterances[j];
      if (u === undefined) return;
      const words = tokensUnpack(u.tokens).map((t) => u.text.slice(t.start, t.end));
      layers.push({ utteranceId: row.utteranceId, seq: u.seq, annotator: row.annotator, revision: row.revision, tags: [...row.tags], intent: row.intent, words, findings: list });
    });
  }
  layers.sort((x, y) => x.seq - y.seq || (x.annotator < y.annotator ? -1 : x.annotator > y.annotator ? 1 : 0));
  if (keys.length === 0) onProgress({ done: 0, total: 0 });
  return { projectId, scheme: project.scheme, schema, layers, layersScanned: keys.length, findings };
}

/** A layer to repair, at the revision it was scanned at. */
export interface RepairTarget {
  utteranceId: number;
  annotator: string;
  revision: number;
}

export interface RulesRepairOptions {
  strategy: RepairStrategy;
  /** Also drop spans the schema does not allow (unknown slot, slot not allowed for the intent). */
  schemaSpans: boolean;
  /** Who asked for the repair, for the history rows. */
  who: string;
}

export interface RepairedLayer {
  utteranceId: number;
  annotator: string;
  before: string[];
  after: string[];
  /** The layer's revision after the repair: undo refuses if it has moved on since. */
  revision: number;
}

/** What one repair changed; enough to undo it exactly. */
export interface RepairRecord {
  projectId: number;
  strategy: RepairStrategy;
  when: number;
  layers: RepairedLayer[];
  /** First and last id of the history rows it wrote (one transaction: nothing else in between). */
  history: [number, number] | null;
}

/** A repair named by its history rows: small enough to keep anywhere, so its undo can outlive a reload. */
export interface RepairNote {
  projectId: number;
  strategy: RepairStrategy;
  when: number;
  history: [number, number];
}

async function layersWrite(
  db: SlotsmithDb,
  projectId: number,
  changes: { row: LayerRow; tags: string[] }[],
  who: string,
  now: number,
  historyIds: number[] = [],
): Promise<LayerRow[]> {
  const written: LayerRow[] = [];
  for (let i = 0; i < changes.length; i += CHUNK) {
    const slice = changes.slice(i, i + CHUNK);
    const next = slice.map(({ row, tags }): LayerRow => ({ ...row, tags, revision: row.revision + 1, updated: now }));
    const history = slice.map(
      ({ row }, j): Omit<HistoryRow, 'id'> => ({ projectId, utteranceId: row.utteranceId, annotator: row.annotator, before: layerContent(row), after: layerContent(next[j] as LayerRow), who, when: now }),
    );
    await db.layers.bulkPut(next);
    historyIds.push(...(await db.history.bulkAdd(history as HistoryRow[], { allKeys: true })));
    written.push(...next);
  }
  return written;
}

async function layersAt(db: SlotsmithDb, projectId: number, targets: readonly { utteranceId: number; annotator: string; revision: number }[]): Promise<LayerRow[]> {
  const rows = await db.layers.bulkGet(targets.map((t): LayerKey => [t.utteranceId, t.annotator]));
  return targets.map((t, i) => {
    const row = rows[i];
    const key: LayerKey = [t.utteranceId, t.annotator];
    if (row === undefined || row.projectId !== projectId) throw new RecordMissingError('layer', key);
    if (row.revision !== t.revision) throw new RevisionConflictError(key, t.revision, row);
    return row;
  });
}

/**
 * Repair the target layers with the project's scheme, in one transaction. Layers the repair leaves
 * unchanged are skipped (no revision, no history row). Throws RevisionConflictError when a layer
 * moved on since the scan, and then nothing at all is written.
 */
export async function rulesRepairApply(db: SlotsmithDb, projectId: number, targets: readonly RepairTarget[], options: RulesRepairOptions): Promise<RepairRecord> {
  const seen = new Set(targets.map((t) => `${t.utteranceId}\u0000${t.annotator}`));
  if (seen.size !== targets.length) throw new InvalidInputError('each layer may be repaired once per run');
  return dbWrite(db, [db.projects, db.layers, db.history], async () => {
    const project = await db.projects.get(projectId);
    if (project === undefined) throw new RecordMissingError('project', projectId);
    const schema = options.schemaSpans ? ruleSchemaOf(project.schema) : null;
    const rows = await layersAt(db, projectId, targets);
    const changes: { row: LayerRow; tags: string[] }[] = [];
    for (const row of rows) {
      const tags = layerTagsRepair(row.tags, row.intent, project.scheme, { strategy: options.strategy, schema });
      if (tags.some((t, i) => t !== row.tags[i])) changes.push({ row, tags });
    }
    const now = db.clock();
    const historyIds: number[] = [];
    const written = await layersWrite(db, projectId, changes, options.who, now, historyIds);
    const first = historyIds[0];
    const last = historyIds[historyIds.length - 1];
    return {
      projectId,
      strategy: options.strategy,
      when: now,
      layers: written.map((row, i) => ({ utteranceId: row.utteranceId, annotator: row.annotator, before: [...(changes[i] as { row: LayerRow }).row.tags], after: [...row.tags], revision: row.revision })),
      history: first === undefined || last === undefined ? null : [first, last],
    };
  });
}

/**
 * Put back the tags every layer of `record` had before the repair, in one transaction, as new
 * revisions with history rows. Refused (nothing written) when any of them changed after the repair.
 */
export async function rulesRepairUndo(db: SlotsmithDb, record: RepairRecord, options: { who: string }): Promise<number> {
  return dbWrite(db, [db.layers, db.history], async () => {
    const rows = await layersAt(db, record.projectId, record.layers);
    const changes = rows.map((row, i) => ({ row, tags: [...(record.layers[i] as RepairedLayer).before] }));
    await layersWrite(db, record.projectId, changes, options.who, db.clock());
    return changes.length;
  });
}

export function repairNoteOf(record: RepairRecord): RepairNote | null {
  return record.history === null ? null : { projectId: record.projectId, strategy: record.strategy, when: record.when, history: record.history };
}

const tagsSame = (a: readonly string[], b: readonly string[]) => a.length === b.length && a.every((t, i) => t === b[i]);

/**
 * The repair a note names, rebuilt from its history rows (before and after tags). A layer still as the
 * repair left it (same tags, last written at the repair's time) gets its current revision; any other
 * gets -1, so an undo is refused rather than overwriting newer work. Null when the rows are gone.
 */
export async function repairRecordFromHistory(db: SlotsmithDb, note: RepairNote): Promise<RepairRecord | null> {
  const [from, to] = note.history;
  return db.transaction('r', [db.layers, db.history], async () => {
    const rows = (await db.history.where(':id').between(from, to, true, true).toArray()).filter((h) => h.projectId === note.projectId && h.when === note.when);
    if (rows.length === 0 || rows.length !== to - from + 1) return null;
    const layers = await db.layers.bulkGet(rows.map((h): LayerKey => [h.utteranceId, h.annotator]));
    return {
      projectId: note.projectId,
      strategy: note.strategy,
      when: note.when,
      history: note.history,
      layers: rows.map((h, i): RepairedLayer => {
        const now = layers[i];
        const untouched = now !== undefined && now.updated === note.when && tagsSame(now.tags, h.after.tags);
        return { utteranceId: h.utteranceId, annotator: h.annotator, before: [...(h.before?.tags ?? [])], after: [...h.after.tags], revision: untouched ? now.revision : -1 };
      }),
    };
  });
}
