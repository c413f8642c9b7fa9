/**
 * The utterance table's query service: keeps the index of the project last asked about and
 * rebuilds it only when the project's signature changed. Runs in the corpus worker in the app and
 * directly in tests.
 */
import { corpusIndexBuild, corpusIndexSignature, type CorpusIndex } from './corpus-index';
import { corpusQueryRun, type CorpusQuery } from './corpus-query';
import type { SlotsmithDb } from './schema';

export interface CorpusAnswer {
  /** Matching utterance ids, in table order. */
  ids: Int32Array;
  /** Utterances in the project. */
  total: number;
  /** Layer owners of the project (people first), for the layer and annotator choices. */
  annotators: string[];
  /** Intent names met in layers and files, sorted. */
  intents: string[];
  /** Slot names met in the shown layer, sorted. */
  slots: string[];
  /** Milliseconds spent (re)building the index for this answer (0 when it was reused) and filtering. */
  indexMillis: number;
  queryMillis: number;
}

export class CorpusService {
  private index: CorpusIndex | null = null;
  private building: { projectId: number; signature: string; promise: Promise<CorpusIndex> } | null = null;

  constructor(private readonly db: SlotsmithDb) {}

  private async indexFresh(projectId: number): Promise<{ index: CorpusIndex; built: boolean }> {
    const signature = await corpusIndexSignature(this.db, projectId);
    if (this.index?.projectId === projectId && this.index.signature === signature) return { index: this.index, built: false };
    if (this.building?.projectId !== projectId || this.building.signature !== signature) {
      const promise = corpusIndexBuild(this.db, projectId);
      this.building = { projectId, signature, promise };
      // Drop the old index first: two 100k-utterance indexes need not live at once.
      this.index = null;
    }
    const building = this.building;
    const index = await building.promise;
    if (this.building === building) {
      this.building = null;
      this.index = index;
    }
    return { index, built: true };
  }

  async query(projectId: number, query: CorpusQuery): Promise<CorpusAnswer> {
    const started = performance.now();
    const { index, built } = await this.indexFresh(projectId);
    const indexed = performance.now();
    const ids = corpusQueryRun(index, query);
    const column = query.layer === null ? undefined : index.layers.get(query.layer);
    const sorted = (names: Iterable<string>) => [...names].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
    return {
      ids,
      total: index.ids.length,
      annotators: index.annotators,
      intents: sorted(index.intents),
      slots: sorted(column?.slots.keys() ?? []),
      indexMillis: built ? indexed - started : 0,
      queryMillis: performance.now() - indexed,
    };
  }

  /** Forget the index (e.g. the project was deleted). */
  clear(): void {
    this.index = null;
  }
}
