/**
 * The utterance table's index made by an import as it stores its chunks, so the first visit after
 * the import finds a saved index instead of reading 100k utterances again (or showing the table
 * without filters until a build is done). Only for an import into a project without utterances:
 * then the chunks are the whole project. The index is kept only when the project's signature after
 * the import is exactly the one before plus this import's finished batch (same history, same
 * scheme and the schema the import was to leave); any other write in between and it is dropped.
 */
import Dexie from 'dexie';
import type { LayerStatus, ProjectSchema } from '../core/backup/model';
import type { Scheme, Utterance } from '../core/types';
import { corpusBatchEntry, corpusIndexSignature, CorpusIndexFill, corpusSignatureSame, type CorpusIndex, type CorpusSignature } from './corpus-index';
import type { BatchRow, SlotsmithDb } from './schema';

export interface CorpusIndexImportSettings {
  /** The scheme and schema the project will have once the import is done (the file's labels added, if chosen). */
  schemaFinal: (current: ProjectSchema) => ProjectSchema;
}

/** What a stored chunk brings: the utterances as read and the ids batchAppend gave them. */
export interface CorpusIndexChunk {
  utterances: readonly Utterance[];
  utteranceIds: readonly number[];
  seqFirst: number;
  attached: number;
}

export class CorpusIndexImport {
  private fill: CorpusIndexFill | null;
  private seqNext = 1;

  private constructor(
    private readonly projectId: number,
    private readonly before: CorpusSignature,
    private readonly final: { scheme: Scheme; schema: ProjectSchema },
  ) {
    this.fill = new CorpusIndexFill(projectId, final);
  }

  /**
   * Start before the import's batch exists. Null when the project already has utterances (their
   * layers are not at hand here) or is gone.
   */
  static async start(db: SlotsmithDb, projectId: number, settings: CorpusIndexImportSettings): Promise<CorpusIndexImport | null> {
    const { minKey, maxKey } = Dexie;
    return db.transaction('r', [db.projects, db.batches, db.history, db.utterances], async () => {
      const project = await db.projects.get(projectId);
      if (project === undefined) return null;
      const any = await db.utterances.where('[projectId+seq]').between([projectId, minKey], [projectId, maxKey]).limit(1).primaryKeys();
      if (any.length > 0) return null;
      const before = await corpusIndexSignature(db, projectId);
      return new CorpusIndexImport(projectId, before, { scheme: project.scheme, schema: settings.schemaFinal(project.schema) });
    });
  }

  /** Still being filled (false once something did not fit: the import then saves nothing). */
  get alive(): boolean {
    return this.fill !== null;
  }

  /** A chunk batchAppend stored; `batch` is the import's batch row (its annotator and layer status). */
  chunkAdd(batch: Pick<BatchRow, 'annotator' | 'layerStatus'>, chunk: CorpusIndexChunk): void {
    const fill = this.fill;
    if (fill === null) return;
    // Rows attached to, or a seq not following on, mean other utterances are in the project after all.
    if (chunk.attached > 0 || chunk.seqFirst !== this.seqNext || chunk.utteranceIds.length !== chunk.utterances.length) {
      this.fill = null;
      return;
    }
    this.seqNext += chunk.utterances.length;
    const annotator = batch.annotator;
    const status: LayerStatus = batch.layerStatus ?? 'done';
    try {
      chunk.utterances.forEach((u, i) => {
        // As batchAppend stores them: the file's intent is a hint only when no layer takes it.
        const at = fill.utteranceAdd(chunk.utteranceIds[i] as number, u.text, annotator === undefined ? u.intent : undefined);
        if (annotator !== undefined) fill.layersSet(at, [{ annotator, status, intent: u.intent ?? null, tags: u.tags }]);
      });
    } catch {
      // Never the import's failure: without this index the table builds its own.
      this.fill = null;
    }
  }

  /** Drop what was gathered (a failed or cancelled import). */
  abandon(): void {
    this.fill = null;
  }

  /**
   * After batchFinish: the index, signed with the project's signature now, when that signature is
   * what this import alone explains; null otherwise.
   */
  async finish(db: SlotsmithDb, batch: BatchRow): Promise<CorpusIndex | null> {
    const fill = this.fill;
    this.fill = null;
    if (fill === null || batch.state !== 'done' || fill.size !== batch.counts.utterances) return null;
    const after = await corpusIndexSignature(db, this.projectId);
    if (after.project === 'missing') return null;
    const updated = (JSON.parse(after.project) as unknown[])[0];
    const expected: CorpusSignature = {
      project: JSON.stringify([updated, this.final.scheme, this.final.schema]),
      batches: JSON.stringify([...(JSON.parse(this.before.batches) as unknown[]), corpusBatchEntry(batch)]),
      historyLast: this.before.historyLast,
    };
    if (!corpusSignatureSame(expected, after)) return null;
    return fill.finish(after);
  }
}
