/**
 * Backup and restore of whole projects through the core codec (src/core/backup). Backups refer to
 * utterances by seq and batches by position, so a restored project backs up to the same bytes; the
 * project row's extras (exchange, model, dismissed findings) go along in the project record.
 */
import Dexie from 'dexie';
import {
  backupAnnotatorEncode,
  backupBatchEncode,
  backupDecode,
  backupHeaderEncode,
  backupHistoryEncode,
  backupLayerEncode,
  backupProjectEncode,
  backupModelFileCheck,
  backupUtteranceEncode,
  dismissalsRenamed,
  type BackupData,
  type BackupDismissal,
  type BackupExchange,
  type BackupModel,
  type BackupProject,
  type BackupUtterance,
  type BatchInfo,
} from '../core/backup';
import type { ReadError } from '../core/types';
import { BatchStateError, dbWrite, RecordMissingError } from './errors';
import type { ProjectExchange } from './exchange-repo';
import type { Dismissal } from './findings-repo';
import { layerContent } from './layer-repo';
import type { StoredModel } from './model-repo';
import { dbTablesAll, type BatchRow, type HistoryRow, type LayerRow, type ProjectRow, type SlotsmithDb, type UtteranceRow } from './schema';

/** The project row as the other stores leave it: their extras are the backup's (checked just below). */
type ProjectRowFull = ProjectRow & Pick<BackupProject, 'exchange' | 'model' | 'dismissed'>;

// The core keeps its own copies of these shapes (it may not import src/db): if a store changes its
// shape without the backup, this no longer compiles.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const SHAPES_AGREE: [Same<ProjectExchange, BackupExchange>, Same<StoredModel, BackupModel>, Same<Dismissal, BackupDismissal>] = [true, true, true];
void SHAPES_AGREE;

export interface BackupFile {
  fileName: string;
  /** Lines of the file, each ending in LF: hand them to `new Blob(parts)` rather than joining. */
  parts: string[];
  /** What was left out, in words for the user (a stored model no build can read). */
  warnings: string[];
}

export type BackupRestoreResult = { ok: true; projectId: number; warnings: ReadError[] } | { ok: false; errors: ReadError[] };

function batchInfo(row: BatchRow): BatchInfo {
  const { id: _id, projectId: _projectId, ...info } = row;
  return info;
}

function utteranceInfo(row: UtteranceRow, batchPosition: Map<number, number>): BackupUtterance {
  const u: BackupUtterance = { seq: row.seq, text: row.text, tokens: Array.from(row.tokens), meta: row.meta };
  if (row.externalId !== undefined) u.externalId = row.externalId;
  if (row.intentHint !== undefined) u.intentHint = row.intentHint;
  const batch = row.source.batchId === undefined ? undefined : batchPosition.get(row.source.batchId);
  if (batch !== undefined) u.batch = batch;
  if (row.source.line !== undefined) u.line = row.source.line;
  return u;
}

function fileNameOf(name: string, now: number): string {
  // Characters that are unsafe in file names on common systems (common practice, no source).
  const safe = name.replace(/[\p{Cc}<>:"/\\|?*]+/gu, '_').trim() || 'project';
  return `${safe}-${new Date(now).toISOString().slice(0, 10)}.slotsmith-backup.jsonl`;
}

/** A consistent snapshot of the project (one read transaction), encoded line by line. */
export async function backupMake(db: SlotsmithDb, projectId: number): Promise<BackupFile> {
  const { minKey, maxKey } = Dexie;
  return db.transaction('r', dbTablesAll(db), async () => {
    const project = await db.projects.get(projectId);
    if (project === undefined) throw new RecordMissingError('project', projectId);
    const annotators = await db.annotators.where('[projectId+id]').between([projectId, minKey], [projectId, maxKey]).toArray();
    const batches = await db.batches.where('projectId').equals(projectId).sortBy('id');
    if (batches.some((b) => b.state === 'importing')) throw new BatchStateError('An import into this project is still running; back up when it has finished.');
    const batchPosition = new Map(batches.map((b, i) => [b.id, i + 1]));

    const body: string[] = [''];
    for (const a of annotators) body.push(backupAnnotatorEncode({ id: a.id, name: a.name, role: a.role }));
    for (const b of batches) body.push(backupBatchEncode(batchInfo(b)));

    const seqOf = new Map<number, number>();
    await db.utterances
      .where('[projectId+seq]')
      .between([projectId, minKey], [projectId, maxKey])
      .each((row) => {
        seqOf.set(row.id, row.seq);
        body.push(backupUtteranceEncode(utteranceInfo(row, batchPosition)));
      });
    const utteranceCount = seqOf.size;
    // A dismissal naming an utterance no longer in the project can never match again: left out.
    const { dismissed, model, ...row } = project as ProjectRowFull;
    const backupProject: BackupProject = dismissed === undefined ? row : { ...row, dismissed: dismissalsRenamed(dismissed, (id) => seqOf.get(id)) };
    // Restore refuses a model no build can read, so such a one is left out here, not written into a backup that would not restore.
    const verdict = model === undefined ? null : backupModelFileCheck(model.json);
    const warnings: string[] = [];
    if (verdict?.kind === 'broken') warnings.push(`The saved model is not a usable model file (${verdict.message}); it was left out of the backup.`);
    else if (model !== undefined) backupProject.model = model;
    body[0] = backupProjectEncode(backupProject);

    const layerRows = await db.layers.where('[projectId+annotator+status]').between([projectId, minKey, minKey], [projectId, maxKey, maxKey]).toArray();
    const layers = layerRows.map((row: LayerRow) => ({ seq: seqOf.get(row.utteranceId) ?? 0, row }));
    // Code-unit order of annotator ids, then seq: independent of database ids and of locale.
    layers.sort((a, b) => (a.row.annotator < b.row.annotator ? -1 : a.row.annotator > b.row.annotator ? 1 : a.seq - b.seq));
    for (const { seq, row } of layers) {
      const batch = row.batchId === undefined ? undefined : batchPosition.get(row.batchId);
      body.push(backupLayerEncode({ seq, annotator: row.annotator, ...layerContent(row), ...(batch === undefined ? {} : { batch }) }));
    }

    const history = await db.history.where('projectId').equals(projectId).sortBy('id');
    for (const h of history) {
      body.push(backupHistoryEncode({ seq: seqOf.get(h.utteranceId) ?? 0, annotator: h.annotator, before: h.before, after: h.after, who: h.who, when: h.when }));
    }

    const now = db.clock();
    const counts = { annotators: annotators.length, batches: batches.length, utterances: utteranceCount, layers: layers.length, history: history.length };
    const parts = [backupHeaderEncode(new Date(now).toISOString(), counts), ...body].map((line) => `${line}\n`);
    return { fileName: fileNameOf(project.name, now), parts, warnings };
  });
}

/** A free project name for a restored copy: the original, else "… (restored)", "… (restored 2)"… */
export function restoreNameFree(name: string, taken: ReadonlySet<string>): string {
  if (!taken.has(name)) return name;
  for (let n = 1; ; n++) {
    const candidate = `${name} (restored${n === 1 ? '' : ` ${n}`})`;
    if (!taken.has(candidate)) return candidate;
  }
}

export interface BackupStoreOptions {
  /** The new project's name; by default the backup's, made free of the names already taken. */
  name?: string;
}

/**
 * Store decoded backup data as a new project, in one transaction: either the whole project appears
 * or nothing does. The free name is chosen inside it, so two restores at once cannot take the same.
 */
export async function backupStore(db: SlotsmithDb, data: BackupData, options: BackupStoreOptions = {}): Promise<{ projectId: number; name: string }> {
  return dbWrite(db, dbTablesAll(db), async () => {
    const name = options.name ?? restoreNameFree(data.project.name, new Set((await db.projects.toArray()).map((p) => p.name)));
    const { dismissed, ...project } = data.project;
    const projectId = await db.projects.add({ ...project, name } as ProjectRowFull);
    await db.annotators.bulkAdd(data.annotators.map((a) => ({ ...a, projectId })));
    const batchIds = await db.batches.bulkAdd(
      data.batches.map((b) => ({ ...b, projectId }) as BatchRow),
      { allKeys: true },
    );
    const batchId = (position: number | undefined) => (position === undefined ? undefined : batchIds[position - 1]);
    const utterances = [...data.utterances].sort((a, b) => a.seq - b.seq);
    const rows = utterances.map((u) => {
      const row: Omit<UtteranceRow, 'id'> = { projectId, seq: u.seq, text: u.text, tokens: Int32Array.from(u.tokens), meta: u.meta, source: {} };
      const b = batchId(u.batch);
      if (b !== undefined) row.source.batchId = b;
      if (u.line !== undefined) row.source.line = u.line;
      if (u.externalId !== undefined) row.externalId = u.externalId;
      if (u.intentHint !== undefined) row.intentHint = u.intentHint;
      return row as UtteranceRow;
    });
    const ids = await db.utterances.bulkAdd(rows, { allKeys: true });
    const idOf = new Map(utterances.map((u, i) => [u.seq, ids[i] as number]));
    if (dismissed !== undefined) {
      // The decoder dropped keys naming seqs not in the backup, so each one finds its new id.
      await db.projects.put({ ...project, name, id: projectId, dismissed: dismissalsRenamed(dismissed, (seq) => idOf.get(seq)) } as ProjectRowFull);
    }
    await db.layers.bulkAdd(
      data.layers.map(({ seq, batch, ...layer }) => {
        const row: LayerRow = { ...layer, utteranceId: idOf.get(seq) as number, projectId };
        const b = batchId(batch);
        if (b !== undefined) row.batchId = b;
        return row;
      }),
    );
    await db.history.bulkAdd(
      data.history.map(({ seq, ...h }) => ({ ...h, projectId, utteranceId: idOf.get(seq) as number }) as HistoryRow),
    );
    return { projectId, name };
  });
}

/**
 * Restore a backup as a new project (see backupStore). Invalid files are refused with
 * line-numbered errors and store nothing. Without a name, the backup's own name is kept as is.
 */
export async function backupRestore(db: SlotsmithDb, text: string, options: { name?: string } = {}): Promise<BackupRestoreResult> {
  const decoded = backupDecode(text);
  if (!decoded.ok) return decoded;
  const { projectId } = await backupStore(db, decoded.data, { name: options.name ?? decoded.data.project.name });
  return { ok: true, projectId, warnings: decoded.warnings };
}
