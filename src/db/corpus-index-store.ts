/**
 * A copy of each project's table index in a database of its own (`slotsmith-corpus-index`, not the
 * app's schema: it is a cache, safe to lose), so a reload finds it in one read instead of passing
 * over 100k utterances again. Stale copies are brought up to date by corpusIndexUpdate or rebuilt.
 */
import type { CorpusIndex } from './corpus-index';

export const CORPUS_INDEX_DB = 'slotsmith-corpus-index';
const STORE = 'indexes';
/** Raise when CorpusIndex changes shape: copies of another shape are ignored (and rebuilt). */
export const CORPUS_INDEX_FORMAT = 2;

interface Stored {
  projectId: number;
  format: number;
  index: CorpusIndex;
}

export interface CorpusIndexStore {
  load: (projectId: number) => Promise<CorpusIndex | undefined>;
  save: (index: CorpusIndex) => Promise<void>;
  /** Drop the copy of a deleted project. */
  forget: (projectId: number) => Promise<void>;
}

function request<T>(r: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    r.onsuccess = () => resolve(r.result);
    r.onerror = () => reject(r.error);
  });
}

/** The store over `factory` (the browser's indexedDB, or fake-indexeddb in tests). Failures read as "no copy". */
export function corpusIndexStoreOpen(factory: IDBFactory): CorpusIndexStore {
  let opened: Promise<IDBDatabase> | null = null;
  const open = () => {
    opened ??= new Promise<IDBDatabase>((resolve, reject) => {
      const r = factory.open(CORPUS_INDEX_DB, 1);
      r.onupgradeneeded = () => r.result.createObjectStore(STORE, { keyPath: 'projectId' });
      r.onsuccess = () => resolve(r.result);
      r.onerror = () => reject(r.error);
    });
    return opened;
  };
  return {
    async load(projectId) {
      try {
        const db = await open();
        const stored = (await request(db.transaction(STORE, 'readonly').objectStore(STORE).get(projectId))) as Stored | undefined;
        return stored?.format === CORPUS_INDEX_FORMAT ? stored.index : undefined;
      } catch {
        return undefined;
      }
    },
    async save(index) {
      try {
        const db = await open();
        const tx = db.transaction(STORE, 'readwrite');
        const stored: Stored = { projectId: index.projectId, format: CORPUS_INDEX_FORMAT, index };
        tx.objectStore(STORE).put(stored);
        await new Promise<void>((resolve, reject) => {
          tx.oncomplete = () => resolve();
          tx.onerror = () => reject(tx.error);
          tx.onabort = () => reject(tx.error);
        });
      } catch {
        // Only a cache: the next visit builds the index again.
      }
    },
    async forget(projectId) {
      try {
        const db = await open();
        const tx = db.transaction(STORE, 'readwrite');
        tx.objectStore(STORE).delete(projectId);
        await new Promise<void>((resolve, reject) => {
          tx.oncomplete = () => resolve();
          tx.onerror = () => reject(tx.error);
        });
      } catch {
        // Only a cache: a copy left behind belongs to an id no new project gets.
      }
    },
  };
}
