/** Moving through a project's utterances while labelling: by position, and to the next one still to do. */
import Dexie from 'dexie';
import type { SlotsmithDb, UtteranceRow } from './schema';
import { utterancePage } from './utterance-repo';

/** The utterance after (1) or before (-1) position `seq` in project order; undefined at either end. */
export function labelUtteranceStep(db: SlotsmithDb, projectId: number, seq: number, direction: 1 | -1): Promise<UtteranceRow | undefined> {
  const index = db.utterances.where('[projectId+seq]');
  if (direction === 1) return index.between([projectId, seq], [projectId, Dexie.maxKey], false, true).first();
  return index.between([projectId, Dexie.minKey], [projectId, seq], true, false).last();
}

// Pages of this size keep one bulkGet of layers cheap while a 100k-row scan stays a few hundred reads.
const SCAN_PAGE = 500;

/**
 * The first utterance after `afterSeq` (null: from the start) that `annotator` has not started: no
 * layer, or a layer still `unlabelled`. Wraps round to the start once; undefined when none is left.
 */
export async function labelNextUnlabelled(db: SlotsmithDb, projectId: number, annotator: string, afterSeq: number | null): Promise<UtteranceRow | undefined> {
  const scan = async (from: number | null, until: number | null): Promise<UtteranceRow | undefined> => {
    let after = from;
    for (;;) {
      const page = await utterancePage(db, projectId, after, SCAN_PAGE);
      if (page.length === 0) return undefined;
      const layers = await db.layers.bulkGet(page.map((u) => [u.id, annotator] as [number, string]));
      for (const [i, u] of page.entries()) {
        if (until !== null && u.seq > until) return undefined;
        const layer = layers[i];
        if (layer === undefined || layer.status === 'unlabelled') return u;
      }
      after = (page[page.length - 1] as UtteranceRow).seq;
    }
  };
  return (await scan(afterSeq, null)) ?? (afterSeq === null ? undefined : scan(null, afterSeq));
}
