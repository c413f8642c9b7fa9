/**
 * Simulated full disk: after `n` more records are stored, fake-indexeddb's record store throws a
 * QuotaExceededError DOMException. fake-indexeddb then fails that request and aborts the
 * transaction with the error's name, which is how IndexedDB reports quota failures (IndexedDB 3.0,
 * "store a record into an object store": "QuotaExceededError" when the quota is exceeded).
 * Patches a fake-indexeddb internal (the raw ObjectStore class), reached through a live store.
 */
import { IDBFactory } from 'fake-indexeddb';

type StoreRecord = (...args: unknown[]) => unknown;

export interface QuotaFake {
  /** Fail the (n+1)-th record write from now on. */
  failAfter(n: number): void;
  restore(): void;
}

async function rawStorePrototype(): Promise<{ storeRecord: StoreRecord }> {
  const factory = new IDBFactory();
  const db = await new Promise<IDBDatabase>((resolve, reject) => {
    const request = factory.open('probe', 1);
    request.onupgradeneeded = () => request.result.createObjectStore('s');
    request.onsuccess = () => resolve(request.result);
    request.onerror = () => reject(request.error);
  });
  const store = db.transaction('s', 'readonly').objectStore('s') as unknown as { _rawObjectStore: object };
  db.close();
  return Object.getPrototypeOf(store._rawObjectStore) as { storeRecord: StoreRecord };
}

export async function quotaFake(): Promise<QuotaFake> {
  const proto = await rawStorePrototype();
  const original = proto.storeRecord;
  let left = Infinity;
  proto.storeRecord = function storeRecordFull(this: unknown, ...args: unknown[]) {
    // Requests pass the transaction's rollback log; an abort restoring old records passes none and must work.
    const isRequest = args[2] !== undefined;
    if (!isRequest) return original.apply(this, args);
    if (left <= 0) throw new DOMException('The quota has been exceeded (test fake).', 'QuotaExceededError');
    left--;
    return original.apply(this, args);
  };
  return {
    failAfter(n) {
      left = n;
    },
    restore() {
      proto.storeRecord = original;
    },
  };
}
