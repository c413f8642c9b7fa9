/**
 * The agreement dashboard's last bootstrap totals per choice of layers (the per-utterance rows they
 * were drawn from, and every resample's totals), in a database of their own
 * (`slotsmith-bootstrap-totals`: a cache, safe to lose). After an edit the next run patches them
 * (core `bootstrapTotalsPatched`) instead of resampling 100k utterances 1,000 times. No signature:
 * the rows are compared with the new ones, so a kept entry can never give other numbers than
 * resampling from scratch. One entry per project (the last choice of layers): each is a few MB.
 */
import type { BootstrapTotals } from '../core/agreement';

export const BOOTSTRAP_STORE_DB = 'slotsmith-bootstrap-totals';
const STORE = 'totals';
/** Raise when BootstrapTotals changes shape: entries of another shape are ignored. */
export const BOOTSTRAP_STORE_FORMAT = 1;

interface Stored {
  key: string;
  projectId: number;
  format: number;
  saved: number;
  totals: BootstrapTotals;
}

export interface BootstrapStore {
  load: (projectId: number, key: string) => Promise<BootstrapTotals | undefined>;
  save: (projectId: number, key: string, totals: BootstrapTotals) => Promise<void>;
  /** Drop every entry of a deleted project. */
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

/** The store over `factory` (the browser's indexedDB, or fake-indexeddb in tests). Failures read as "nothing kept". */
export function bootstrapStoreOpen(factory: IDBFactory, now: () => number = Date.now): BootstrapStore {
  let opened: Promise<IDBDatabase> | null = null;
  const open = () => {
    opened ??= new Promise<IDBDatabase>((resolve, reject) => {
      const r = factory.open(BOOTSTRAP_STORE_DB, 1);
      r.onupgradeneeded = () => r.result.createObjectStore(STORE, { keyPath: 'key' }).createIndex('projectId', 'projectId');
      r.onsuccess = () => resolve(r.result);
      r.onerror = () => reject(r.error);
    });
    return opened;
  };
  const storedKey = (projectId: number, key: string) => `${projectId}:${key}`;
  return {
    async load(projectId, key) {
      try {
        const db = await open();
        const stored = (await request(db.transaction(STORE, 'readonly').objectStore(STORE).get(storedKey(projectId, key)))) as Stored | undefined;
        return stored?.format === BOOTSTRAP_STORE_FORMAT ? stored.totals : undefined;
      } catch {
        return undefined;
      }
    },
    async save(projectId, key, totals) {
      try {
        const db = await open();
        const tx = db.transaction(STORE, 'readwrite');
        const store = tx.objectStore(STORE);
        const entry: Stored = { key: storedKey(projectId, key), projectId, format: BOOTSTRAP_STORE_FORMAT, saved: now(), totals };
        for (const old of (await request(store.index('projectId').getAllKeys(projectId))) as IDBValidKey[]) if (old !== entry.key) store.delete(old);
        store.put(entry);
        await done(tx);
      } catch {
        // Only a cache: the next run resamples from scratch.
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
        // Only a cache: entries left behind belong to an id no new project gets.
      }
    },
  };
}
