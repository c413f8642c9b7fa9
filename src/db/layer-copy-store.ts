/**
 * Layer copies (layer-copy.ts) in a database of their own (`slotsmith-layer-copies`, not the app's
 * schema: a cache, safe to lose), one entry per project and annotator.
 */
import type { LayerCopy } from './layer-copy';

export const LAYER_COPY_DB = 'slotsmith-layer-copies';
const STORE = 'copies';
/** Raise when LayerCopy changes shape: copies of another shape are ignored (and built again). */
export const LAYER_COPY_FORMAT = 1;

interface Stored {
  key: string;
  projectId: number;
  format: number;
  copy: LayerCopy;
}

export interface LayerCopyStore {
  /** The stored copies of these annotators (missing ones are left out). */
  load: (projectId: number, annotators: readonly string[]) => Promise<Map<string, LayerCopy>>;
  save: (copies: readonly LayerCopy[]) => Promise<void>;
  /** Drop every copy of a deleted project. */
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

const keyOf = (projectId: number, annotator: string) => `${projectId}:${annotator}`;

/** The store over `factory` (the browser's indexedDB, or fake-indexeddb in tests). Failures read as "no copy". */
export function layerCopyStoreOpen(factory: IDBFactory): LayerCopyStore {
  let opened: Promise<IDBDatabase> | null = null;
  const open = () => {
    opened ??= new Promise<IDBDatabase>((resolve, reject) => {
      const r = factory.open(LAYER_COPY_DB, 1);
      r.onupgradeneeded = () => r.result.createObjectStore(STORE, { keyPath: 'key' }).createIndex('projectId', 'projectId');
      r.onsuccess = () => resolve(r.result);
      r.onerror = () => reject(r.error);
    });
    return opened;
  };
  return {
    async load(projectId, annotators) {
      const found = new Map<string, LayerCopy>();
      try {
        const db = await open();
        const store = db.transaction(STORE, 'readonly').objectStore(STORE);
        const stored = (await Promise.all(annotators.map((a) => request(store.get(keyOf(projectId, a)))))) as (Stored | undefined)[];
        for (const s of stored) if (s?.format === LAYER_COPY_FORMAT) found.set(s.copy.annotator, s.copy);
      } catch {
        // Only a cache: what is missing gets built again.
      }
      return found;
    },
    async save(copies) {
      if (copies.length === 0) return;
      try {
        const db = await open();
        const tx = db.transaction(STORE, 'readwrite');
        const store = tx.objectStore(STORE);
        for (const copy of copies) store.put({ key: keyOf(copy.projectId, copy.annotator), projectId: copy.projectId, format: LAYER_COPY_FORMAT, copy } satisfies Stored);
        await done(tx);
      } catch {
        // Only a cache: the next run builds the copies again.
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
        // Only a cache: copies left behind belong to an id no new project gets.
      }
    },
  };
}
