/**
 * The span editor's undo steps after a reload: rebuilt from the history rows that layerSave wrote for
 * this person, so undo keeps working across reloads (the stack itself lives in memory).
 */
import { layerEditBlank, layerEditOf, type UndoEntry } from '../core/editing';
import type { SlotsmithDb } from './schema';

/**
 * The last `limit` edits `who` saved in the project, oldest first, as undo entries (for layers in
 * `annotators` only, e.g. their own and gold). Undo writes themselves are history rows too, so
 * after a reload undoing one of them redoes the step it undid: still each step, in order.
 */
export async function labelUndoSeed(db: SlotsmithDb, projectId: number, who: string, annotators: readonly string[], limit: number): Promise<UndoEntry[]> {
  const rows = await db.history
    .where('projectId')
    .equals(projectId)
    .reverse()
    .filter((row) => row.who === who && annotators.includes(row.annotator))
    .limit(limit)
    .toArray();
  return rows.reverse().map((row) => ({
    utteranceId: row.utteranceId,
    annotator: row.annotator,
    before: row.before === null ? layerEditBlank(row.after.tags.length) : layerEditOf(row.before),
    after: { ...layerEditOf(row.after), revision: row.after.revision },
  }));
}
