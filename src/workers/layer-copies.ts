/**
 * Up-to-date layer copies (src/db/layer-copy.ts) for a run of the agreement or overview figures.
 * A stored copy at the project's signature is used as it is; one behind it by label edits only
 * (same project row and import batches) is patched from the history rows since (each edit writes
 * one, in the same transaction as the layer): only the edited utterances' layers are read. Anything
 * else (an import, a schema edit, no copy yet, too many edits) reads every layer once, page by page,
 * and stores the result. Copies are saved with the signature taken before reading: an edit made
 * while reading has a later history id, so the next run reads that utterance again.
 */
import type { CorpusSignature } from '../db/corpus-index';
import { layerCopyPatched, LayerCopyBuilder, type LayerCopy, type LayerCopyRow } from '../db/layer-copy';
import type { LayerCopyStore } from '../db/layer-copy-store';
import type { LayerKey, SlotsmithDb } from '../db/schema';
import { layersScan, type LayerScanProgress } from './agreement-read';

/** More edited layers than this since a copy was made: reading every layer is as quick as patching. */
export const LAYER_COPY_PATCH_MAX = 5000;

export interface LayerCopiesOutcome {
  /** In the order of the annotators asked for. */
  copies: LayerCopy[];
  /** Per annotator: how its copy was had. */
  how: Record<string, 'kept' | 'patched' | 'read'>;
  /** Settles when new and patched copies are stored (runs need not wait for it; tests do). */
  saved: Promise<void>;
}

function patchable(copy: LayerCopy, next: CorpusSignature): boolean {
  const before = copy.signature;
  return before.project === next.project && before.batches === next.batches && before.historyLast <= next.historyLast;
}

/** Copies behind `next` by edits only, patched; null for those that need reading in full (also for an import's start). */
export async function copiesPatch(db: SlotsmithDb, projectId: number, behind: readonly LayerCopy[], next: CorpusSignature): Promise<Map<string, LayerCopy | null>> {
  const out = new Map<string, LayerCopy | null>();
  if (behind.length === 0) return out;
  const from = Math.min(...behind.map((c) => c.signature.historyLast));
  const wanted = new Set(behind.map((c) => c.annotator));
  const read = await db.transaction('r', [db.history, db.layers], async () => {
    const edits = (await db.history.where(':id').above(from).toArray()).filter((h) => h.projectId === projectId && h.id <= next.historyLast && wanted.has(h.annotator));
    const touched = new Map<string, Set<number>>();
    for (const copy of behind) touched.set(copy.annotator, new Set());
    for (const h of edits) {
      const copy = behind.find((c) => c.annotator === h.annotator);
      if (copy !== undefined && h.id > copy.signature.historyLast) touched.get(h.annotator)?.add(h.utteranceId);
    }
    const keys: LayerKey[] = [];
    for (const [annotator, ids] of touched) if (ids.size <= LAYER_COPY_PATCH_MAX) for (const id of ids) keys.push([id, annotator]);
    const rows = (await db.layers.bulkGet(keys)).filter((r) => r !== undefined);
    return { touched, rows };
  });
  for (const copy of behind) {
    const touched = read.touched.get(copy.annotator) ?? new Set<number>();
    if (touched.size > LAYER_COPY_PATCH_MAX) {
      out.set(copy.annotator, null);
      continue;
    }
    const rows: LayerCopyRow[] = read.rows.filter((r) => r.annotator === copy.annotator);
    out.set(copy.annotator, touched.size === 0 ? { ...copy, signature: next } : layerCopyPatched(copy, touched, rows, next));
  }
  return out;
}

/**
 * Copies of `annotators`' layers in `projectId`, up to date with `signature` (the project's, taken by
 * the caller before anything is read). New and patched copies are stored for the next run.
 */
export async function layerCopiesFor(
  db: SlotsmithDb,
  store: LayerCopyStore,
  projectId: number,
  annotators: readonly string[],
  signature: CorpusSignature,
  onProgress: (p: LayerScanProgress) => void = () => {},
  /** Adds the time (ms) of loading, patching and reading in full. */
  steps?: Record<string, number>,
  /** Read every layer even when a copy is kept (and store the new copies). */
  fresh = false,
): Promise<LayerCopiesOutcome> {
  let at = performance.now();
  const lap = (name: string) => {
    if (steps === undefined) return;
    const t = performance.now();
    steps[name] = (steps[name] ?? 0) + t - at;
    at = t;
  };
  const stored = fresh ? new Map<string, LayerCopy>() : await store.load(projectId, annotators);
  lap('copies load');
  const have = new Map<string, LayerCopy>();
  const how: LayerCopiesOutcome['how'] = {};
  const behind: LayerCopy[] = [];
  for (const a of annotators) {
    const copy = stored.get(a);
    if (copy === undefined || !patchable(copy, signature)) continue;
    if (copy.signature.historyLast === signature.historyLast) {
      have.set(a, copy);
      how[a] = 'kept';
    } else behind.push(copy);
  }
  const changed: LayerCopy[] = [];
  for (const [a, copy] of await copiesPatch(db, projectId, behind, signature)) {
    if (copy === null) continue;
    have.set(a, copy);
    how[a] = 'patched';
    changed.push(copy);
  }
  lap('copies patch');
  const missing = annotators.filter((a) => !have.has(a));
  if (missing.length > 0) {
    const builders = new Map(missing.map((a) => [a, new LayerCopyBuilder(projectId, a)]));
    await layersScan(db, { projectId, annotators: missing, statuses: null }, (row) => builders.get(row.annotator)?.rowAdd(row), onProgress, undefined, steps);
    for (const [a, builder] of builders) {
      const copy = builder.done(signature);
      have.set(a, copy);
      how[a] = 'read';
      changed.push(copy);
    }
    lap('copies read');
  }
  // Not awaited here: storing is for the next run, and this run's figures need not wait for the disk.
  return { copies: annotators.map((a) => have.get(a) as LayerCopy), how, saved: store.save(changed) };
}
