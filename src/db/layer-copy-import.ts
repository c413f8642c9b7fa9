/**
 * Layer copies (layer-copy.ts) made by an import as it stores its chunks, so the first agreement run
 * after an import finds its copies at the project's signature instead of reading every layer. A
 * labelled import builds its annotator's copy from the utterances it stores (batchAppend never
 * replaces a stored layer: it adds new utterances or attaches to ones without this annotator's
 * layer), merged into that annotator's copy when one is stored at the signature before the import
 * (or behind it by label edits only: then patched first), or alone when the annotator had no layer
 * in the project. Other annotators' copies at that signature (or patched to it) are still exact (the
 * import wrote only this annotator's layers) and are signed again. All of it is saved only when the
 * project's signature after the import is exactly the one before plus this import's finished batch
 * (the rule of corpus-index-import.ts); any other write in between and nothing is saved, so the next
 * run reads as it did before.
 */
import Dexie from 'dexie';
import type { LayerStatus, ProjectSchema } from '../core/backup/model';
import type { Utterance } from '../core/types';
import { corpusBatchEntry, corpusIndexSignature, corpusSignatureSame, type CorpusSignature } from './corpus-index';
import { LayerCopyBuilder, layerCopyMerged, type LayerCopy } from './layer-copy';
import type { LayerCopyStore } from './layer-copy-store';
import type { BatchRow, SlotsmithDb } from './schema';

export interface LayerCopyImportSettings {
  /** Whose layers the import stores; none for an import without labels. */
  annotator?: string;
  /** The schema the project will have once the import is done (the file's labels added, if chosen). */
  schemaFinal: (current: ProjectSchema) => ProjectSchema;
  /**
   * Brings copies behind the signature by label edits only (same project row and batches) up to it
   * from the history rows (layer-copies.ts `copiesPatch`); null for a copy it cannot. Without it only
   * copies at exactly the signature before are carried.
   */
  patch?: (db: SlotsmithDb, projectId: number, behind: readonly LayerCopy[], next: CorpusSignature) => Promise<Map<string, LayerCopy | null>>;
}

/** What a stored chunk brings: the utterances as read and what batchAppend reported for them. */
export interface LayerCopyChunk {
  utterances: readonly Utterance[];
  utteranceIds: readonly number[];
  /** The `updated` time batchAppend gave this chunk's layers (one clock reading per chunk); undefined when unknown. */
  updated: number | undefined;
}

export class LayerCopyImport {
  /** The annotator's imported layers (null: not made, or given up). */
  private added: LayerCopyBuilder | null;
  private status: LayerStatus = 'done';

  private constructor(
    private readonly projectId: number,
    private readonly before: CorpusSignature,
    private readonly schemaFinal: ProjectSchema,
    private readonly annotator: string | undefined,
    /** The annotator's copy before the import; null when it had no layer; undefined when its copy is not made. */
    private readonly base: LayerCopy | null | undefined,
    /** Other annotators' copies stored at `before`. */
    private readonly others: LayerCopy[],
  ) {
    this.added = annotator === undefined || base === undefined ? null : new LayerCopyBuilder(projectId, annotator, undefined, true);
  }

  /**
   * Start before the import's batch exists (it is part of what the signature after must show).
   * Null when there is nothing to make or sign (the project is gone, no copy to carry over and the
   * annotator's own copy cannot be made).
   */
  static async start(db: SlotsmithDb, store: LayerCopyStore, projectId: number, settings: LayerCopyImportSettings): Promise<LayerCopyImport | null> {
    const { minKey, maxKey } = Dexie;
    const { annotator } = settings;
    const seen = await db.transaction('r', [db.projects, db.batches, db.history, db.layers, db.annotators], async () => {
      const project = await db.projects.get(projectId);
      if (project === undefined) return null;
      const before = await corpusIndexSignature(db, projectId);
      const names = (await db.annotators.where('projectId').equals(projectId).toArray()).map((a) => a.name);
      // One index entry at most: whether the annotator has any layer here (never a count over 100k entries).
      const had =
        annotator !== undefined && (await db.layers.where('[projectId+annotator+status]').between([projectId, annotator, minKey], [projectId, annotator, maxKey]).limit(1).primaryKeys()).length > 0;
      return { before, schema: project.schema, names, had };
    });
    if (seen === null) return null;
    const { before, names, had } = seen;
    const stored = await store.load(projectId, annotator === undefined || names.includes(annotator) ? names : [...names, annotator]);
    const exact = [...stored.values()].filter((c) => corpusSignatureSame(c.signature, before));
    // Behind by label edits only: patched up to the signature before (a layer edited after it shows in the signature after).
    const behind = [...stored.values()].filter((c) => c.signature.project === before.project && c.signature.batches === before.batches && c.signature.historyLast < before.historyLast);
    if (behind.length > 0 && settings.patch !== undefined) {
      for (const copy of (await settings.patch(db, projectId, behind, before)).values()) if (copy !== null) exact.push(copy);
    }
    const own = annotator === undefined ? undefined : had ? exact.find((c) => c.annotator === annotator) : null;
    const others = exact.filter((c) => c.annotator !== annotator);
    if (own === undefined && others.length === 0) return null;
    // own undefined: the annotator's copy is not made (it had layers and no exact copy of them).
    return new LayerCopyImport(projectId, before, settings.schemaFinal(seen.schema), annotator, own, others);
  }

  /** The status batchAppend gives the layers (the batch row's), once the batch exists. */
  statusSet(status: LayerStatus | undefined): void {
    this.status = status ?? 'done';
  }

  /** A chunk batchAppend stored. */
  chunkAdd(chunk: LayerCopyChunk): void {
    const added = this.added;
    if (added === null) return;
    if (chunk.updated === undefined || chunk.utteranceIds.length !== chunk.utterances.length) {
      this.added = null;
      return;
    }
    const status = this.status;
    const updated = chunk.updated;
    // As batchAppend stores them: tags exactly as read, the file's intent or none.
    chunk.utterances.forEach((u, i) => added.rowAdd({ utteranceId: chunk.utteranceIds[i] as number, tags: u.tags, intent: u.intent ?? null, status, updated }));
  }

  /** Whether chunkAdd wants the chunks (the annotator's copy is being made). */
  get building(): boolean {
    return this.added !== null;
  }

  /** Drop what was gathered (a failed or cancelled import). */
  abandon(): void {
    this.added = null;
    this.others.length = 0;
  }

  /**
   * After batchFinish: the copies to save, signed with the project's signature now, when that
   * signature is what this import alone explains; none otherwise.
   */
  async finish(db: SlotsmithDb, batch: BatchRow): Promise<LayerCopy[]> {
    const added = this.added;
    this.added = null;
    if (batch.state !== 'done') return [];
    const after = await corpusIndexSignature(db, this.projectId);
    if (after.project === 'missing') return [];
    const [updated, scheme] = JSON.parse(after.project) as unknown[];
    const [, schemeBefore] = JSON.parse(this.before.project) as unknown[];
    const expected: CorpusSignature = {
      project: JSON.stringify([updated, schemeBefore, this.schemaFinal]),
      batches: JSON.stringify([...(JSON.parse(this.before.batches) as unknown[]), corpusBatchEntry(batch)]),
      historyLast: this.before.historyLast,
    };
    if (JSON.stringify(scheme) !== JSON.stringify(schemeBefore) || !corpusSignatureSame(expected, after)) return [];
    const copies = this.others.map((c) => ({ ...c, signature: after }));
    if (added !== null && this.annotator !== undefined && this.base !== undefined) {
      const made = added.done(after);
      if (made.utteranceIds.length === batch.counts.layers) copies.push(layerCopyMerged(this.base, made, after));
    }
    return copies;
  }
}
