/**
 * The agreement dashboard's computation: read the chosen layers, align them, compute every figure of
 * the agreement core (intervals by its bootstrap, in steps so progress can be shown), agreement over
 * time, and the texts of the top disagreeing utterances. Apart from the worker entry so tests run it
 * on fake-indexeddb.
 */
import {
  agreementIntervalsAdd,
  agreementPrepare,
  bootstrapPatchPlan,
  bootstrapPatchRange,
  totalsAdd,
  bootstrapTotalsRange,
  resampleValuesFromTotals,
  type AgreementReport,
  type AlignedCorpus,
  type AlignError,
  type BootstrapJob,
  type Disagreement,
} from '../core/agreement';
import type { LayerStatus } from '../core/backup/model';
import type { AgreementCache } from '../db/agreement-cache';
import { corpusIndexSignature } from '../db/corpus-index';
import type { SlotsmithDb } from '../db/schema';
import { gatheredAlign, gatheredFromCopy, LayerGathering, updatedByPosition, type GatheredLayer } from './agreement-gather';
import { copiesAlign } from './copies-align';
import { layersExist, layersScan } from './agreement-read';
import { layerCopiesFor } from './layer-copies';
import { layerCopyHas } from '../db/layer-copy';
import type { LayerCopyStore } from '../db/layer-copy-store';
import type { BootstrapStore } from '../db/bootstrap-store';
import { totalsJoin, type BootstrapPatchRunner } from './agreement-parallel';
import { agreementOverTime, type TimePoint } from './agreement-time';

export interface AgreementRequest {
  projectId: number;
  /** Layers to align, two or more distinct annotators (people, `gold` or `model`). */
  annotators: string[];
  /** The two the two-layer figures compare; both must be in `annotators`. */
  pair: [string, string];
  statuses: LayerStatus[];
  /** Bootstrap resamples (default 1000, as the command line's `agree`); 0 = no intervals. */
  bootstrap?: number;
  seed?: number;
  /** Most disagreeing utterances listed (default 100). */
  disagreementLimit?: number;
}

export interface AgreementProgress {
  phase: 'reading' | 'computing' | 'intervals';
  done: number;
  total: number;
}

export interface DisagreementRow extends Disagreement {
  utteranceId: number;
  externalId?: string;
  text: string;
}

export interface LayerCounted {
  annotator: string;
  layers: number;
  statuses: Partial<Record<LayerStatus, number>>;
}

export interface AgreementResult {
  ok: true;
  report: AgreementReport;
  overTime: TimePoint[];
  counted: LayerCounted[];
  statuses: LayerStatus[];
  disagreements: DisagreementRow[];
  /** Reading the layers; every figure but the intervals (`pointMs`, from the start); all of it; and each step (ms). */
  timings: { readMs: number; pointMs: number; computeMs: number; totalMs: number; steps: Record<string, number> };
  /** True on the early result handed to `onPoint`: the intervals are still being resampled. */
  intervalsPending: boolean;
  /** Set when the figures come from the cache: when they were computed (ms since the epoch); the layers have not changed since. */
  keptFrom?: number;
}

export interface AgreementFailure {
  ok: false;
  message: string;
  errors?: AlignError[];
}

export type AgreementOutcome = AgreementResult | AgreementFailure;

// Resamples per step: one step of 100k utterances stays well under a second, so progress moves.
const BOOTSTRAP_STEP = 100;
// The texts are a preview in the list: long messages are cut so the result stays small.
const PREVIEW_CHARS = 160;

function requestCheck(request: AgreementRequest): string | null {
  const { annotators, pair } = request;
  if (new Set(annotators).size !== annotators.length) return 'Each layer can be chosen once.';
  if (annotators.length < 2) return 'Choose at least two annotators to compare.';
  if (pair[0] === pair[1]) return 'Choose two different annotators to compare.';
  if (!annotators.includes(pair[0]) || !annotators.includes(pair[1])) return 'The compared pair must be among the chosen layers.';
  if (request.statuses.length === 0) return 'Choose at least one layer status to count.';
  return null;
}

async function disagreementRows(db: SlotsmithDb, items: readonly Disagreement[]): Promise<DisagreementRow[]> {
  const ids = items.map((d) => Number(d.id));
  const rows = await db.utterances.bulkGet(ids);
  return items.map((d, i) => {
    const row = rows[i];
    const text = row?.text ?? '';
    const out: DisagreementRow = { ...d, utteranceId: ids[i] as number, text: text.length > PREVIEW_CHARS ? `${text.slice(0, PREVIEW_CHARS - 1)}…` : text };
    if (row?.externalId !== undefined) out.externalId = row.externalId;
    return out;
  });
}

const now = () => performance.now();

function layersCounted(layers: readonly GatheredLayer[]): LayerCounted[] {
  return layers.map((l) => ({ annotator: l.annotator, layers: l.data.count, statuses: l.statuses }));
}

/** Totals of resamples [0, job.resamples) of the core's bootstrap, joined in order; may spread them over threads. */
export type BootstrapRunner = (job: BootstrapJob, onProgress: (done: number) => void) => Promise<Float64Array>;

/** On this thread, in steps, so progress can be reported between them. */
export const bootstrapHere: BootstrapRunner = (job, onProgress) => {
  const parts: Float64Array[] = [];
  for (let from = 0; from < job.resamples; from += BOOTSTRAP_STEP) {
    onProgress(from);
    parts.push(bootstrapTotalsRange(job.rows, job.layout, job.seed, from, Math.min(job.resamples, from + BOOTSTRAP_STEP)));
  }
  return Promise.resolve(totalsJoin(parts));
};

/** Kept totals patched on this thread, in steps, so progress can be reported between them. */
export const patchHere: BootstrapPatchRunner = (plan, kept, onProgress) => {
  const totals = kept.slice();
  const resamples = kept.length / plan.width;
  for (let from = 0; from < resamples; from += BOOTSTRAP_STEP) {
    onProgress(from);
    totalsAdd(totals, bootstrapPatchRange(plan, from, Math.min(resamples, from + BOOTSTRAP_STEP)), from, plan.width);
  }
  return Promise.resolve(totals);
};

export interface AgreementRunOptions {
  /** The figures without intervals, as soon as they are known (the intervals take longest). */
  onPoint?: (early: AgreementResult) => void;
  bootstrap?: BootstrapRunner;
  /** Brings kept totals up to date (default: on this thread). */
  patch?: BootstrapPatchRunner;
  /** Results kept from earlier runs on unchanged layers (see `agreementCacheOpen`). */
  cache?: AgreementCache<AgreementResult>;
  /** Compute from the database even when figures, layer copies or totals are kept ("Compute again"); the new ones replace them. */
  fresh?: boolean;
  /** Compact copies of the layers kept between runs (see layer-copies.ts); without, every layer is read each run. */
  copies?: LayerCopyStore;
  /** The last bootstrap totals per choice of layers: after an edit they are patched, not resampled (core `bootstrapTotalsPatched`). */
  totals?: BootstrapStore;
  /**
   * Given, the result is answered before what is stored for the next run is written, and the
   * writing is handed over: for a worker the page keeps alive (its memory stores hold the entries
   * already). Without, the run waits for the writes (the page may end the worker once answered).
   */
  storeAfter?: (writing: Promise<void>) => void;

}

/** One cache entry per choice that changes the figures. */
function requestKey(request: AgreementRequest): string {
  const { annotators, pair, statuses } = request;
  return JSON.stringify([annotators, pair, [...statuses].sort(), request.bootstrap ?? 1000, request.seed ?? 1, request.disagreementLimit ?? 100]);
}

export async function agreementRun(
  db: SlotsmithDb,
  request: AgreementRequest,
  onProgress: (p: AgreementProgress) => void = () => {},
  options: AgreementRunOptions = {},
): Promise<AgreementOutcome> {
  const problem = requestCheck(request);
  if (problem !== null) return { ok: false, message: problem };
  const started = now();
  const steps: Record<string, number> = {};
  let stepAt = started;
  const step = (name: string) => {
    const t = now();
    steps[name] = t - stepAt;
    stepAt = t;
  };
  const { projectId, annotators, statuses } = request;
  const { cache } = options;
  // Taken before reading: a change during the run leaves a signature the next visit will not match.
  const signature = cache === undefined && options.copies === undefined ? null : await corpusIndexSignature(db, projectId);
  if (cache !== undefined && signature !== null && options.fresh !== true) {
    const hit = await cache.load(projectId, requestKey(request), signature);
    if (hit !== undefined) {
      const ms = now() - started;
      return { ...hit.result, timings: { readMs: ms, pointMs: ms, computeMs: 0, totalMs: ms, steps: { cache: ms } }, keptFrom: hit.saved };
    }
  }
  step('cache');
  // What is being stored for the next run: awaited before the result, as the page ends this worker once it has it.
  const stores: Promise<void>[] = [];
  const reading = (p: { done: number; total: number }) => onProgress({ phase: 'reading', ...p });
  let corpus: AlignedCorpus;
  let counted: LayerCounted[];
  let updated: Float64Array[];
  let readAt: number;
  if (options.copies !== undefined && signature !== null) {
    const { copies, saved } = await layerCopiesFor(db, options.copies, projectId, annotators, signature, reading, steps, options.fresh === true);
    stores.push(saved);
    const empty = annotators.filter((_, i) => !layerCopyHas(copies[i] as (typeof copies)[number], statuses));
    if (empty.length > 0) return { ok: false, message: `No layers of ${empty.join(', ')} with status ${statuses.join(' or ')}: nothing to compare.` };
    step('copies');
    readAt = now();
    onProgress({ phase: 'computing', done: 0, total: 1 });
    const direct = copiesAlign(copies, statuses);
    if (direct !== null) {
      ({ corpus, counted, updated } = direct);
    } else {
      // Token counts differ between layers of one utterance: the general path says where.
      const layers = copies.map((c) => gatheredFromCopy(c, statuses));
      const aligned = gatheredAlign(layers);
      if (!aligned.ok) return { ok: false, message: `The layers do not line up (${aligned.errorCount} problems).`, errors: aligned.errors };
      ({ corpus } = aligned);
      counted = layersCounted(layers);
      updated = updatedByPosition(corpus.ids, layers);
    }
    step('align');
  } else {
    // Existence only: counting walks every index entry (seconds at 100k on disk); the gatherers grow as they go.
    const present = await Promise.all(annotators.map((a) => layersExist(db, projectId, a, statuses)));
    const empty = annotators.filter((_, i) => !present[i]);
    if (empty.length > 0) return { ok: false, message: `No layers of ${empty.join(', ')} with status ${statuses.join(' or ')}: nothing to compare.` };
    step('count');
    const gathering = new LayerGathering(annotators);
    await layersScan(db, { projectId, annotators, statuses }, (row) => gathering.rowAdd(row), reading, undefined, steps);
    const layers = gathering.done();
    step('gather');
    readAt = now();
    onProgress({ phase: 'computing', done: 0, total: 1 });
    const aligned = gatheredAlign(layers);
    if (!aligned.ok) return { ok: false, message: `The layers do not line up (${aligned.errorCount} problems).`, errors: aligned.errors };
    ({ corpus } = aligned);
    counted = layersCounted(layers);
    updated = updatedByPosition(corpus.ids, layers);
    step('align');
  }
  const a = annotators.indexOf(request.pair[0]);
  const b = annotators.indexOf(request.pair[1]);
  const pending = agreementPrepare(corpus, { layers: [a, b], bootstrap: request.bootstrap ?? 1000, seed: request.seed ?? 1, disagreementLimit: request.disagreementLimit ?? 100 });
  step('figures');
  const overTime = agreementOverTime(corpus, a, b, updated);
  step('over time');
  const disagreements = await disagreementRows(db, pending.report.disagreements.items);
  step('texts');
  const pointAt = now();
  const { job } = pending;
  const result = (report: AgreementReport, intervalsPending: boolean): AgreementResult => {
    const at = now();
    return {
      ok: true,
      report,
      overTime,
      counted,
      statuses: [...statuses],
      disagreements,
      timings: { readMs: readAt - started, pointMs: pointAt - started, computeMs: at - readAt, totalMs: at - started, steps: { ...steps } },
      intervalsPending,
    };
  };
  // Copies, totals and figures stored for the next run: awaited, unless the caller outlives the answer (`storeAfter`).
  const storesFinish = async (report: AgreementReport): Promise<AgreementResult> => {
    const save = async (final: AgreementResult) => {
      if (cache !== undefined && signature !== null) await cache.save(projectId, requestKey(request), signature, final);
    };
    if (options.storeAfter !== undefined) {
      const final = result(report, false);
      // The figures (small) are saved at once, so a reopened screen finds them even while the copies and totals are still being written.
      options.storeAfter(Promise.all([...stores, save(final)]).then(() => undefined));
      return final;
    }
    await Promise.all(stores);
    step('stored');
    const final = result(report, false);
    await save(final);
    return final;
  };
  if (job === null) return storesFinish(pending.report);
  options.onPoint?.(result(structuredClone(pending.report), true));
  const intervals = (done: number) => onProgress({ phase: 'intervals', done, total: job.resamples });
  const key = requestKey(request);
  // "Compute again" resamples from scratch, as it reads every layer again.
  const kept = options.totals === undefined || options.fresh === true ? undefined : await options.totals.load(projectId, key);
  const plan = kept === undefined ? null : bootstrapPatchPlan(kept, job.rows, job.layout, job.seed);
  step(plan === null ? 'totals kept: none' : `totals kept (${plan.positions.length} utterances changed)`);
  const totals = kept !== undefined && plan !== null ? await (options.patch ?? patchHere)(plan, kept.totals, intervals) : await (options.bootstrap ?? bootstrapHere)(job, intervals);
  step(plan === null ? 'bootstrap' : 'totals patched');
  if (options.totals !== undefined) stores.push(options.totals.save(projectId, key, { rows: job.rows, layout: job.layout, seed: job.seed, totals }));
  const report = agreementIntervalsAdd(pending, resampleValuesFromTotals(totals, job.layout));
  step('intervals');
  return storesFinish(report);
}
