/** Typed errors of the storage layer, and the one write helper that maps browser storage errors to them. */
import type { Table } from 'dexie';
import type { LayerKey, LayerRow, SlotsmithDb } from './schema';
import { storageFullAnnounce } from './storage-full';

export class StorageFullError extends Error {
  override name = 'StorageFullError';
  constructor(cause: unknown) {
    super(
      'The browser has no room left for Slotsmith data (disk full or storage quota reached). Nothing from this change was saved; what was stored before is unchanged. ' +
        'Free some disk space or delete projects you no longer need, save a backup of your projects (Project settings, “Save a backup of this project”) to a disk with room, then try again.',
      { cause },
    );
  }
}

/** A write based on an older revision of a layer than the stored one; carries the stored layer. */
export class RevisionConflictError extends Error {
  override name = 'RevisionConflictError';
  constructor(
    readonly key: LayerKey,
    readonly expectedRevision: number,
    readonly stored: LayerRow | null,
  ) {
    super(
      `This utterance was changed elsewhere (perhaps in another tab): your edit is based on revision ${expectedRevision}, ` +
        `the stored one is revision ${stored?.revision ?? 0}. Nothing was overwritten.`,
    );
  }
}

/** Not named NotFoundError: Dexie turns errors with IndexedDB's DOMException names into its own. */
export class RecordMissingError extends Error {
  override name = 'RecordMissingError';
  constructor(what: string, id: unknown) {
    super(`${what} ${JSON.stringify(id)} does not exist (it may have been deleted in another tab)`);
  }
}

/** An import batch is not in the state the call needs (e.g. appending to a cancelled import). */
export class BatchStateError extends Error {
  override name = 'BatchStateError';
}

export class InvalidInputError extends Error {
  override name = 'InvalidInputError';
}

// Firefox reported quota as NS_ERROR_DOM_QUOTA_REACHED before the standard name (from memory).
const QUOTA_NAMES = new Set(['QuotaExceededError', 'NS_ERROR_DOM_QUOTA_REACHED']);

/**
 * True when `error` is, or wraps, a quota error: IndexedDB raises a DOMException named
 * QuotaExceededError (IndexedDB 3.0, "transaction abort" / request errors); Dexie re-raises it as
 * Dexie.QuotaExceededError, inside AbortError.inner, or among BulkError.failures.
 */
export function storageErrorIsQuota(error: unknown, depth = 0): boolean {
  if (typeof error !== 'object' || error === null || depth > 4) return false;
  const e = error as { name?: unknown; inner?: unknown; cause?: unknown; failures?: unknown };
  if (typeof e.name === 'string' && QUOTA_NAMES.has(e.name)) return true;
  if (storageErrorIsQuota(e.inner, depth + 1) || storageErrorIsQuota(e.cause, depth + 1)) return true;
  const failures = Array.isArray(e.failures) ? e.failures : typeof e.failures === 'object' && e.failures !== null ? Object.values(e.failures) : [];
  return failures.some((f) => storageErrorIsQuota(f, depth + 1));
}

/** Quota errors become StorageFullError and are announced (see storage-full.ts); others pass unchanged. */
export function storageErrorMap(error: unknown): unknown {
  if (!storageErrorIsQuota(error)) return error;
  const full = error instanceof StorageFullError ? error : new StorageFullError(error);
  storageFullAnnounce(full);
  return full;
}

/**
 * One read-write transaction over `tables`: either every write in `scope` is stored or none is
 * (IndexedDB aborts the whole transaction on any failure), with quota errors as StorageFullError.
 */
export async function dbWrite<T>(db: SlotsmithDb, tables: Table[], scope: () => Promise<T>): Promise<T> {
  try {
    return await db.transaction('rw', tables, scope);
  } catch (error) {
    throw storageErrorMap(error);
  }
}
