/**
 * Reading a project's layers for the agreement and overview figures, page by page. Which layers
 * exist comes from the [projectId+annotator+status] index (keys only: no tags, no texts); their rows
 * are then read in pages of utterance ids straight off the primary key [utteranceId+annotator], so
 * each page is one getAll and rows arrive in utterance order. Utterance rows (with their texts) are
 * never read here.
 */
import Dexie from 'dexie';
import type { LayerStatus } from '../core/backup/model';
import type { LayerRow, SlotsmithDb } from '../db/schema';

// Large enough that 100k utterances take ~50 reads, small enough that one page's rows stay a few MB.
export const LAYER_PAGE_UTTERANCES = 2000;

export interface LayerScanChoice {
  projectId: number;
  /** Null: every annotator of the project (gold and model included). */
  annotators: readonly string[] | null;
  /** Null: every status. */
  statuses: readonly LayerStatus[] | null;
}

export interface LayerScanProgress {
  done: number;
  total: number;
}

type IndexKey = [number, string, LayerStatus];

/** Sorted distinct utterance ids that carry a chosen layer, from index keys alone. */
export async function layerUtteranceIds(db: SlotsmithDb, choice: LayerScanChoice): Promise<Int32Array> {
  const { minKey, maxKey } = Dexie;
  const index = db.layers.where('[projectId+annotator+status]');
  const ranges: [unknown[], unknown[]][] = [];
  if (choice.annotators === null && choice.statuses === null) {
    ranges.push([
      [choice.projectId, minKey, minKey],
      [choice.projectId, maxKey, maxKey],
    ]);
  } else {
    const present = (await index.between([choice.projectId, minKey, minKey], [choice.projectId, maxKey, maxKey]).uniqueKeys()) as unknown as IndexKey[];
    for (const key of present) {
      const [, annotator, status] = key;
      if (choice.annotators !== null && !choice.annotators.includes(annotator)) continue;
      if (choice.statuses !== null && !choice.statuses.includes(status)) continue;
      ranges.push([key, key]);
    }
  }
  const parts: number[][] = [];
  for (const [low, high] of ranges) {
    const keys = (await index.between(low, high, true, true).primaryKeys()) as unknown as [number, string][];
    parts.push(keys.map((k) => k[0]));
  }
  const all = Int32Array.from(parts.flat()).sort();
  let kept = 0;
  for (let i = 0; i < all.length; i++) if (i === 0 || all[i] !== all[kept - 1]) all[kept++] = all[i] as number;
  return all.slice(0, kept);
}

function rowChosen(row: LayerRow, choice: LayerScanChoice): boolean {
  return (
    row.projectId === choice.projectId &&
    (choice.annotators === null || choice.annotators.includes(row.annotator)) &&
    (choice.statuses === null || choice.statuses.includes(row.status))
  );
}

/**
 * Visit every chosen layer in utterance-id order (an utterance's layers in annotator order). A page
 * reads every layer of its utterances and keeps the chosen ones: the unchosen are a few per utterance.
 */
export async function layersScan(
  db: SlotsmithDb,
  choice: LayerScanChoice,
  visit: (row: LayerRow) => void,
  onProgress: (p: LayerScanProgress) => void = () => {},
  pageSize = LAYER_PAGE_UTTERANCES,
  /** Adds the time (ms) spent on the index keys, on reading pages and on visiting rows. */
  steps?: Record<string, number>,
): Promise<{ utterances: number; layers: number }> {
  let at = performance.now();
  const lap = (name: string) => {
    if (steps === undefined) return;
    const t = performance.now();
    steps[name] = (steps[name] ?? 0) + t - at;
    at = t;
  };
  const ids = await layerUtteranceIds(db, choice);
  lap('index keys');
  const { minKey, maxKey } = Dexie;
  let layers = 0;
  onProgress({ done: 0, total: ids.length });
  for (let from = 0; from < ids.length; from += pageSize) {
    const to = Math.min(ids.length, from + pageSize);
    const first = ids[from] as number;
    const last = ids[to - 1] as number;
    const rows = await db.layers.where('[utteranceId+annotator]').between([first, minKey], [last, maxKey], true, true).toArray();
    lap('page reads');
    for (const row of rows) {
      if (!rowChosen(row, choice)) continue;
      layers++;
      visit(row);
    }
    lap('row visits');
    onProgress({ done: to, total: ids.length });
  }
  return { utterances: ids.length, layers };
}

/** Chosen layers per annotator and status, from the index alone (no rows read). */
export async function layerStatusCounts(db: SlotsmithDb, projectId: number): Promise<Record<string, Partial<Record<LayerStatus, number>>>> {
  const { minKey, maxKey } = Dexie;
  const index = db.layers.where('[projectId+annotator+status]');
  const keys = (await index.between([projectId, minKey, minKey], [projectId, maxKey, maxKey]).uniqueKeys()) as unknown as IndexKey[];
  const counts: Record<string, Partial<Record<LayerStatus, number>>> = {};
  for (const key of keys) {
    const [, annotator, status] = key;
    const byStatus = (counts[annotator] ??= {});
    byStatus[status] = await index.equals(key).count();
  }
  return counts;
}
