/**
 * The export pipeline over the database: read the project page by page, choose each utterance's
 * layer, check for illegal transitions, then write the files in chunks. Kept apart from the worker
 * entry so it runs the same in tests (fake-indexeddb) and in the browser worker.
 */
import {
  exportCheck,
  exportChunks,
  exportSelect,
  LAYER_STATUSES,
  layerChoose,
  policyAnnotators,
  type ExportFormat,
  type ExportItem,
  type ExportPartName,
  type ExportSelection,
  type LayerCandidate,
  type LayerPolicy,
  type LayerStatus,
  type SelectionReport,
  type SplitOptions,
} from '../core/export';
import type { MaskKind } from '../core/privacy';
import { layersOf, tokensUnpack, utteranceCount, utterancePage, type LayerRow, type SlotsmithDb, type UtteranceRow } from '../db';

export interface ExportRequest {
  projectId: number;
  policy: LayerPolicy;
  statuses: LayerStatus[];
  format: ExportFormat;
  /** Absent: one file. */
  split?: SplitOptions;
  mask: MaskKind[];
  /** Write even with illegal transitions (IOB2 keeps them; BIOES and JSON Lines read them leniently). */
  asIs: boolean;
}

export interface ExportProgress {
  phase: 'reading' | 'writing';
  done: number;
  total: number;
}

/** One illegal transition, with what the refusal list shows. */
export interface ExportRefusal {
  seq: number;
  id: string | undefined;
  annotator: string;
  tokenIndex: number;
  token: string;
  tag: string;
  message: string;
}

export interface ExportedPart {
  part: ExportPartName;
  blob: Blob;
  count: number;
}

export type ExportOutcome =
  | { kind: 'refused'; violations: ExportRefusal[]; utterances: number; report: SelectionReport }
  | { kind: 'empty'; report: SelectionReport }
  | { kind: 'written'; files: ExportedPart[]; report: SelectionReport };

/** Utterances per read page: small enough to keep reads short, large enough to amortise each. */
export const EXPORT_PAGE_SIZE = 500;
const WRITE_CHUNK = 1000;

const MIME: Record<ExportFormat, string> = {
  iob2: 'text/plain;charset=utf-8',
  bioes: 'text/plain;charset=utf-8',
  jsonl: 'application/x-ndjson;charset=utf-8',
};

function itemOf(row: UtteranceRow, layers: LayerCandidate[]): ExportItem {
  return { id: row.externalId, text: row.text, tokens: tokensUnpack(row.tokens), meta: row.meta, layers };
}

function candidateOf(row: LayerRow): LayerCandidate {
  return { annotator: row.annotator, tags: row.tags, intent: row.intent, status: row.status };
}

function reportAdd(into: SelectionReport, page: SelectionReport): void {
  into.total += page.total;
  into.kept += page.kept;
  into.missingLayer += page.missingLayer;
  for (const s of LAYER_STATUSES) into.filteredByStatus[s] += page.filteredByStatus[s];
}

/**
 * The chosen layer of every utterance, in project order, with each kept utterance's seq.
 * One read transaction, so a concurrent edit in another tab cannot give a half-old, half-new file.
 */
export async function exportGather(
  db: SlotsmithDb,
  request: Pick<ExportRequest, 'projectId' | 'policy' | 'statuses'>,
  onProgress: (p: ExportProgress) => void = () => {},
): Promise<{ selection: ExportSelection; seqs: number[] }> {
  const annotators = policyAnnotators(request.policy);
  const options = { policy: request.policy, statuses: request.statuses };
  const statusSet = new Set<LayerStatus>(request.statuses);
  return db.transaction('r', [db.utterances, db.layers], async () => {
    const total = await utteranceCount(db, request.projectId);
    const selection: ExportSelection = {
      utterances: [],
      annotators: [],
      report: { total: 0, kept: 0, missingLayer: 0, filteredByStatus: Object.fromEntries(LAYER_STATUSES.map((s) => [s, 0])) as Record<LayerStatus, number> },
    };
    const seqs: number[] = [];
    let after: number | null = null;
    for (;;) {
      const rows = await utterancePage(db, request.projectId, after, EXPORT_PAGE_SIZE);
      if (rows.length === 0) break;
      const ids = rows.map((r) => r.id);
      const perAnnotator = await Promise.all(annotators.map((a) => layersOf(db, ids, a)));
      const items = rows.map((row, i) =>
        itemOf(
          row,
          perAnnotator.flatMap((layers) => {
            const layer = layers[i];
            return layer === undefined ? [] : [candidateOf(layer)];
          }),
        ),
      );
      const page = exportSelect(items, options);
      selection.utterances.push(...page.utterances);
      selection.annotators.push(...page.annotators);
      // The same choice exportSelect made, to remember which rows were kept (for the refusal list).
      rows.forEach((row, i) => {
        if ('layer' in layerChoose((items[i] as ExportItem).layers, annotators, statusSet)) seqs.push(row.seq);
      });
      reportAdd(selection.report, page.report);
      after = (rows[rows.length - 1] as UtteranceRow).seq;
      onProgress({ phase: 'reading', done: selection.report.total, total });
      if (rows.length < EXPORT_PAGE_SIZE) break;
    }
    return { selection, seqs };
  });
}

/** The refusal list: each violation with its utterance's seq, token text and tag. */
export function exportRefusals(selection: ExportSelection, seqs: readonly number[]): ExportRefusal[] {
  return exportCheck(selection).map((v) => {
    const u = selection.utterances[v.position];
    const token = u?.tokens[v.index];
    return {
      seq: seqs[v.position] ?? 0,
      id: v.id,
      annotator: v.annotator ?? '',
      tokenIndex: v.index,
      token: u === undefined || token === undefined ? '' : u.text.slice(token.start, token.end),
      tag: u?.tags[v.index] ?? '',
      message: v.message,
    };
  });
}

/**
 * Read, check and write. Illegal transitions without `asIs` give the refusal list and write
 * nothing; otherwise each part becomes one Blob built from the streamed chunks (never one string).
 */
export async function exportRun(db: SlotsmithDb, request: ExportRequest, onProgress: (p: ExportProgress) => void = () => {}): Promise<ExportOutcome> {
  const { selection, seqs } = await exportGather(db, request, onProgress);
  const { report } = selection;
  if (!request.asIs) {
    const violations = exportRefusals(selection, seqs);
    if (violations.length > 0) return { kind: 'refused', violations, utterances: new Set(violations.map((v) => v.seq)).size, report };
  }
  if (selection.utterances.length === 0) return { kind: 'empty', report };
  const pieces = new Map<ExportPartName, { texts: string[]; count: number }>();
  let previousDone = 0;
  // Checked above: with no violation left, as-is writes the same bytes, without checking again.
  const options = { format: request.format, mask: request.mask, asIs: true, ...(request.split === undefined ? {} : { split: request.split }) };
  for (const chunk of exportChunks(selection, options, WRITE_CHUNK)) {
    let part = pieces.get(chunk.part);
    if (part === undefined) pieces.set(chunk.part, (part = { texts: [], count: 0 }));
    part.texts.push(chunk.text);
    part.count += chunk.done - previousDone;
    previousDone = chunk.done;
    onProgress({ phase: 'writing', done: chunk.done, total: chunk.total });
  }
  const files = [...pieces].map(([part, { texts, count }]) => ({ part, count, blob: new Blob(texts, { type: MIME[request.format] }) }));
  return { kind: 'written', files, report };
}
