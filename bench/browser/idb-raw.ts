import type { Page } from '@playwright/test';

export interface RawPutResult {
  durability: 'default' | 'strict';
  records: number;
  seconds: number;
  perSecond: number;
}

/**
 * The limit: plain IndexedDB puts into one object store, no indexes, one record per utterance holding
 * both the utterance row and its layer row (~12 tokens, packed offsets, tag strings), 5,000 a
 * transaction. Only the transactions are timed; building the records is not.
 */
export async function idbRawRate(page: Page, records: number, durability: 'default' | 'strict'): Promise<RawPutResult> {
  // tsx compiles with keepNames, which wraps named inner functions in a `__name` helper the page lacks.
  await page.evaluate('globalThis.__name ??= (f) => f');
  const seconds = await page.evaluate(
    async ({ records, durability }) => {
      const name = `bench-raw-${durability}`;
      const done = <T>(r: IDBRequest<T>) =>
        new Promise<T>((resolve, reject) => {
          r.onsuccess = () => resolve(r.result);
          r.onerror = () => reject(r.error);
        });
      await new Promise<void>((resolve, reject) => {
        const del = indexedDB.deleteDatabase(name);
        del.onsuccess = () => resolve();
        del.onerror = () => reject(del.error);
      });
      const open = indexedDB.open(name, 1);
      open.onupgradeneeded = () => open.result.createObjectStore('rows', { autoIncrement: true });
      const db = await done(open);
      const words = ['plumber', 'on', 'tuesday', 'morning', 'fix', 'the', 'leaking', 'tap', 'in', 'kitchen', 'please', 'asap'];
      const tagsOf = ['B-service', 'O', 'B-day', 'B-time_window', 'O', 'O', 'B-problem', 'I-problem', 'O', 'B-area', 'O', 'O'];
      const chunk = 5000;
      let elapsed = 0;
      for (let from = 0; from < records; from += chunk) {
        const rows: unknown[] = [];
        for (let i = from; i < Math.min(records, from + chunk); i++) {
          const text = `${words.join(' ')} ${i}`;
          const tokens = new Int32Array(words.length * 2);
          let at = 0;
          words.forEach((w, k) => {
            tokens[2 * k] = at;
            tokens[2 * k + 1] = at + w.length;
            at += w.length + 1;
          });
          rows.push({
            projectId: 1,
            seq: i,
            text,
            tokens,
            externalId: `u-${i}`,
            meta: {},
            source: { batchId: 1, line: i * 14 + 1 },
            layer: { annotator: 'ann-bench', projectId: 1, tags: [...tagsOf], intent: 'book_visit', status: 'done', batchId: 1 },
          });
        }
        const started = performance.now();
        const tx = db.transaction('rows', 'readwrite', { durability: durability === 'strict' ? 'strict' : 'default' });
        const store = tx.objectStore('rows');
        for (const row of rows) store.put(row);
        await new Promise<void>((resolve, reject) => {
          tx.oncomplete = () => resolve();
          tx.onerror = () => reject(tx.error);
          tx.onabort = () => reject(tx.error);
        });
        elapsed += performance.now() - started;
      }
      db.close();
      indexedDB.deleteDatabase(name);
      return elapsed / 1000;
    },
    { records, durability },
  );
  return { durability, records, seconds, perSecond: records / seconds };
}
