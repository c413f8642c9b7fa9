import { describe, expect, it } from 'vitest';
import { SuggestionRejects, suggestionRejectsKey, type KeyValueStore } from '../../../../src/ui/features/label/suggestion-rejects';

function memoryStore(): KeyValueStore & { data: Map<string, string> } {
  const data = new Map<string, string>();
  return { data, getItem: (k) => data.get(k) ?? null, setItem: (k, v) => void data.set(k, v) };
}

const KEY = suggestionRejectsKey('slotsmith', 3, 'ann-c');

describe('SuggestionRejects', () => {
  it('remembers rejections per utterance across a reload (a new instance on the same storage)', () => {
    const storage = memoryStore();
    const first = new SuggestionRejects(storage, KEY);
    first.reject(10, ['4:6:area']);
    first.reject(10, ['7:8:day', '4:6:area']);
    first.reject(11, ['0:1:service']);
    const again = new SuggestionRejects(storage, KEY);
    expect([...again.rejected(10)].sort()).toEqual(['4:6:area', '7:8:day']);
    expect([...again.rejected(11)]).toEqual(['0:1:service']);
    expect(again.rejected(12).size).toBe(0);
    // Another project or layer has a key of its own.
    expect(new SuggestionRejects(storage, suggestionRejectsKey('slotsmith', 3, 'ann-d')).rejected(10).size).toBe(0);
  });

  it('keeps the same set object until that utterance changes, and tells listeners', () => {
    const store = new SuggestionRejects(memoryStore(), KEY);
    store.reject(1, ['0:1:day']);
    const one = store.rejected(1);
    let heard = 0;
    store.subscribe(() => heard++);
    store.reject(2, ['0:1:day']);
    expect(store.rejected(1)).toBe(one);
    store.reject(1, ['0:1:day']);
    expect(heard).toBe(1);
    store.reject(1, ['2:3:area']);
    expect(store.rejected(1)).not.toBe(one);
    expect(heard).toBe(2);
  });

  it('restores one utterance’s suggestions and leaves the others hidden', () => {
    const storage = memoryStore();
    const store = new SuggestionRejects(storage, KEY);
    store.reject(1, ['0:1:day']);
    store.reject(2, ['0:1:day']);
    store.restore(1);
    expect(store.rejected(1).size).toBe(0);
    expect(new SuggestionRejects(storage, KEY).rejected(2).size).toBe(1);
  });

  it('drops the oldest rejections beyond its cap', () => {
    const storage = memoryStore();
    const store = new SuggestionRejects(storage, KEY, 3);
    for (let id = 1; id <= 5; id++) store.reject(id, ['0:1:day']);
    const again = new SuggestionRejects(storage, KEY, 3);
    expect([1, 2, 3, 4, 5].map((id) => again.rejected(id).size)).toEqual([0, 0, 1, 1, 1]);
  });

  it('reads a damaged or foreign entry as no rejections, and works without storage', () => {
    const storage = memoryStore();
    storage.data.set(KEY, '{not json');
    expect(new SuggestionRejects(storage, KEY).rejected(1).size).toBe(0);
    storage.data.set(KEY, JSON.stringify({ v: 1, entries: [[1, '0:1:day'], ['x', 2], [2]] }));
    const store = new SuggestionRejects(storage, KEY);
    expect(store.rejected(1).size).toBe(1);
    expect(store.rejected(2).size).toBe(0);
    const bare = new SuggestionRejects(null, KEY);
    bare.reject(1, ['0:1:day']);
    expect(bare.rejected(1).size).toBe(1);
  });

  it('takes another tab’s rejections when its storage key changes', () => {
    const storage = memoryStore();
    const tabA = new SuggestionRejects(storage, KEY);
    const tabB = new SuggestionRejects(storage, KEY);
    tabB.reject(7, ['1:2:area']);
    expect(tabA.rejected(7).size).toBe(0);
    tabA.storageChanged('some.other.key');
    expect(tabA.rejected(7).size).toBe(0);
    tabA.storageChanged(KEY);
    expect([...tabA.rejected(7)]).toEqual(['1:2:area']);
  });
});
