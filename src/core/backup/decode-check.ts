/** Checks across records: one project, references that resolve, tags that fit their utterance. */
import type { Issues } from './fields';
import {
  ANNOTATORS_RESERVED,
  type AnnotatorInfo,
  type BackupData,
  type BackupHistory,
  type BackupLayer,
  type BackupProject,
  type BackupUtterance,
  type BatchInfo,
  type LayerContent,
} from './model';
import { dismissalsRenamed } from './dismissed';

interface Read<T> {
  line: number;
  record: T | null;
}

export interface RecordsRead {
  projects: Read<BackupProject>[];
  annotators: Read<AnnotatorInfo>[];
  batches: Read<BatchInfo>[];
  utterances: Read<BackupUtterance>[];
  layers: Read<BackupLayer>[];
  history: Read<BackupHistory>[];
}

/** Records whose own validation failed were already reported; only sound ones go on. */
function sound<T>(list: Read<T>[]): { line: number; record: T }[] {
  return list.filter((r): r is { line: number; record: T } => r.record !== null);
}

/** The typed model, or null when an error was added to `issues`. */
export function backupCheck(read: RecordsRead, issues: Issues, lastLine: number): BackupData | null {
  const errorsBefore = issues.errors.length;
  const error = (line: number, message: string) => issues.errors.push({ line, message });
  const warn = (line: number, message: string) => issues.warnings.push({ line, message });

  const [first, second] = read.projects;
  if (first === undefined) error(lastLine, 'the backup has no project record');
  if (second !== undefined) error(second.line, 'the backup has more than one project record');

  const annotators: AnnotatorInfo[] = [];
  const annotatorIds = new Set<string>(ANNOTATORS_RESERVED);
  for (const { line, record } of sound(read.annotators)) {
    if (ANNOTATORS_RESERVED.includes(record.id)) warn(line, `annotator "${record.id}" is a reserved layer name, not a person; dropped`);
    else if (annotatorIds.has(record.id)) error(line, `annotator "${record.id}" appears twice`);
    else {
      annotatorIds.add(record.id);
      annotators.push(record);
    }
  }
  const annotatorResolve = (line: number, id: string) => {
    if (annotatorIds.has(id)) return;
    warn(line, `annotator "${id}" is not listed; added`);
    annotatorIds.add(id);
    annotators.push({ id, name: id, role: 'annotator' });
  };

  const batches = sound(read.batches).map((b) => b.record);
  const batchResolve = <T extends { batch?: number }>(line: number, record: T): T => {
    if (record.batch === undefined || record.batch <= batches.length) return record;
    warn(line, `batch ${record.batch} does not exist; reference dropped`);
    const { batch: _batch, ...rest } = record;
    return rest as T;
  };

  const tokenCount = new Map<number, number>();
  const utterances: BackupUtterance[] = [];
  for (const { line, record } of sound(read.utterances)) {
    if (tokenCount.has(record.seq)) error(line, `utterance seq ${record.seq} appears twice`);
    tokenCount.set(record.seq, record.tokens.length / 2);
    utterances.push(batchResolve(line, record));
  }
  const contentFits = (line: number, seq: number, content: LayerContent, what: string): boolean => {
    const count = tokenCount.get(seq);
    if (count === undefined) error(line, `${what} refers to utterance seq ${seq}, which is not in the backup`);
    else if (content.tags.length !== count) error(line, `${what} has ${content.tags.length} tags for ${count} tokens`);
    else return true;
    return false;
  };

  const layers: BackupLayer[] = [];
  const layerKeys = new Set<string>();
  for (const { line, record } of sound(read.layers)) {
    const key = JSON.stringify([record.seq, record.annotator]);
    if (layerKeys.has(key)) error(line, `layer of utterance seq ${record.seq} by "${record.annotator}" appears twice`);
    layerKeys.add(key);
    if (!contentFits(line, record.seq, record, 'layer')) continue;
    annotatorResolve(line, record.annotator);
    layers.push(batchResolve(line, record));
  }

  const history: BackupHistory[] = [];
  for (const { line, record } of sound(read.history)) {
    const fits = (record.before === null || contentFits(line, record.seq, record.before, 'history "before"')) && contentFits(line, record.seq, record.after, 'history "after"');
    if (!fits) continue;
    annotatorResolve(line, record.annotator);
    history.push(record);
  }

  if (first === undefined || first.record === null || issues.errors.length > errorsBefore) return null;
  let project = first.record;
  if (project.dismissed !== undefined) {
    // Harmless but unusable, as a dangling batch reference: dropped with a warning.
    const dropped = (key: string) => warn(first.line, `dismissed finding ${JSON.stringify(key)} names an utterance seq that is not in the backup; dropped`);
    const { dismissed: listed, ...rest } = project;
    const dismissed = dismissalsRenamed(listed, (seq) => (tokenCount.has(seq) ? seq : null), dropped);
    project = Object.keys(dismissed).length === 0 ? rest : { ...rest, dismissed };
  }
  return { project, annotators, batches, utterances, layers, history };
}
