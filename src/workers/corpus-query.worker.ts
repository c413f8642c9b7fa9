/** The utterance table's worker: builds and keeps the project index off the page's thread and heap. */
import * as Comlink from 'comlink';
import { dbOpen } from '../db';
import { CorpusService, type CorpusAnswer } from '../db/corpus-service';
import type { CorpusQuery } from '../db/corpus-query';

const service = new CorpusService(dbOpen());

const api = {
  async query(projectId: number, query: CorpusQuery): Promise<CorpusAnswer> {
    const answer = await service.query(projectId, query);
    // The id list moves to the page without a copy.
    return Comlink.transfer(answer, [answer.ids.buffer]);
  },
};

export type CorpusWorkerApi = typeof api;

Comlink.expose(api);
