/**
 * Dismissed likely-mistake findings, per project: an extra `dismissed` field of the project row
 * keyed by the core's finding key (src/core/error-detect/key.ts), as model-repo keeps `model`:
 * IndexedDB stores unindexed fields as they come, so no schema version is needed. The key is built
 * from the finding's content, so a dismissal outlives rescans and edits elsewhere in the corpus.
 */
import { dbWrite, InvalidInputError, RecordMissingError } from './errors';
import type { ProjectRow, SlotsmithDb } from './schema';

export interface Dismissal {
  when: number;
  /** The profile that dismissed it, or null when none was chosen. */
  who: string | null;
}

export type Dismissals = Record<string, Dismissal>;

type FindingsProjectRow = ProjectRow & { dismissed?: Dismissals };

/** The stored dismissals of a project (empty when none); a plain copy, safe to change. */
export function dismissalsOf(row: ProjectRow): Dismissals {
  const stored = (row as FindingsProjectRow).dismissed;
  return stored === undefined ? {} : { ...stored };
}

export async function findingsDismissed(db: SlotsmithDb, projectId: number): Promise<Dismissals> {
  const row = await db.projects.get(projectId);
  if (row === undefined) throw new RecordMissingError('project', projectId);
  return dismissalsOf(row);
}

/** One transaction re-reads the row and changes only `dismissed`, so no other field is lost. */
async function dismissalsChange(db: SlotsmithDb, projectId: number, change: (d: Dismissals) => void): Promise<Dismissals> {
  return dbWrite(db, [db.projects], async () => {
    const row = await db.projects.get(projectId);
    if (row === undefined) throw new RecordMissingError('project', projectId);
    const next = dismissalsOf(row);
    change(next);
    const { dismissed: _old, ...rest } = row as FindingsProjectRow;
    await db.projects.put((Object.keys(next).length === 0 ? rest : { ...rest, dismissed: next }) as FindingsProjectRow);
    return next;
  });
}

/** Dismiss findings by key; a key already dismissed keeps its first time and author. */
export function findingsDismiss(db: SlotsmithDb, projectId: number, keys: readonly string[], who: string | null): Promise<Dismissals> {
  if (keys.some((k) => k === '')) return Promise.reject(new InvalidInputError('a finding key may not be empty'));
  return dismissalsChange(db, projectId, (d) => {
    const when = db.clock();
    for (const key of keys) if (!Object.hasOwn(d, key)) d[key] = { when, who };
  });
}

/** Bring dismissed findings back; unknown keys are ignored. */
export function findingsRestore(db: SlotsmithDb, projectId: number, keys: readonly string[]): Promise<Dismissals> {
  return dismissalsChange(db, projectId, (d) => {
    for (const key of keys) delete d[key];
  });
}
