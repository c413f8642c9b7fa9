/**
 * Backup writer: JSON Lines, a header line then one record per line. Lines rather than one JSON
 * document so a 100k-utterance project never needs one giant string: the database side encodes
 * record by record and hands the lines to a Blob, and the reader reports problems by file line.
 * Keys are written in one fixed order and absent optional fields are omitted, so equal data always
 * gives equal bytes.
 */
import type { ReadError } from '../types';
import {
  BACKUP_FORMAT,
  BACKUP_FORMAT_VERSION,
  type AnnotatorInfo,
  type BackupData,
  type BackupHeader,
  type BackupHistory,
  type BackupLayer,
  type BackupUtterance,
  type BatchInfo,
  type LayerContent,
  type ProjectInfo,
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

export function backupProjectEncode(p: ProjectInfo): string {
  const { name, created, updated, tokeniser, scheme, schema } = p;
  const tokeniserCanonical = tokeniser.kind === 'regex' ? { kind: tokeniser.kind, pattern: tokeniser.pattern, flags: tokeniser.flags } : { kind: tokeniser.kind };
  return JSON.stringify({ type: 'project', name, created, updated, tokeniser: tokeniserCanonical, scheme, schema: schemaCanonical(schema) });
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
