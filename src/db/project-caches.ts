/**
 * The per-project caches kept beside the app's database (the utterance table's index, the agreement
 * dashboard's results and bootstrap totals, the layer copies): dropped with their project, so
 * deleting a project leaves nothing of it behind.
 */
import { agreementCacheOpen } from './agreement-cache';
import { bootstrapStoreOpen } from './bootstrap-store';
import { corpusIndexStoreOpen } from './corpus-index-store';
import { layerCopyStoreOpen } from './layer-copy-store';

export async function projectCachesForget(factory: IDBFactory, projectId: number): Promise<void> {
  await Promise.all([
    corpusIndexStoreOpen(factory).forget(projectId),
    agreementCacheOpen(factory).forget(projectId),
    layerCopyStoreOpen(factory).forget(projectId),
    bootstrapStoreOpen(factory).forget(projectId),
  ]);
}
