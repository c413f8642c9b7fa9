import { describe, expect, it } from 'vitest';
import { storageStatus, type StorageManagerLike } from '../../src/db/storage-status';

// Fakes of StorageManager (Storage Standard, "navigator.storage"): persist(), persisted(), estimate().
function storageFake(granted: boolean, calls: string[]): StorageManagerLike {
  let persistent = false;
  return {
    persist: async () => {
      calls.push('persist');
      persistent = granted;
      return granted;
    },
    persisted: async () => {
      calls.push('persisted');
      return persistent;
    },
    estimate: async () => ({ usage: 5_242_880, quota: 1_073_741_824 }),
  };
}

describe('storage status', () => {
  it('reports usage, quota and persistence without asking by default', async () => {
    const calls: string[] = [];
    expect(await storageStatus({ storage: storageFake(true, calls) })).toEqual({ persisted: false, usage: 5_242_880, quota: 1_073_741_824 });
    expect(calls).toEqual(['persisted']);
  });

  it('asks for persistence when requested and reports the answer', async () => {
    const calls: string[] = [];
    expect((await storageStatus({ storage: storageFake(true, calls), requestPersist: true })).persisted).toBe(true);
    expect(calls).toEqual(['persist']);
    const refused: string[] = [];
    expect((await storageStatus({ storage: storageFake(false, refused), requestPersist: true })).persisted).toBe(false);
    expect(refused).toEqual(['persist', 'persisted']);
  });

  it('says "unknown" when the API is missing or fails', async () => {
    expect(await storageStatus({ storage: null })).toEqual({ persisted: null, usage: null, quota: null });
    const broken: StorageManagerLike = {
      persisted: () => Promise.reject(new Error('insecure context')),
      estimate: () => Promise.reject(new Error('insecure context')),
    };
    expect(await storageStatus({ storage: broken })).toEqual({ persisted: null, usage: null, quota: null });
    expect(await storageStatus({ storage: { estimate: async () => ({}) } })).toEqual({ persisted: null, usage: null, quota: null });
  });
});
