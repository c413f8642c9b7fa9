/**
 * Writes held back while a run is going and made once it has answered: a put of a 7 MB copy spends
 * ~50 ms serialising it on the calling thread, time the run's answer need not wait for. Not holding,
 * a write is made at once.
 */
export class WriteHold {
  private held: (() => void)[] | null = null;

  hold(): void {
    this.held ??= [];
  }

  /** Makes the held writes, in order, and stops holding. */
  release(): void {
    const held = this.held ?? [];
    this.held = null;
    for (const start of held) start();
  }

  write(make: () => Promise<void>): Promise<void> {
    if (this.held === null) return make();
    const held = this.held;
    return new Promise<void>((resolve, reject) => held.push(() => void make().then(resolve, reject)));
  }
}

/**
 * The dashboard worker stays alive between runs (the page keeps it for a while: see
 * src/ui/features/agreement/dashboard-worker.ts), so what it stored last is still in its memory:
 * these wrappers answer loads from there and reach the database only for what they do not hold.
 * Writes go to both. Only the last project's entries are held (a copy of 100k layers is ~7 MB), and
 * entries are trusted exactly as the stored ones are: by signature (copies) or by comparing rows
 * (bootstrap totals), so holding one never yields other figures than loading it.
 */
import type { BootstrapTotals } from '../core/agreement';
import type { BootstrapStore } from '../db/bootstrap-store';
import type { LayerCopy } from '../db/layer-copy';
import type { LayerCopyStore } from '../db/layer-copy-store';

class LastProject<T> {
  private projectId: number | null = null;
  private readonly entries = new Map<string, T>();

  get(projectId: number, key: string): T | undefined {
    return this.projectId === projectId ? this.entries.get(key) : undefined;
  }

  set(projectId: number, key: string, value: T): void {
    if (this.projectId !== projectId) {
      this.entries.clear();
      this.projectId = projectId;
    }
    this.entries.set(key, value);
  }

  forget(projectId: number): void {
    if (this.projectId === projectId) this.entries.clear();
  }
}

export function layerCopyStoreRemembered(inner: LayerCopyStore, writes: WriteHold = new WriteHold()): LayerCopyStore {
  const held = new LastProject<LayerCopy>();
  return {
    async load(projectId, annotators) {
      const found = new Map<string, LayerCopy>();
      const missing: string[] = [];
      for (const a of annotators) {
        const copy = held.get(projectId, a);
        if (copy === undefined) missing.push(a);
        else found.set(a, copy);
      }
      if (missing.length > 0) {
        for (const [a, copy] of await inner.load(projectId, missing)) {
          held.set(projectId, a, copy);
          found.set(a, copy);
        }
      }
      return found;
    },
    save(copies) {
      for (const copy of copies) held.set(copy.projectId, copy.annotator, copy);
      return writes.write(() => inner.save(copies));
    },
    forget(projectId) {
      held.forget(projectId);
      return inner.forget(projectId);
    },
  };
}

export function bootstrapStoreRemembered(inner: BootstrapStore, writes: WriteHold = new WriteHold()): BootstrapStore {
  const held = new LastProject<BootstrapTotals>();
  return {
    async load(projectId, key) {
      const kept = held.get(projectId, key);
      if (kept !== undefined) return kept;
      const loaded = await inner.load(projectId, key);
      if (loaded !== undefined) held.set(projectId, key, loaded);
      return loaded;
    },
    save(projectId, key, totals) {
      // As the database keeps it: one entry per project, the last choice of layers.
      held.forget(projectId);
      held.set(projectId, key, totals);
      return writes.write(() => inner.save(projectId, key, totals));
    },
    forget(projectId) {
      held.forget(projectId);
      return inner.forget(projectId);
    },
  };
}
