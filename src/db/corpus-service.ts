/**
 * The utterance table's query service: keeps the index of the project last asked about, updates it
 * in place after label edits and rebuilds it after anything else (see corpusIndexUpdate). Runs in
 * the corpus worker in the app and directly in tests.
 */
import { corpusIndexBuild, corpusIndexSignature, corpusIndexUpdate, corpusSignatureSame, type CorpusIndex } from './corpus-index';
import type { CorpusIndexStore } from './corpus-index-store';
import { corpusQueryRun, type CorpusQuery } from './corpus-query';
import type { SlotsmithDb } from './schema';

export interface CorpusAnswer {
  /** Matching utterance ids, in table order. */
  ids: Int32Array;
  /** Utterances in the project. */
  total: number;
  /** Layer owners of the project (people first), for the layer and annotator choices. */
  annotators: string[];
  /** Intent names the shown layer uses (the file's where it has no layer), sorted. */
  intents: string[];
  /** Slot names met in the shown layer, sorted. */
  slots: string[];
  /** How the index was brought up to date for this answer ('stored': the saved copy, current or updated). */
  index: 'reused' | 'updated' | 'built' | 'stored';
  /** Milliseconds spent on the index and on filtering. */
  indexMillis: number;
  queryMillis: number;
}

export class CorpusService {
  private index: CorpusIndex | null = null;
  private pending: Promise<unknown> = Promise.resolve();

  private saveTimer: ReturnType<typeof setTimeout> | undefined;
  /** The project state (id and signature) for which the saved copy was missing or could not be brought up to date. */
  private storedUseless: string | null = null;

  constructor(
    private readonly db: SlotsmithDb,
    private readonly store: CorpusIndexStore | null = null,
    /** Milliseconds between an in-place update and saving the copy (edits come in bursts). */
    private readonly saveDelay = 5000,
  ) {}

  private saveLater(index: CorpusIndex, delay: number): void {
    if (this.store === null) return;
    clearTimeout(this.saveTimer);
    const store = this.store;
    this.saveTimer = setTimeout(() => void store.save(index), delay);
  }

  private async indexFresh(projectId: number, onProgress?: (done: number, total: number) => void, build = true): Promise<{ index: CorpusIndex; how: CorpusAnswer['index'] } | null> {
    const signature = await corpusIndexSignature(this.db, projectId);
    const current = this.index;
    if (current?.projectId === projectId) {
      if (corpusSignatureSame(current.signature, signature)) return { index: current, how: 'reused' };
      if (await corpusIndexUpdate(this.db, current, signature)) {
        this.saveLater(current, this.saveDelay);
        return { index: current, how: 'updated' };
      }
    }
    // Drop the old index first: two 100k-utterance indexes need not live at once.
    this.index = null;
    // A saved copy found of no use for this very state is not loaded again (warm, then the first question).
    const state = `${projectId}|${JSON.stringify(signature)}`;
    const stored = this.storedUseless === state ? undefined : await this.store?.load(projectId);
    if (stored !== undefined) {
      const same = corpusSignatureSame(stored.signature, signature);
      if (same || (await corpusIndexUpdate(this.db, stored, signature))) {
        if (!same) this.saveLater(stored, this.saveDelay);
        this.index = stored;
        return { index: stored, how: 'stored' };
      }
    }
    this.storedUseless = state;
    if (!build) return null;
    const index = await corpusIndexBuild(this.db, projectId, onProgress);
    this.index = index;
    this.saveLater(index, 0);
    return { index, how: 'built' };
  }

  /**
   * Bring a saved copy into memory ahead of the first query (a page asks this while it still reads
   * its own first facts); never builds. Says how the index came to hand (null: none saved).
   */
  warm(projectId: number): Promise<CorpusAnswer['index'] | null> {
    const run = this.pending.then(async () => (await this.indexFresh(projectId, undefined, false))?.how ?? null);
    this.pending = run.catch(() => undefined);
    return run;
  }

  /** Queries run one at a time, so a burst of filter changes shares one index build. */
  query(projectId: number, query: CorpusQuery, onProgress?: (done: number, total: number) => void): Promise<CorpusAnswer> {
    return this.queryRun(projectId, query, onProgress, true) as Promise<CorpusAnswer>;
  }

  /**
   * The answer only when an index is at hand (in memory or a saved copy, brought up to date from
   * history if need be); null when one would have to be built. A new page asks this first: loading a
   * saved copy is quicker than reading every utterance key.
   */
  queryIfIndexed(projectId: number, query: CorpusQuery): Promise<CorpusAnswer | null> {
    return this.queryRun(projectId, query, undefined, false);
  }

  private queryRun(projectId: number, query: CorpusQuery, onProgress: ((done: number, total: number) => void) | undefined, build: boolean): Promise<CorpusAnswer | null> {
    const run = this.pending.then(async () => {
      const started = performance.now();
      const fresh = await this.indexFresh(projectId, onProgress, build);
      if (fresh === null) return null;
      const { index, how } = fresh;
      const indexed = performance.now();
      const ids = corpusQueryRun(index, query);
      const column = query.layer === null ? undefined : index.layers.get(query.layer);
      const sorted = (names: Iterable<string>) => [...names].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
      // Only the shown layer's intents (and the files'): in blind mode others' choices must not show, even as names.
      const used = new Set<number>();
      for (let i = 0; i < index.ids.length; i++) used.add(column !== undefined && column.status[i] !== 0 ? (column.intent[i] as number) : (index.intentHint[i] as number));
      used.delete(0);
      return {
        ids,
        total: index.ids.length,
        annotators: index.annotators,
        intents: sorted([...used].map((code) => index.intents[code - 1] as string)),
        slots: sorted(column?.slots.keys() ?? []),
        index: how,
        indexMillis: indexed - started,
        queryMillis: performance.now() - indexed,
      };
    });
    this.pending = run.catch(() => undefined);
    return run;
  }

  /** Forget the index (e.g. the project was deleted). */
  clear(): void {
    this.index = null;
  }
}
