/**
 * The agreement dashboard's last results, in a database of their own (`slotsmith-agreement-cache`,
 * not the app's schema: a cache, safe to lose). A result is kept with the project's signature at the
 * start of its run (see `corpusIndexSignature`: every write to a project's layers adds a history row,
 * changes an import batch or the project row), so reopening the screen on unchanged layers shows the
 * figures at once; any change makes the signature differ and the figures are computed again.
 */
import { corpusSignatureSame, type CorpusSignature } from './corpus-index';

export const AGREEMENT_CACHE_DB = 'slotsmith-agreement-cache';
const STORE = 'results';
/** Raise when the stored result changes shape: entries of another shape are ignored. */
export const AGREEMENT_CACHE_FORMAT = 2;
/** Results kept per project (one per choice of layers, statuses and resamples): the oldest go first. */
export const AGREEMENT_CACHE_PER_PROJECT = 6;

interface Stored<T> {
  key: string;
  projectId: number;
  format: number;
  signature: CorpusSignature;
  saved: number;
  result: T;
}

export interface AgreementCacheHit<T> {
  result: T;
  /** When the result was stored (ms since the epoch). */
  saved: number;
}

export interface AgreementCache<T> {
  /** The result stored under `key` when the project still has `signature`; otherwise undefined. */
  load: (projectId: number, key: string, signature: CorpusSignature) => Promise<AgreementCacheHit<T> | undefined>;
  save: (projectId: number, key: string, signature: CorpusSignature, result: T) => Promise<void>;
  /** Drop every result of a deleted project. */
  forget: (projectId: number) => Promise<void>;
}

function request<T>(r: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    r.onsuccess = () => resolve(r.result);
    r.onerror = () => reject(r.error);
  });
}

function done(tx: IDBTransaction): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    tx.oncomplete = () => resolve();
    tx.onerror = () => reject(tx.error);
    tx.onabort = () => reject(tx.error);
  });
}

/** The cache over `factory` (the browser's indexedDB, or fake-indexeddb in tests). Failures read as "nothing kept". */
export function agreementCacheOpen<T>(factory: IDBFactory, now: () => number = Date.now): AgreementCache<T> {
  let opened: Promise<IDBDatabase> | null = null;
  const open = () => {
    opened ??= new Promise<IDBDatabase>((resolve, reject) => {
      const r = factory.open(AGREEMENT_CACHE_DB, 1);
      r.onupgradeneeded = () => r.result.createObjectStore(STORE, { keyPath: 'key' }).createIndex('projectId', 'projectId');
      r.onsuccess = () => resolve(r.result);
      r.onerror = () => reject(r.error);
    });
    return opened;
  };
  const storedKey = (projectId: number, key: string) => `${projectId}:${key}`;
  return {
    async load(projectId, key, signature) {
      try {
        const db = await open();
        const stored = (await request(db.transaction(STORE, 'readonly').objectStore(STORE).get(storedKey(projectId, key)))) as Stored<T> | undefined;
        if (stored === undefined || stored.format !== AGREEMENT_CACHE_FORMAT || !corpusSignatureSame(stored.signature, signature)) return undefined;
        return { result: stored.result, saved: stored.saved };
      } catch {
        return undefined;
      }
    },
    async save(projectId, key, signature, result) {
      try {
        const db = await open();
        const tx = db.transaction(STORE, 'readwrite');
        const store = tx.objectStore(STORE);
        const entry: Stored<T> = { key: storedKey(projectId, key), projectId, format: AGREEMENT_CACHE_FORMAT, signature, saved: now(), result };
        store.put(entry);
        // Keep the newest few of this project; a project's results go stale together anyway.
        const all = (await request(store.index('projectId').getAll(projectId))) as Stored<T>[];
        const old = all.filter((s) => s.key !== entry.key).sort((x, y) => y.saved - x.saved);
        for (const s of old.slice(AGREEMENT_CACHE_PER_PROJECT - 1)) store.delete(s.key);
        await done(tx);
      } catch {
        // Only a cache: the next visit computes the figures again.
      }
    },
    async forget(projectId) {
      try {
        const db = await open();
        const tx = db.transaction(STORE, 'readwrite');
        const store = tx.objectStore(STORE);
        for (const key of (await request(store.index('projectId').getAllKeys(projectId))) as IDBValidKey[]) store.delete(key);
        await done(tx);
      } catch {
        // Only a cache: results left behind belong to an id no new project gets.
      }
    },
  };
}
