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

// Utterance ids per page: 100k utterances take ~50 reads, and one page's rows stay a few MB.
export const LAYER_PAGE_UTTERANCES = 2000;

export interface LayerScanChoice {
  projectId: number;
  /** Null: every annotator of the project (gold and model included). */
  annotators: readonly string[] | null;
  /** Null: every status. */
  statuses: readonly LayerStatus[] | null;
}

/** Progress through the span of utterance ids being read. */
export interface LayerScanProgress {
  done: number;
  total: number;
}

type IndexKey = [number, string, LayerStatus];

/**
 * The lowest and highest utterance id carrying a chosen layer: per chosen (annotator, status) index
 * key, its first and last entry (entries of one key are in primary-key order, so utterance order).
 * A handful of index reads, however large the project; null when no layer is chosen.
 */
export async function layerUtteranceSpan(db: SlotsmithDb, choice: LayerScanChoice): Promise<{ first: number; last: number } | null> {
  const { minKey, maxKey } = Dexie;
  const index = db.layers.where('[projectId+annotator+status]');
  const present = (await index.between([choice.projectId, minKey, minKey], [choice.projectId, maxKey, maxKey]).uniqueKeys()) as unknown as IndexKey[];
  let first = Infinity;
  let last = -Infinity;
  for (const key of present) {
    const [, annotator, status] = key;
    if (choice.annotators !== null && !choice.annotators.includes(annotator)) continue;
    if (choice.statuses !== null && !choice.statuses.includes(status)) continue;
    const low = (await db.layers.where('[projectId+annotator+status]').equals(key).limit(1).primaryKeys()) as unknown as [number, string][];
    const high = (await db.layers.where('[projectId+annotator+status]').equals(key).reverse().limit(1).primaryKeys()) as unknown as [number, string][];
    first = Math.min(first, low[0]?.[0] ?? Infinity);
    last = Math.max(last, high[0]?.[0] ?? -Infinity);
  }
  return first <= last ? { first, last } : null;
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
  const span = await layerUtteranceSpan(db, choice);
  lap('index keys');
  if (span === null) {
    onProgress({ done: 0, total: 0 });
    return { utterances: 0, layers: 0 };
  }
  const { minKey, maxKey } = Dexie;
  const total = span.last - span.first + 1;
  let layers = 0;
  let utterances = 0;
  let previous = -1;
  onProgress({ done: 0, total });
  // Pages by utterance-id span: ids of one project are mostly contiguous (imports add them in runs).
  for (let from = span.first; from <= span.last; from += pageSize) {
    const to = Math.min(span.last, from + pageSize - 1);
    const rows = await db.layers.where('[utteranceId+annotator]').between([from, minKey], [to, maxKey], true, true).toArray();
    lap('page reads');
    for (const row of rows) {
      if (!rowChosen(row, choice)) continue;
      layers++;
      if (row.utteranceId !== previous) {
        utterances++;
        previous = row.utteranceId;
      }
      visit(row);
    }
    lap('row visits');
    onProgress({ done: to - span.first + 1, total });
  }
  return { utterances, layers };
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
