/**
 * Backup writer: JSON Lines, a header line then one record per line. Lines rather than one JSON
 * document so a 100k-utterance project never needs one giant string: the database side encodes
 * record by record and hands the lines to a Blob, and the reader reports problems by file line.
 * Keys are written in one fixed order and absent optional fields are omitted, so equal data always
 * gives equal bytes.
 */
import type { SpanEvaluation, SpanFigures } from '../crf/evaluate';
import type { ReadError } from '../types';
import {
  BACKUP_FORMAT,
  BACKUP_FORMAT_VERSION,
  type AnnotatorInfo,
  type BackupData,
  type BackupDismissal,
  type BackupExchange,
  type BackupModel,
  type BackupProject,
  type BackupHeader,
  type BackupHistory,
  type BackupLayer,
  type BackupUtterance,
  type BatchInfo,
  type LayerContent,
  type ProjectSchema,
} from './model';

export function backupHeaderEncode(created: string, counts: BackupHeader['counts']): string {
  const header: BackupHeader = { format: BACKUP_FORMAT, formatVersion: BACKUP_FORMAT_VERSION, created, counts };
  return JSON.stringify(header);
}

function schemaCanonical(schema: ProjectSchema): ProjectSchema {
  return {
    slots: schema.slots.map((s) => ({
      name: s.name,
      key: s.key,
      colour: s.colour,
      description: s.description,
      examples: s.examples,
      intents: s.intents,
    })) as ProjectSchema['slots'],
    intents: schema.intents.map((i) => ({ name: i.name, description: i.description })) as ProjectSchema['intents'],
  };
}

function exchangeCanonical(e: BackupExchange): BackupExchange {
  const packs = e.packs.map((p) => ({ id: p.id, annotator: p.annotator, created: p.created, seqs: p.seqs }));
  return { uid: e.uid, role: e.role, name: e.name, packs } as BackupExchange;
}

/** Entries sorted by key in code-unit order, so the bytes depend on the keys alone, not on insertion order. */
function recordCanonical<T, U>(record: Readonly<Record<string, T>>, value: (v: T) => U): Record<string, U> {
  const keys = Object.keys(record).sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  // fromEntries defines own properties, so even a "__proto__" key stays a plain entry.
  return Object.fromEntries(keys.map((k) => [k, value(record[k] as T)]));
}

function figuresCanonical(f: SpanFigures): SpanFigures {
  return { truePositives: f.truePositives, falsePositives: f.falsePositives, falseNegatives: f.falseNegatives, precision: f.precision, recall: f.recall, f1: f.f1 };
}

function evaluationCanonical(e: SpanEvaluation): SpanEvaluation {
  return { slots: recordCanonical(e.slots, figuresCanonical), overall: figuresCanonical(e.overall), utterances: e.utterances, exactUtterances: e.exactUtterances };
}

function modelCanonical(m: BackupModel): BackupModel {
  const cv = m.crossValidation;
  const crossValidation = cv === null ? null : { folds: cv.folds, pooled: evaluationCanonical(cv.pooled), perFold: cv.perFold.map(evaluationCanonical) };
  // The model file text is kept as a string, byte for byte: it is what model-repo stores.
  return { json: m.json, saved: m.saved, origin: m.origin, crossValidation };
}

function dismissedCanonical(d: Readonly<Record<string, BackupDismissal>> | undefined): Record<string, BackupDismissal> | undefined {
  // None and empty are the same to findings-repo, which never stores {}.
  if (d === undefined || Object.keys(d).length === 0) return undefined;
  return recordCanonical(d, (x) => ({ when: x.when, who: x.who }));
}

/** The extras come last, the model last of all: its file text can be long. Absent ones are not written. */
export function backupProjectEncode(p: BackupProject): string {
  const { name, created, updated, tokeniser, scheme, schema } = p;
  const tokeniserCanonical = tokeniser.kind === 'regex' ? { kind: tokeniser.kind, pattern: tokeniser.pattern, flags: tokeniser.flags } : { kind: tokeniser.kind };
  return JSON.stringify({
    type: 'project',
    name,
    created,
    updated,
    tokeniser: tokeniserCanonical,
    scheme,
    schema: schemaCanonical(schema),
    exchange: p.exchange === undefined ? undefined : exchangeCanonical(p.exchange),
    dismissed: dismissedCanonical(p.dismissed),
    model: p.model === undefined ? undefined : modelCanonical(p.model),
  });
}

export function backupAnnotatorEncode(a: AnnotatorInfo): string {
  return JSON.stringify({ type: 'annotator', id: a.id, name: a.name, role: a.role });
}

function warningsCanonical(warnings: ReadError[]): ReadError[] {
  return warnings.map((w) => ({ line: w.line, message: w.message }));
}

export function backupBatchEncode(b: BatchInfo): string {
  const counts = { utterances: b.counts.utterances, tokens: b.counts.tokens, layers: b.counts.layers };
  return JSON.stringify({
    type: 'batch',
    fileName: b.fileName,
    format: b.format,
    annotator: b.annotator,
    layerStatus: b.layerStatus,
    counts,
    attached: b.attached,
    warnings: warningsCanonical(b.warnings),
    state: b.state,
    created: b.created,
    finished: b.finished,
    failure: b.failure,
  });
}

export function backupUtteranceEncode(u: BackupUtterance): string {
  return JSON.stringify({
    type: 'utterance',
    seq: u.seq,
    text: u.text,
    tokens: u.tokens,
    externalId: u.externalId,
    intentHint: u.intentHint,
    meta: u.meta,
    batch: u.batch,
    line: u.line,
  });
}

function contentCanonical(c: LayerContent): LayerContent {
  return { tags: c.tags, intent: c.intent, status: c.status, note: c.note, revision: c.revision, updated: c.updated };
}

export function backupLayerEncode(l: BackupLayer): string {
  return JSON.stringify({ type: 'layer', seq: l.seq, annotator: l.annotator, ...contentCanonical(l), batch: l.batch });
}

export function backupHistoryEncode(h: BackupHistory): string {
  const before = h.before === null ? null : contentCanonical(h.before);
  return JSON.stringify({ type: 'history', seq: h.seq, annotator: h.annotator, before, after: contentCanonical(h.after), who: h.who, when: h.when });
}

/** Every line of a backup of `data`, without line breaks, in file order. */
export function* backupLines(data: BackupData, created: string): Generator<string> {
  yield backupHeaderEncode(created, {
    annotators: data.annotators.length,
    batches: data.batches.length,
    utterances: data.utterances.length,
    layers: data.layers.length,
    history: data.history.length,
  });
  yield backupProjectEncode(data.project);
  for (const a of data.annotators) yield backupAnnotatorEncode(a);
  for (const b of data.batches) yield backupBatchEncode(b);
  for (const u of data.utterances) yield backupUtteranceEncode(u);
  for (const l of data.layers) yield backupLayerEncode(l);
  for (const h of data.history) yield backupHistoryEncode(h);
}

/** The whole backup as one string, each line ending in LF (for small projects and tests). */
export function backupEncode(data: BackupData, created: string): string {
  let out = '';
  for (const line of backupLines(data, created)) out += `${line}\n`;
  return out;
}
