/** The utterance table's worker: builds and keeps the project index off the page's thread and heap. */
import * as Comlink from 'comlink';
import { dbOpen } from '../db';
import { corpusIndexStoreOpen } from '../db/corpus-index-store';
import { CorpusService, type CorpusAnswer } from '../db/corpus-service';
import type { CorpusQuery } from '../db/corpus-query';

const service = new CorpusService(dbOpen(), corpusIndexStoreOpen(indexedDB));

const api = {
  async query(projectId: number, query: CorpusQuery, onProgress?: (done: number, total: number) => void): Promise<CorpusAnswer> {
    // Progress calls go back over the message port; not awaited, so reading never waits on the page.
    const answer = await service.query(projectId, query, onProgress === undefined ? undefined : (done, total) => void onProgress(done, total));
    // The id list moves to the page without a copy.
    return Comlink.transfer(answer, [answer.ids.buffer]);
  },
  /** Load the project's saved index ahead of the first question (see CorpusService.warm). */
  warm(projectId: number): Promise<CorpusAnswer['index'] | null> {
    return service.warm(projectId);
  },
  /** As `query`, but null instead of building an index (see CorpusService.queryIfIndexed). */
  async queryIfIndexed(projectId: number, query: CorpusQuery): Promise<CorpusAnswer | null> {
    const answer = await service.queryIfIndexed(projectId, query);
    return answer === null ? null : Comlink.transfer(answer, [answer.ids.buffer]);
  },
};

export type CorpusWorkerApi = typeof api;

Comlink.expose(api);
