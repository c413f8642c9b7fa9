/**
 * Schema edits that reach into the labels: renaming or deleting a slot or an intent rewrites every
 * layer of the project (every annotator, gold and model) and the schema in one transaction, with a
 * history row and a new revision per changed layer. Any failure (a full disk, a name clash found
 * half-way) aborts the transaction, so the project is either wholly renamed or untouched.
 */
import Dexie from 'dexie';
import type { LayerContent, ProjectSchema } from '../core/backup/model';
import {
  intentNameProblem,
  schemaIntentDelete,
  schemaIntentRename,
  schemaNamesDropped,
  schemaProblems,
  schemaSlotDelete,
  schemaSlotRename,
  slotNameProblem,
  tagsSlotDelete,
  tagsSlotRename,
  tagsSlotSpanCount,
  tagsUseSlot,
} from '../core/schema-edit';
import { dbWrite, InvalidInputError, RecordMissingError } from './errors';
import { layerContent } from './layer-repo';
import type { HistoryRow, LayerKey, LayerRow, ProjectRow, SlotsmithDb } from './schema';

export interface SchemaEditOptions {
  /** Who made the change (the labeller profile id), for the history rows. */
  who: string;
}

/** What a slot or intent change touches: spans (slots only), layers, and whose layers they are. */
export interface SchemaUsage {
  spans: number;
  layers: number;
  /** Layer owners with at least one affected layer, sorted (gold and model included). */
  annotators: string[];
}

export interface SchemaEditReport extends SchemaUsage {
  project: ProjectRow;
}

// Layers are read in slices so a 100k-utterance project never sits in memory at once.
const CHUNK = 1000;

async function projectLayerKeys(db: SlotsmithDb, projectId: number): Promise<LayerKey[]> {
  const { minKey, maxKey } = Dexie;
  return db.layers.where('[projectId+annotator+status]').between([projectId, minKey, minKey], [projectId, maxKey, maxKey]).primaryKeys();
}

/** Calls `visit` on every layer of the project, a slice at a time; inside or outside a transaction. */
async function projectLayersEach(db: SlotsmithDb, projectId: number, visit: (rows: LayerRow[]) => Promise<void> | void): Promise<void> {
  const keys = await projectLayerKeys(db, projectId);
  for (let i = 0; i < keys.length; i += CHUNK) {
    const rows = (await db.layers.bulkGet(keys.slice(i, i + CHUNK))).filter((r): r is LayerRow => r !== undefined);
    await visit(rows);
  }
}

function usageNew(): SchemaUsage & { owners: Set<string> } {
  return { spans: 0, layers: 0, annotators: [], owners: new Set() };
}

function usageDone(usage: SchemaUsage & { owners: Set<string> }): SchemaUsage {
  return { spans: usage.spans, layers: usage.layers, annotators: [...usage.owners].sort() };
}

/** Spans of `slot` in the project's layers, and the layers holding them. */
export async function slotUsage(db: SlotsmithDb, projectId: number, slot: string): Promise<SchemaUsage> {
  const usage = usageNew();
  await db.transaction('r', [db.layers], () =>
    projectLayersEach(db, projectId, (rows) => {
      for (const row of rows) {
        const spans = tagsSlotSpanCount(row.tags, slot);
        if (spans === 0) continue;
        usage.spans += spans;
        usage.layers++;
        usage.owners.add(row.annotator);
      }
    }),
  );
  return usageDone(usage);
}

/** Layers of the project whose intent is `intent`. */
export async function intentUsage(db: SlotsmithDb, projectId: number, intent: string): Promise<SchemaUsage> {
  const usage = usageNew();
  await db.transaction('r', [db.layers], () =>
    projectLayersEach(db, projectId, (rows) => {
      for (const row of rows) {
        if (row.intent !== intent) continue;
        usage.layers++;
        usage.owners.add(row.annotator);
      }
    }),
  );
  return usageDone(usage);
}

type LayerEdit = (row: LayerRow) => { change: Partial<LayerContent>; spans: number } | null;

/**
 * One transaction: `schemaNext` decides the new schema from the stored one (throwing to refuse), then
 * every layer `edit` changes is rewritten with a history row, then the schema is stored.
 */
async function schemaEditApply(
  db: SlotsmithDb,
  projectId: number,
  schemaNext: (schema: ProjectSchema) => ProjectSchema,
  edit: LayerEdit,
  options: SchemaEditOptions,
  /** An intent rename also renames the intent read from the file on utterances nobody has labelled. */
  hint?: { from: string; to: string },
): Promise<SchemaEditReport> {
  return dbWrite(db, [db.projects, db.layers, db.history, db.utterances], async () => {
    const project = await db.projects.get(projectId);
    if (project === undefined) throw new RecordMissingError('project', projectId);
    const schema = schemaNext(project.schema);
    const now = db.clock();
    const usage = usageNew();
    await projectLayersEach(db, projectId, async (rows) => {
      const changed: LayerRow[] = [];
      const history: Omit<HistoryRow, 'id'>[] = [];
      for (const row of rows) {
        const result = edit(row);
        if (result === null) continue;
        const next: LayerRow = { ...row, ...result.change, revision: row.revision + 1, updated: now };
        changed.push(next);
        history.push({ projectId, utteranceId: row.utteranceId, annotator: row.annotator, before: layerContent(row), after: layerContent(next), who: options.who, when: now });
        usage.spans += result.spans;
        usage.layers++;
        usage.owners.add(row.annotator);
      }
      if (changed.length === 0) return;
      await db.layers.bulkPut(changed);
      await db.history.bulkAdd(history as HistoryRow[]);
    });
    if (hint !== undefined) {
      await db.utterances
        .where('[projectId+seq]')
        .between([projectId, Dexie.minKey], [projectId, Dexie.maxKey])
        .modify((u) => {
          if (u.intentHint === hint.from) u.intentHint = hint.to;
        });
    }
    const next: ProjectRow = { ...project, schema, updated: now };
    await db.projects.put(next);
    return { ...usageDone(usage), project: next };
  });
}

function slotNeed(schema: ProjectSchema, name: string): void {
  if (!schema.slots.some((s) => s.name === name)) throw new InvalidInputError(`The project has no slot called ${name}.`);
}

function intentNeed(schema: ProjectSchema, name: string): void {
  if (!schema.intents.some((i) => i.name === name)) throw new InvalidInputError(`The project has no intent called ${name}.`);
}

/**
 * Rename a slot in the schema and in every layer (B-/I-/E-/S- prefixes kept, illegal sequences kept).
 * Refused when `to` is not a valid slot name, is already a slot, or already appears in any layer
 * (renaming would merge two slots' spans, which is not a rename).
 */
export function slotRename(db: SlotsmithDb, projectId: number, from: string, to: string, options: SchemaEditOptions): Promise<SchemaEditReport> {
  return schemaEditApply(
    db,
    projectId,
    (schema) => {
      slotNeed(schema, from);
      const problem = slotNameProblem(to);
      if (problem !== null) throw new InvalidInputError(problem);
      if (schema.slots.some((s) => s.name === to)) throw new InvalidInputError(`Another slot is already called ${to}.`);
      return schemaSlotRename(schema, from, to);
    },
    (row) => {
      if (tagsUseSlot(row.tags, to)) {
        throw new InvalidInputError(`Some labels already use the name ${to} (in ${row.annotator}'s layers); renaming ${from} to it would merge two slots. Choose another name.`);
      }
      const tags = tagsSlotRename(row.tags, from, to);
      return tags === row.tags ? null : { change: { tags: [...tags] }, spans: tagsSlotSpanCount(row.tags, from) };
    },
    options,
  );
}

/** Remove a slot from the schema; its tags become O in every layer. */
export function slotDelete(db: SlotsmithDb, projectId: number, slot: string, options: SchemaEditOptions): Promise<SchemaEditReport> {
  return schemaEditApply(
    db,
    projectId,
    (schema) => {
      slotNeed(schema, slot);
      return schemaSlotDelete(schema, slot);
    },
    (row) => {
      const tags = tagsSlotDelete(row.tags, slot);
      return tags === row.tags ? null : { change: { tags: [...tags] }, spans: tagsSlotSpanCount(row.tags, slot) };
    },
    options,
  );
}

/**
 * Rename an intent in the schema (slots' allowed lists included), in every layer that has it, and where
 * it is the file's intent of an utterance nobody has labelled yet (so table filters keep finding it).
 */
export function intentRename(db: SlotsmithDb, projectId: number, from: string, to: string, options: SchemaEditOptions): Promise<SchemaEditReport> {
  return schemaEditApply(
    db,
    projectId,
    (schema) => {
      intentNeed(schema, from);
      const problem = intentNameProblem(to);
      if (problem !== null) throw new InvalidInputError(problem);
      if (schema.intents.some((i) => i.name === to)) throw new InvalidInputError(`Another intent is already called ${to}.`);
      return schemaIntentRename(schema, from, to);
    },
    (row) => {
      if (row.intent === to) {
        throw new InvalidInputError(`Some layers already have the intent ${to} (${row.annotator}'s); renaming ${from} to it would merge two intents. Choose another name.`);
      }
      return row.intent === from ? { change: { intent: to }, spans: 0 } : null;
    },
    options,
    { from, to },
  );
}

/** Remove an intent from the schema; layers that had it are left without an intent. */
export function intentDelete(db: SlotsmithDb, projectId: number, intent: string, options: SchemaEditOptions): Promise<SchemaEditReport> {
  return schemaEditApply(
    db,
    projectId,
    (schema) => {
      intentNeed(schema, intent);
      return schemaIntentDelete(schema, intent);
    },
    (row) => (row.intent === intent ? { change: { intent: null }, spans: 0 } : null),
    options,
  );
}

/**
 * Store an edited schema (new slots and intents, keys, colours, descriptions…) after checking it.
 * Names may not disappear here: a slot or intent in use must go through rename or delete, which
 * rewrite the layers too.
 */
export async function schemaSave(db: SlotsmithDb, projectId: number, schema: ProjectSchema): Promise<ProjectRow> {
  const problem = schemaProblems(schema)[0];
  if (problem !== undefined) throw new InvalidInputError(problem.message);
  return dbWrite(db, [db.projects], async () => {
    const project = await db.projects.get(projectId);
    if (project === undefined) throw new RecordMissingError('project', projectId);
    const dropped = schemaNamesDropped(project.schema, schema);
    const names = [...dropped.slots, ...dropped.intents];
    if (names.length > 0) throw new InvalidInputError(`Use rename or delete to remove ${names.join(', ')}: their labels must change too.`);
    const next: ProjectRow = { ...project, schema, updated: db.clock() };
    await db.projects.put(next);
    return next;
  });
}
