/**
 * Reading a project's layers for the agreement and overview figures, page by page. Which layers
 * exist comes from the [projectId+annotator+status] index (keys only: no tags, no texts); their rows
 * are then read in pages of utterance ids straight off the primary key [utteranceId+annotator], so
 * each page is one getAll and rows arrive in utterance order. Utterance rows (with their texts) are
 * never read here.
 */
import Dexie from 'dexie';
import type { LayerStatus } from '../core/backup/model';
import { layerKeysDistinct, type LayerIndexKey } from '../db/layer-keys';
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


/** The (annotator, status) keys a choice meets, among those the project has. */
async function candidateKeys(db: SlotsmithDb, choice: LayerScanChoice): Promise<LayerIndexKey[]> {
  return (await layerKeysDistinct(db, choice.projectId)).filter(
    ([, annotator, status]) => (choice.annotators === null || choice.annotators.includes(annotator)) && (choice.statuses === null || choice.statuses.includes(status)),
  );
}

/**
 * The lowest and highest utterance id carrying a chosen layer: per candidate (annotator, status)
 * index key, its first and last entry (entries of one key are in primary-key order, so utterance
 * order). A handful of index reads, however large the project; null when no layer is chosen.
 */
export async function layerUtteranceSpan(db: SlotsmithDb, choice: LayerScanChoice): Promise<{ first: number; last: number } | null> {
  let first = Infinity;
  let last = -Infinity;
  for (const key of await candidateKeys(db, choice)) {
    const index = db.layers.where('[projectId+annotator+status]');
    const low = (await index.equals(key).limit(1).primaryKeys()) as unknown as [number, string][];
    if (low.length === 0) continue;
    const high = (await db.layers.where('[projectId+annotator+status]').equals(key).reverse().limit(1).primaryKeys()) as unknown as [number, string][];
    first = Math.min(first, low[0]?.[0] ?? Infinity);
    last = Math.max(last, high[0]?.[0] ?? -Infinity);
  }
  return first <= last ? { first, last } : null;
}

/** Whether any layer of `annotator` has one of `statuses`: one key read each, no counting. */
export async function layersExist(db: SlotsmithDb, projectId: number, annotator: string, statuses: readonly LayerStatus[]): Promise<boolean> {
  for (const s of statuses) {
    if ((await db.layers.where('[projectId+annotator+status]').equals([projectId, annotator, s]).limit(1).primaryKeys()).length > 0) return true;
  }
  return false;
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
  const pageRead = (from: number) => {
    const read = db.layers.where('[utteranceId+annotator]').between([from, minKey], [Math.min(span.last, from + pageSize - 1), maxKey], true, true).toArray();
    // Handled here too, so a page asked for ahead and never awaited (a visit threw) is no unhandled rejection.
    read.catch(() => undefined);
    return read;
  };
  // The next page is asked for before this one is visited: the database reads it meanwhile.
  let next = pageRead(span.first);
  for (let from = span.first; from <= span.last; from += pageSize) {
    const to = Math.min(span.last, from + pageSize - 1);
    const rows = await next;
    if (to < span.last) next = pageRead(to + 1);
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

/**
 * Which (annotator, status) pairs the project has, as 1s in the shape of `layerStatusCounts`: a
 * skip-scan of the index, no counting (counting walks every entry: seconds at 100k on disk).
 */
export async function layerStatusesPresent(db: SlotsmithDb, projectId: number): Promise<Record<string, Partial<Record<LayerStatus, number>>>> {
  const present: Record<string, Partial<Record<LayerStatus, number>>> = {};
  for (const [, annotator, status] of await layerKeysDistinct(db, projectId)) (present[annotator] ??= {})[status] = 1;
  return present;
}

/** Chosen layers per annotator and status, from the index alone (no rows read). */
export async function layerStatusCounts(db: SlotsmithDb, projectId: number): Promise<Record<string, Partial<Record<LayerStatus, number>>>> {
  const index = db.layers.where('[projectId+annotator+status]');
  const keys = await layerKeysDistinct(db, projectId);
  const counts: Record<string, Partial<Record<LayerStatus, number>>> = {};
  for (const key of keys) {
    const [, annotator, status] = key;
    const byStatus = (counts[annotator] ??= {});
    byStatus[status] = await index.equals(key).count();
  }
  return counts;
}
