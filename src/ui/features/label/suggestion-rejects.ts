/**
 * Model suggestions a labeller rejected, per database, project and layer, kept in localStorage.
 * Why there: the database schema may not change for this, and the layer row must not, because a
 * rejection is not labelling work (it would bump the revision, write a history row and count as a
 * change by the labeller). A rejection only hides a suggestion on this browser; losing the list
 * (another machine, cleared storage) brings suggestions back and never alters a label, so a
 * per-person, per-browser store is enough. Keys are content-based (`start:end:slot`), so a retrained
 * model offering the same span again stays hidden, and a different span shows.
 */

/** The part of the Storage interface used here (tests pass a Map-backed one). */
export interface KeyValueStore {
  getItem(key: string): string | null;
  setItem(key: string, value: string): void;
}

const EMPTY: ReadonlySet<string> = new Set();
// About 30 bytes an entry: this many stays well inside the few megabytes browsers give localStorage.
export const REJECTS_CAP = 20_000;

export function suggestionRejectsKey(dbName: string, projectId: number, layer: string): string {
  return `slotsmith.rejected.${dbName}.${projectId}.${layer}`;
}

type Entry = [utteranceId: number, key: string];

function entriesParse(text: string | null): Entry[] {
  if (text === null) return [];
  try {
    const value = JSON.parse(text) as { v?: unknown; entries?: unknown };
    if (value.v !== 1 || !Array.isArray(value.entries)) return [];
    return value.entries.filter((e): e is Entry => Array.isArray(e) && e.length === 2 && Number.isSafeInteger(e[0]) && typeof e[1] === 'string');
  } catch {
    // A damaged entry costs only the hidden suggestions showing again.
    return [];
  }
}

export class SuggestionRejects {
  private entries: Entry[] = [];
  private byUtterance = new Map<number, ReadonlySet<string>>();
  private readonly listeners = new Set<() => void>();

  constructor(
    private readonly storage: KeyValueStore | null,
    private readonly storageKey: string,
    private readonly cap = REJECTS_CAP,
  ) {
    this.load();
  }

  /** Rejected keys of one utterance; the same object until that utterance's rejections change. */
  rejected(utteranceId: number): ReadonlySet<string> {
    return this.byUtterance.get(utteranceId) ?? EMPTY;
  }

  reject(utteranceId: number, keys: readonly string[]): void {
    const held = this.rejected(utteranceId);
    const fresh = keys.filter((k) => !held.has(k));
    if (fresh.length === 0) return;
    this.entries.push(...fresh.map((k): Entry => [utteranceId, k]));
    // Oldest rejections go first when the list is full.
    if (this.entries.length > this.cap) this.entries = this.entries.slice(this.entries.length - this.cap);
    this.save();
  }

  /** Show one utterance's rejected suggestions again. */
  restore(utteranceId: number): void {
    if (!this.byUtterance.has(utteranceId)) return;
    this.entries = this.entries.filter(([id]) => id !== utteranceId);
    this.save();
  }

  /** Re-read after another tab wrote the same key (the window's `storage` event). */
  storageChanged(key: string | null): void {
    if (key !== null && key !== this.storageKey) return;
    this.load();
    this.emit();
  }

  subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  private load(): void {
    let text: string | null;
    try {
      text = this.storage?.getItem(this.storageKey) ?? null;
    } catch {
      // Storage refused (some private windows): nothing is remembered.
      text = null;
    }
    this.entries = entriesParse(text).slice(-this.cap);
    this.index();
  }

  private index(): void {
    const sets = new Map<number, Set<string>>();
    for (const [id, key] of this.entries) {
      let set = sets.get(id);
      if (set === undefined) sets.set(id, (set = new Set()));
      set.add(key);
    }
    // Unchanged utterances keep their set object, so screens memoised on it do not repaint.
    const next = new Map<number, ReadonlySet<string>>();
    for (const [id, set] of sets) {
      const old = this.byUtterance.get(id);
      next.set(id, old !== undefined && old.size === set.size && [...set].every((k) => old.has(k)) ? old : set);
    }
    this.byUtterance = next;
  }

  private save(): void {
    this.index();
    try {
      this.storage?.setItem(this.storageKey, JSON.stringify({ v: 1, entries: this.entries }));
    } catch {
      // Storage full or refused (private window): the rejection lasts until the tab closes.
    }
    this.emit();
  }

  private emit(): void {
    for (const listener of this.listeners) listener();
  }
}

const stores = new Map<string, SuggestionRejects>();

/** One store per key for the life of the tab, on the browser's localStorage when there is one. */
export function suggestionRejectsFor(dbName: string, projectId: number, layer: string): SuggestionRejects {
  const key = suggestionRejectsKey(dbName, projectId, layer);
  let store = stores.get(key);
  if (store === undefined) {
    store = new SuggestionRejects(typeof localStorage === 'undefined' ? null : localStorage, key);
    stores.set(key, store);
  }
  return store;
}
