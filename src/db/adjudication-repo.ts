/**
 * Finding the utterances two annotators disagree on (tags, read as spans, or intent), page by page
 * in project order, with the state of their gold layer. Nothing here writes: gold is saved through
 * `layerSave`, which keeps the revision check and the history row.
 */
import Dexie from 'dexie';
import { ANNOTATOR_GOLD, type LayerStatus } from '../core/backup/model';
import { adjudicationDiff, intentsDiffer } from '../core/adjudication';
import type { LayerKey, LayerRow, SlotsmithDb, UtteranceRow } from './schema';
import { utterancePage } from './utterance-repo';

export interface Disagreement {
  utteranceId: number;
  seq: number;
  text: string;
  /** Disputed token ranges (see `adjudicationDiff`). */
  regions: number;
  intentDiffers: boolean;
  /** Status of the utterance's gold layer; null when there is none yet. */
  gold: LayerStatus | null;
}

export interface DisagreementPage {
  rows: Disagreement[];
  /** The seq to continue after, or null when the project has no more utterances. */
  next: number | null;
}

export interface DisagreementSummary {
  /** Utterances both annotators have a layer on. */
  shared: number;
  /** Of those, the ones where they disagree. */
  disagreeing: number;
  /** Of those, the ones whose gold layer is done. */
  resolved: number;
}

/** How two layers of one utterance disagree; null when they agree on every span and the intent. */
export function layersDisagreement(a: Pick<LayerRow, 'tags' | 'intent'>, b: Pick<LayerRow, 'tags' | 'intent'>): { regions: number; intentDiffers: boolean } | null {
  const regions = adjudicationDiff(a.tags, b.tags).regions.length;
  const intentDiffers = intentsDiffer(a.intent, b.intent);
  return regions === 0 && !intentDiffers ? null : { regions, intentDiffers };
}

// Utterances are read in pages of this size; one bulkGet of three layers per page.
const PAGE = 500;

async function pageDisagreements(db: SlotsmithDb, page: readonly UtteranceRow[], a: string, b: string): Promise<Disagreement[]> {
  const keys = (who: string) => page.map((u): LayerKey => [u.id, who]);
  const [layersA, layersB, gold] = await Promise.all([db.layers.bulkGet(keys(a)), db.layers.bulkGet(keys(b)), db.layers.bulkGet(keys(ANNOTATOR_GOLD))]);
  const rows: Disagreement[] = [];
  page.forEach((u, i) => {
    const la = layersA[i];
    const lb = layersB[i];
    if (la === undefined || lb === undefined) return;
    const found = layersDisagreement(la, lb);
    if (found === null) return;
    rows.push({ utteranceId: u.id, seq: u.seq, text: u.text, ...found, gold: gold[i]?.status ?? null });
  });
  return rows;
}

/**
 * Up to `limit` disagreements after position `afterSeq` (null: from the start), in project order.
 * May return fewer than `limit` with `next` set: call again from `next` to go on.
 */
export async function disagreementPage(db: SlotsmithDb, projectId: number, a: string, b: string, afterSeq: number | null, limitAsked: number): Promise<DisagreementPage> {
  const limit = Math.max(1, Math.trunc(limitAsked));
  const rows: Disagreement[] = [];
  let after = afterSeq;
  // Bounded reads per call, so a sparse project still answers quickly with a place to continue.
  for (let reads = 0; reads < 20; reads++) {
    const page = await utterancePage(db, projectId, after, PAGE);
    if (page.length === 0) return { rows, next: null };
    rows.push(...(await pageDisagreements(db, page, a, b)));
    // Cut at the limit: the next call starts after the last row kept and finds the rest again.
    if (rows.length >= limit) {
      rows.length = limit;
      return { rows, next: (rows[limit - 1] as Disagreement).seq };
    }
    after = (page[page.length - 1] as UtteranceRow).seq;
    if (page.length < PAGE) return { rows, next: null };
  }
  return { rows, next: after };
}

function pageBefore(db: SlotsmithDb, projectId: number, beforeSeq: number, limit: number): Promise<UtteranceRow[]> {
  return db.utterances
    .where('[projectId+seq]')
    .between([projectId, Dexie.minKey], [projectId, beforeSeq], true, false)
    .reverse()
    .limit(limit)
    .toArray();
}

export interface DisagreementStepOptions {
  /** Skip utterances whose gold layer is already done. */
  unresolvedOnly?: boolean;
}

/**
 * The nearest disagreement after (1) or before (-1) position `seq` (null: from the start, or the
 * end going back); undefined when there is none that way.
 */
export async function disagreementStep(
  db: SlotsmithDb,
  projectId: number,
  a: string,
  b: string,
  seq: number | null,
  direction: 1 | -1,
  options: DisagreementStepOptions = {},
): Promise<Disagreement | undefined> {
  const wanted = (d: Disagreement) => !(options.unresolvedOnly === true && d.gold === 'done');
  let at = seq;
  for (;;) {
    const page = direction === 1 ? await utterancePage(db, projectId, at, PAGE) : await pageBefore(db, projectId, at ?? Number.MAX_SAFE_INTEGER, PAGE);
    if (page.length === 0) return undefined;
    const found = (await pageDisagreements(db, page, a, b)).find(wanted);
    if (found !== undefined) return found;
    at = (page[page.length - 1] as UtteranceRow).seq;
  }
}

/** One disagreement by utterance id; undefined when the two layers agree or one is missing. */
export async function disagreementGet(db: SlotsmithDb, utteranceId: number, a: string, b: string): Promise<Disagreement | undefined> {
  const utterance = await db.utterances.get(utteranceId);
  if (utterance === undefined) return undefined;
  return (await pageDisagreements(db, [utterance], a, b))[0];
}

const CHUNK = 1000;

/** Where two annotators' layers disagree: the expensive part of the progress, free of gold. */
export interface DisagreementSet {
  shared: number;
  /** Utterance ids, ascending. */
  disagreeing: Int32Array;
}

/** Compare A's and B's layers over the project, a slice of A's layers at a time (gold is not read). */
export async function disagreementSet(db: SlotsmithDb, projectId: number, a: string, b: string): Promise<DisagreementSet> {
  const { minKey, maxKey } = Dexie;
  return db.transaction('r', [db.layers], async () => {
    const keys = await db.layers.where('[projectId+annotator+status]').between([projectId, a, minKey], [projectId, a, maxKey]).primaryKeys();
    keys.sort((x, y) => x[0] - y[0]);
    let shared = 0;
    const disagreeing: number[] = [];
    for (let i = 0; i < keys.length; i += CHUNK) {
      const slice = keys.slice(i, i + CHUNK);
      const ids = slice.map(([id]) => id);
      const [layersA, layersB] = await Promise.all([db.layers.bulkGet(slice), db.layers.bulkGet(ids.map((id): LayerKey => [id, b]))]);
      layersA.forEach((la, j) => {
        const lb = layersB[j];
        if (la === undefined || lb === undefined) return;
        shared++;
        if (layersDisagreement(la, lb) !== null) disagreeing.push(ids[j] as number);
      });
    }
    return { shared, disagreeing: Int32Array.from(disagreeing) };
  });
}

/** Utterance ids whose gold layer is done, ascending: index keys only, no rows read. */
export async function goldDoneIds(db: SlotsmithDb, projectId: number): Promise<Int32Array> {
  const keys = await db.layers.where('[projectId+annotator+status]').equals([projectId, ANNOTATOR_GOLD, 'done']).primaryKeys();
  return Int32Array.from(keys, ([id]) => id).sort();
}

/** The progress from its two parts (both ascending): a merge, no lookups. */
export function summaryFrom(set: DisagreementSet, goldDone: Int32Array): DisagreementSummary {
  let resolved = 0;
  let g = 0;
  for (const id of set.disagreeing) {
    while (g < goldDone.length && (goldDone[g] as number) < id) g++;
    if (goldDone[g] === id) resolved++;
  }
  return { shared: set.shared, disagreeing: set.disagreeing.length, resolved };
}

/**
 * Counts over the whole project. A screen should watch `disagreementSet` and `goldDoneIds` apart
 * (see ResolveView): a gold save then re-reads only gold's index keys, not every layer of A and B.
 */
export async function disagreementSummary(db: SlotsmithDb, projectId: number, a: string, b: string): Promise<DisagreementSummary> {
  return summaryFrom(await disagreementSet(db, projectId, a, b), await goldDoneIds(db, projectId));
}
