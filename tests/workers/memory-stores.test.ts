import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, it } from 'vitest';
import type { BootstrapTotals } from '../../src/core/agreement';
import { bootstrapStoreOpen } from '../../src/db/bootstrap-store';
import { LayerCopyBuilder, type LayerCopy } from '../../src/db/layer-copy';
import { layerCopyStoreOpen, type LayerCopyStore } from '../../src/db/layer-copy-store';
import { bootstrapStoreRemembered, layerCopyStoreRemembered, WriteHold } from '../../src/workers/memory-stores';

function copyOf(projectId: number, annotator: string, historyLast: number): LayerCopy {
  const builder = new LayerCopyBuilder(projectId, annotator);
  builder.rowAdd({ utteranceId: 1, tags: ['O', 'B-day'], intent: 'book_visit', status: 'done', updated: 5 });
  return builder.done({ project: 'p', batches: '[]', historyLast });
}

/** A store that counts what reaches it. */
function counted(inner: LayerCopyStore): LayerCopyStore & { loads: string[][] } {
  const loads: string[][] = [];
  return {
    loads,
    load: (projectId, annotators) => {
      loads.push([...annotators]);
      return inner.load(projectId, annotators);
    },
    save: (copies) => inner.save(copies),
    forget: (projectId) => inner.forget(projectId),
  };
}

function totalsOf(value: number): BootstrapTotals {
  return { rows: { patternOf: new Int32Array([0]), rowStart: new Int32Array([0, 1]), index: new Int32Array([0]), value: new Int32Array([1]) }, layout: { tags: 1, intents: 0, tagA: 6, tagShift: 7, intentA: 8, intentShift: 8, width: 8 }, seed: 1, totals: new Float64Array([value]) };
}

describe('layerCopyStoreRemembered', () => {
  it('answers from memory what it saved or loaded, and asks the database only for the rest', async () => {
    const factory = new IDBFactory();
    const db = counted(layerCopyStoreOpen(factory));
    await db.save([copyOf(1, 'ann-b', 3)]);
    const store = layerCopyStoreRemembered(db);
    const a = copyOf(1, 'ann-a', 4);
    await store.save([a]);
    const first = await store.load(1, ['ann-a', 'ann-b']);
    expect(first.get('ann-a')).toBe(a);
    expect(first.get('ann-b')?.signature.historyLast).toBe(3);
    expect(db.loads).toEqual([['ann-b']]);
    const second = await store.load(1, ['ann-a', 'ann-b']);
    expect(second.get('ann-b')).toBe(first.get('ann-b'));
    expect(db.loads).toHaveLength(1);
    // Saved through: a fresh store over the same database finds it.
    expect((await layerCopyStoreOpen(factory).load(1, ['ann-a'])).get('ann-a')?.signature.historyLast).toBe(4);
  });

  it('holds one project at a time and forgets a deleted one', async () => {
    const db = counted(layerCopyStoreOpen(new IDBFactory()));
    const store = layerCopyStoreRemembered(db);
    await store.save([copyOf(1, 'ann-a', 1)]);
    await store.save([copyOf(2, 'ann-a', 1)]);
    await store.load(1, ['ann-a']);
    expect(db.loads).toEqual([['ann-a']]);
    await store.forget(2);
    expect((await store.load(2, ['ann-a'])).size).toBe(0);
    expect(db.loads).toEqual([['ann-a'], ['ann-a']]);
  });
});

describe('bootstrapStoreRemembered', () => {
  it('keeps the last entry per project in memory, as the database keeps one', async () => {
    const inner = bootstrapStoreOpen(new IDBFactory());
    let loads = 0;
    const store = bootstrapStoreRemembered({ ...inner, load: (p, k) => (loads++, inner.load(p, k)) });
    const one = totalsOf(1);
    await store.save(1, 'pair x', one);
    expect(await store.load(1, 'pair x')).toBe(one);
    expect(loads).toBe(0);
    await store.save(1, 'pair y', totalsOf(2));
    // The database dropped 'pair x' when 'pair y' was saved; memory does the same.
    expect(await store.load(1, 'pair x')).toBeUndefined();
    expect(loads).toBe(1);
    expect((await store.load(1, 'pair y'))?.totals[0]).toBe(2);
    await store.forget(1);
    expect(await store.load(1, 'pair y')).toBeUndefined();
  });
});

describe('WriteHold', () => {
  it('makes writes at once when not holding, and holds them in order until release otherwise', async () => {
    const writes = new WriteHold();
    const made: string[] = [];
    const write = (name: string) => () => {
      made.push(name);
      return Promise.resolve();
    };
    await writes.write(write('now'));
    expect(made).toEqual(['now']);
    writes.hold();
    const first = writes.write(write('first'));
    const second = writes.write(write('second'));
    await Promise.resolve();
    expect(made).toEqual(['now']);
    writes.release();
    await Promise.all([first, second]);
    expect(made).toEqual(['now', 'first', 'second']);
    // Released: the next write is made at once again.
    await writes.write(write('after'));
    expect(made.at(-1)).toBe('after');
  });

  it('holds a remembered store’s database writes while its memory already answers', async () => {
    const writes = new WriteHold();
    const factory = new IDBFactory();
    const store = layerCopyStoreRemembered(layerCopyStoreOpen(factory), writes);
    writes.hold();
    const saving = store.save([copyOf(1, 'ann-a', 9)]);
    expect((await store.load(1, ['ann-a'])).get('ann-a')?.signature.historyLast).toBe(9);
    expect((await layerCopyStoreOpen(factory).load(1, ['ann-a'])).size).toBe(0);
    writes.release();
    await saving;
    expect((await layerCopyStoreOpen(factory).load(1, ['ann-a'])).get('ann-a')?.signature.historyLast).toBe(9);
  });

  it('passes a failed write’s error to its caller', async () => {
    const writes = new WriteHold();
    writes.hold();
    const failing = writes.write(() => Promise.reject(new Error('disk full')));
    writes.release();
    await expect(failing).rejects.toThrow('disk full');
  });
});
