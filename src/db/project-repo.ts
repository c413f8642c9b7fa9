/** Projects: create, rename, change the schema, list, and delete with everything that belongs to them. */
import Dexie from 'dexie';
import type { ProjectSchema } from '../core/backup/model';
import type { TokeniserSpec } from '../core/tokenise';
import type { Scheme } from '../core/types';
import { dbWrite, InvalidInputError, RecordMissingError } from './errors';
import { dbTablesAll, type ProjectRow, type SlotsmithDb } from './schema';

export interface ProjectCreateInput {
  name: string;
  tokeniser?: TokeniserSpec;
  scheme?: Scheme;
  schema?: ProjectSchema;
}

export interface ProjectDeleteReport {
  utterances: number;
  layers: number;
  annotators: number;
  batches: number;
  history: number;
}

const NAME_LENGTH_MAX = 200;

export function projectNameCheck(name: string): string {
  const trimmed = name.trim();
  if (trimmed === '') throw new InvalidInputError('A project needs a name.');
  if (trimmed.length > NAME_LENGTH_MAX) throw new InvalidInputError(`A project name can have at most ${NAME_LENGTH_MAX} characters.`);
  return trimmed;
}

export async function projectCreate(db: SlotsmithDb, input: ProjectCreateInput): Promise<ProjectRow> {
  const name = projectNameCheck(input.name);
  const now = db.clock();
  const row: Omit<ProjectRow, 'id'> = {
    name,
    created: now,
    updated: now,
    tokeniser: input.tokeniser ?? { kind: 'words' },
    scheme: input.scheme ?? 'iob2',
    schema: input.schema ?? { slots: [], intents: [] },
  };
  return dbWrite(db, [db.projects], async () => ({ ...row, id: await db.projects.add(row) }));
}

async function projectUpdate(db: SlotsmithDb, id: number, patch: Partial<Omit<ProjectRow, 'id' | 'created'>>): Promise<ProjectRow> {
  return dbWrite(db, [db.projects], async () => {
    const row = await db.projects.get(id);
    if (row === undefined) throw new RecordMissingError('project', id);
    const next = { ...row, ...patch, updated: db.clock() };
    await db.projects.put(next);
    return next;
  });
}

export function projectRename(db: SlotsmithDb, id: number, name: string): Promise<ProjectRow> {
  return projectUpdate(db, id, { name: projectNameCheck(name) });
}

/** Replace the slot/intent schema (e.g. after adding labels found in an import). */
export function projectSchemaSet(db: SlotsmithDb, id: number, schema: ProjectSchema): Promise<ProjectRow> {
  return projectUpdate(db, id, { schema });
}

export function projectGet(db: SlotsmithDb, id: number): Promise<ProjectRow | undefined> {
  return db.projects.get(id);
}

/** Every project, oldest first (the UI chooses its own order). */
export function projectList(db: SlotsmithDb): Promise<ProjectRow[]> {
  return db.projects.toArray();
}

/** Delete a project and all its rows in one transaction: afterwards nothing refers to it. */
export async function projectDelete(db: SlotsmithDb, id: number): Promise<ProjectDeleteReport> {
  const { minKey, maxKey } = Dexie;
  return dbWrite(db, dbTablesAll(db), async () => {
    if ((await db.projects.get(id)) === undefined) throw new RecordMissingError('project', id);
    const report: ProjectDeleteReport = {
      utterances: await db.utterances.where('[projectId+seq]').between([id, minKey], [id, maxKey]).delete(),
      layers: await db.layers.where('[projectId+annotator+status]').between([id, minKey, minKey], [id, maxKey, maxKey]).delete(),
      annotators: await db.annotators.where('[projectId+id]').between([id, minKey], [id, maxKey]).delete(),
      batches: await db.batches.where('projectId').equals(id).delete(),
      history: await db.history.where('projectId').equals(id).delete(),
    };
    await db.projects.delete(id);
    return report;
  });
}
