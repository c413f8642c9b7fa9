/** Annotators: the people who own layers. Gold and model layers are reserved names without a row. */
import Dexie from 'dexie';
import { ANNOTATORS_RESERVED, type AnnotatorRole } from '../core/backup/model';
import { dbWrite, InvalidInputError, RecordMissingError } from './errors';
import type { AnnotatorRow, SlotsmithDb } from './schema';

// Control characters would make ids invisible or break line-based exchange files.
const CONTROL = /\p{Cc}/u;

/** A layer owner id: reserved names allowed; otherwise non-empty, trimmed, no control characters. */
export function annotatorIdCheck(id: string): string {
  if (id === '' || id.trim() !== id || CONTROL.test(id)) {
    throw new InvalidInputError(`An annotator id must be non-empty, without surrounding spaces or control characters: ${JSON.stringify(id)}`);
  }
  return id;
}

export interface AnnotatorEnsureOptions {
  name?: string;
  role?: AnnotatorRole;
}

/** Inside a caller's transaction (over projects and annotators): the row, created when missing. */
export async function annotatorEnsureIn(db: SlotsmithDb, projectId: number, id: string, options: AnnotatorEnsureOptions = {}): Promise<AnnotatorRow | null> {
  annotatorIdCheck(id);
  if (ANNOTATORS_RESERVED.includes(id)) return null;
  const existing = await db.annotators.get([projectId, id]);
  if (existing !== undefined) return existing;
  if ((await db.projects.get(projectId)) === undefined) throw new RecordMissingError('project', projectId);
  const row: AnnotatorRow = { projectId, id, name: options.name?.trim() || id, role: options.role ?? 'annotator' };
  await db.annotators.add(row);
  return row;
}

/**
 * The annotator `id` of the project, created when missing (an existing row is returned unchanged).
 * Reserved ids (`gold`, `model`) are refused: they name layers written by processes, not people.
 */
export async function annotatorEnsure(db: SlotsmithDb, projectId: number, id: string, options: AnnotatorEnsureOptions = {}): Promise<AnnotatorRow> {
  if (ANNOTATORS_RESERVED.includes(id)) throw new InvalidInputError(`"${id}" is a reserved layer name; choose another annotator id.`);
  const row = await dbWrite(db, [db.projects, db.annotators], () => annotatorEnsureIn(db, projectId, id, options));
  // Not reserved, so annotatorEnsureIn returned a row.
  return row as AnnotatorRow;
}

export function annotatorList(db: SlotsmithDb, projectId: number): Promise<AnnotatorRow[]> {
  return db.annotators.where('[projectId+id]').between([projectId, Dexie.minKey], [projectId, Dexie.maxKey]).toArray();
}
