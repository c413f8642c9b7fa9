/**
 * The agreement dashboard's computation: read the chosen layers, align them, compute every figure of
 * the agreement core (intervals by its bootstrap, in steps so progress can be shown), agreement over
 * time, and the texts of the top disagreeing utterances. Apart from the worker entry so tests run it
 * on fake-indexeddb.
 */
import {
  agreementIntervalsAdd,
  agreementPrepare,
  bootstrapRange,
  resampleValuesJoin,
  type AgreementReport,
  type AlignError,
  type Disagreement,
  type ResampleValues,
} from '../core/agreement';
import type { LayerStatus } from '../core/backup/model';
import type { SlotsmithDb } from '../db/schema';
import { gatheredAlign, LayerGathering, updatedByPosition } from './agreement-gather';
import { layersScan } from './agreement-read';
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
  timings: { readMs: number; computeMs: number; totalMs: number };
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

export async function agreementRun(db: SlotsmithDb, request: AgreementRequest, onProgress: (p: AgreementProgress) => void = () => {}): Promise<AgreementOutcome> {
  const problem = requestCheck(request);
  if (problem !== null) return { ok: false, message: problem };
  const started = now();
  const { projectId, annotators, statuses } = request;
  const sizes = await Promise.all(
    annotators.map(async (a) => {
      let n = 0;
      for (const s of statuses) n += await db.layers.where('[projectId+annotator+status]').equals([projectId, a, s]).count();
      return n;
    }),
  );
  const empty = annotators.filter((_, i) => sizes[i] === 0);
  if (empty.length > 0) return { ok: false, message: `No layers of ${empty.join(', ')} with status ${statuses.join(' or ')}: nothing to compare.` };
  const gathering = new LayerGathering(annotators, sizes);
  await layersScan(db, { projectId, annotators, statuses }, (row) => gathering.rowAdd(row), (p) => onProgress({ phase: 'reading', ...p }));
  const layers = gathering.done();
  const readAt = now();
  onProgress({ phase: 'computing', done: 0, total: 1 });
  const aligned = gatheredAlign(layers);
  if (!aligned.ok) return { ok: false, message: `The layers do not line up (${aligned.errorCount} problems).`, errors: aligned.errors };
  const { corpus } = aligned;
  const a = annotators.indexOf(request.pair[0]);
  const b = annotators.indexOf(request.pair[1]);
  const resamples = request.bootstrap ?? 1000;
  const seed = request.seed ?? 1;
  const pending = agreementPrepare(corpus, { layers: [a, b], bootstrap: resamples, seed, disagreementLimit: request.disagreementLimit ?? 100 });
  const { job } = pending;
  let report: AgreementReport = pending.report;
  if (job !== null) {
    const parts: ResampleValues[] = [];
    for (let from = 0; from < job.resamples; from += BOOTSTRAP_STEP) {
      onProgress({ phase: 'intervals', done: from, total: job.resamples });
      parts.push(bootstrapRange(job.rows, job.layout, job.seed, from, Math.min(job.resamples, from + BOOTSTRAP_STEP)));
    }
    report = agreementIntervalsAdd(pending, resampleValuesJoin(parts));
  }
  const overTime = agreementOverTime(corpus, a, b, updatedByPosition(corpus.ids, layers));
  const disagreements = await disagreementRows(db, report.disagreements.items);
  const finished = now();
  return {
    ok: true,
    report,
    overTime,
    counted: layers.map((l) => ({ annotator: l.annotator, layers: l.data.count, statuses: l.statuses })),
    statuses: [...statuses],
    disagreements,
    timings: { readMs: readAt - started, computeMs: finished - readAt, totalMs: finished - started },
  };
}
