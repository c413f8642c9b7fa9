/**
 * Restore from a backup file over any database instance (the restore worker's own, or
 * fake-indexeddb in tests): stream the file through the core backup reader, which checks every
 * line, then store the project in one transaction. A bad file stores nothing and says, by file
 * line, what is wrong.
 */
import { backupReader } from '../core/backup';
import type { ReadError } from '../core/types';
import { backupStore, type SlotsmithDb } from '../db';

export interface RestoreProgress {
  /** Reading counts bytes of the file; storing is one transaction, shown as 0 of 1 until it ends. */
  phase: 'reading' | 'storing';
  done: number;
  total: number;
}

export type RestoreOutcome =
  | { ok: true; projectId: number; name: string; warnings: ReadError[]; utterances: number }
  | { ok: false; errors: ReadError[] };

/** Progress at most about once per percent of the file, so a big file sends a hundred messages, not thousands. */
const PROGRESS_STEPS = 100;

export async function restoreRun(db: SlotsmithDb, file: Blob, onProgress: (p: RestoreProgress) => void = () => {}): Promise<RestoreOutcome> {
  const reader = backupReader();
  // As Blob.text() decodes (WHATWG Encoding: UTF-8, bad bytes become U+FFFD), in the stream's own chunks.
  const decoder = new TextDecoder();
  const stream = file.stream().getReader();
  const total = file.size;
  const step = Math.max(1, Math.floor(total / PROGRESS_STEPS));
  let done = 0;
  let shown = 0;
  onProgress({ phase: 'reading', done: 0, total });
  for (;;) {
    const chunk = await stream.read();
    if (chunk.done) break;
    reader.push(decoder.decode(chunk.value, { stream: true }));
    done += chunk.value.byteLength;
    if (done - shown >= step) {
      shown = done;
      onProgress({ phase: 'reading', done, total });
    }
  }
  reader.push(decoder.decode());
  const decoded = reader.end();
  if (!decoded.ok) return decoded;
  onProgress({ phase: 'storing', done: 0, total: 1 });
  const { projectId, name } = await backupStore(db, decoded.data);
  onProgress({ phase: 'storing', done: 1, total: 1 });
  return { ok: true, projectId, name, warnings: decoded.warnings, utterances: decoded.data.utterances.length };
}
