/**
 * Backup reader: validate → lenient restore → typed model. Incremental (`push` text chunks, then
 * `end`), never throws on bad input, and reports problems by 1-based file line. A file from a newer
 * Slotsmith is refused outright rather than half understood.
 */
import type { ReadError } from '../types';
import { backupCheck, type RecordsRead } from './decode-check';
import { FieldReader, isPlainObject, type Issues } from './fields';
import { BACKUP_FORMAT, BACKUP_FORMAT_VERSION, type BackupDecodeResult, type BackupHeader } from './model';
import { annotatorRead, batchRead, historyRead, layerRead, projectRead, utteranceRead } from './records';

const ERRORS_MAX = 200;

export interface BackupReader {
  push(chunk: string): void;
  end(): BackupDecodeResult;
}

type Counts = BackupHeader['counts'];
const COUNTED = ['annotators', 'batches', 'utterances', 'layers', 'history'] as const;
const COUNT_OF_TYPE: Record<string, keyof Counts> = {
  annotator: 'annotators',
  batch: 'batches',
  utterance: 'utterances',
  layer: 'layers',
  history: 'history',
};

export function backupNewerMessage(version: number): string {
  return `made by a newer Slotsmith (format ${version}); this version reads up to ${BACKUP_FORMAT_VERSION}`;
}

function headerRead(value: unknown, issues: Issues): Counts | null | 'refused' {
  if (!isPlainObject(value) || value.format !== BACKUP_FORMAT) {
    issues.errors.push({ line: 1, message: `not a Slotsmith backup: the first line must be a "${BACKUP_FORMAT}" header` });
    return 'refused';
  }
  const version = value.formatVersion;
  if (!Number.isSafeInteger(version) || (version as number) < 1) {
    issues.errors.push({ line: 1, message: `"formatVersion" must be a whole number from 1, not ${JSON.stringify(version)}` });
    return 'refused';
  }
  if ((version as number) > BACKUP_FORMAT_VERSION) {
    issues.errors.push({ line: 1, message: backupNewerMessage(version as number) });
    return 'refused';
  }
  if (value.counts === undefined) return null;
  const r = new FieldReader({ counts: value.counts }, 1, issues, 'header');
  const c = r.object('counts', 'counts');
  if (c === null) return null;
  const counts = Object.fromEntries(COUNTED.map((k) => [k, c.integer(k)])) as Counts;
  return r.failed ? null : counts;
}

export function backupReader(): BackupReader {
  const issues: Issues = { errors: [], warnings: [] };
  const read: RecordsRead = { projects: [], annotators: [], batches: [], utterances: [], layers: [], history: [] };
  const seen: Counts = { annotators: 0, batches: 0, utterances: 0, layers: 0, history: 0 };
  let expected: Counts | null = null;
  let refused = false;
  let lineNo = 0;
  let pending = '';

  function recordRead(value: unknown, line: number): void {
    if (!isPlainObject(value)) {
      issues.errors.push({ line, message: 'a record must be a JSON object' });
      return;
    }
    const type = value.type;
    const counted = typeof type === 'string' ? COUNT_OF_TYPE[type] : undefined;
    if (counted !== undefined) seen[counted]++;
    const r = new FieldReader(value, line, issues, typeof type === 'string' ? type : 'record');
    switch (type) {
      case 'project': return void read.projects.push({ line, record: projectRead(r) });
      case 'annotator': return void read.annotators.push({ line, record: annotatorRead(r) });
      case 'batch': return void read.batches.push({ line, record: batchRead(r) });
      case 'utterance': return void read.utterances.push({ line, record: utteranceRead(r) });
      case 'layer': return void read.layers.push({ line, record: layerRead(r) });
      case 'history': return void read.history.push({ line, record: historyRead(r) });
      default: issues.errors.push({ line, message: `unknown record type ${JSON.stringify(type)}` });
    }
  }

  function lineRead(raw: string): void {
    lineNo++;
    if (refused || issues.errors.length >= ERRORS_MAX) return;
    let text = raw.endsWith('\r') ? raw.slice(0, -1) : raw;
    if (lineNo === 1 && text.charCodeAt(0) === 0xfeff) text = text.slice(1);
    if (lineNo > 1 && text.trim() === '') return;
    let value: unknown;
    try {
      value = JSON.parse(text);
    } catch {
      if (lineNo === 1) {
        issues.errors.push({ line: 1, message: `not a Slotsmith backup: the first line must be a "${BACKUP_FORMAT}" header` });
        refused = true;
      } else issues.errors.push({ line: lineNo, message: 'not valid JSON' });
      return;
    }
    if (lineNo > 1) return recordRead(value, lineNo);
    const header = headerRead(value, issues);
    if (header === 'refused') refused = true;
    else expected = header;
  }

  return {
    push(chunk: string): void {
      let from = 0;
      for (let nl = chunk.indexOf('\n'); nl !== -1; nl = chunk.indexOf('\n', from)) {
        lineRead(pending + chunk.slice(from, nl));
        pending = '';
        from = nl + 1;
      }
      pending += chunk.slice(from);
    },
    end(): BackupDecodeResult {
      if (pending !== '' || lineNo === 0) lineRead(pending);
      pending = '';
      if (!refused) {
        for (const key of COUNTED) {
          if (expected !== null && expected[key] !== seen[key]) {
            issues.errors.push({ line: lineNo, message: `the backup is incomplete or altered: its header lists ${expected[key]} ${key}, the file holds ${seen[key]}` });
          }
        }
        if (issues.errors.length === 0) {
          const data = backupCheck(read, issues, lineNo);
          if (data !== null && issues.errors.length === 0) return { ok: true, data, warnings: issues.warnings };
        }
      }
      const errors: ReadError[] = issues.errors.slice(0, ERRORS_MAX);
      return { ok: false, errors };
    },
  };
}

export function backupDecode(text: string): BackupDecodeResult {
  const reader = backupReader();
  reader.push(text);
  return reader.end();
}
