/**
 * Merge decisions for one layer file against the stored layers of its annotator. Each layer has one
 * writer, so merging is "keep the greater" under one total order: revision, then time of the edit,
 * then the content itself. That makes merging idempotent (a second import finds everything equal) and
 * order-independent (the greatest wins whatever came first), also in the odd case of one layer
 * edited on two machines to the same revision, which is reported as a conflict.
 */
import type { LayerContent } from '../backup/model';
import type { ExchangeProblem, LayerRecord, LayersFile } from './model';

/** What the master knows of an utterance, to check a layer record against. */
export interface MergeUtterance {
  seq: number;
  externalId?: string;
  tokenCount: number;
}

export type MergeAction = 'add' | 'replace' | 'same' | 'older';

export interface MergeDecision {
  seq: number;
  action: MergeAction;
  /** Same revision, different content: two machines edited one layer; the order above decided. */
  conflict: boolean;
  incoming: LayerContent;
  stored: LayerContent | null;
}

export type MergePlan = { ok: true; decisions: MergeDecision[] } | { ok: false; errors: ExchangeProblem[] };

export function layerRecordContent(r: LayerRecord): LayerContent {
  return { tags: [...r.tags], intent: r.intent, status: r.status, note: r.note, revision: r.revision, updated: r.updated };
}

function contentKey(c: LayerContent): string {
  return JSON.stringify([c.tags, c.intent, c.status, c.note]);
}

/** Negative, zero or positive as `a` is older than, equal to or newer than `b`. */
export function layerOrder(a: LayerContent, b: LayerContent): number {
  if (a.revision !== b.revision) return a.revision - b.revision;
  if (a.updated !== b.updated) return a.updated - b.updated;
  const ka = contentKey(a);
  const kb = contentKey(b);
  return ka < kb ? -1 : ka > kb ? 1 : 0;
}

/**
 * Decide every record of `file`; refuse the whole file when it belongs to another project or names an
 * utterance the master lacks or tokenises differently. `stored` holds the file annotator's layers by seq.
 */
export function mergePlan(file: LayersFile, projectUid: string, utterances: ReadonlyMap<number, MergeUtterance>, stored: ReadonlyMap<number, LayerContent>): MergePlan {
  if (file.header.project.uid !== projectUid) {
    return {
      ok: false,
      errors: [{ line: 1, message: `this layer file belongs to another project ("${file.header.project.name}", fingerprint ${file.header.project.uid.slice(0, 8)}…), not this one` }],
    };
  }
  const errors: ExchangeProblem[] = [];
  const decisions: MergeDecision[] = [];
  file.layers.forEach((record, i) => {
    // Records are on consecutive lines after the header (readers refuse blank lines).
    const line = i + 2;
    const u = utterances.get(record.seq);
    const name = record.externalId === undefined ? `utterance ${record.seq}` : `utterance ${record.seq} (${record.externalId})`;
    if (u === undefined) return void errors.push({ line, message: `${name} is not in this project` });
    if (u.externalId !== record.externalId) {
      return void errors.push({ line, message: `${name}: the project has id ${JSON.stringify(u.externalId ?? null)} at this place; the file is for other utterances` });
    }
    if (u.tokenCount !== record.tokenCount) {
      return void errors.push({ line, message: `${name} has ${u.tokenCount} tokens here but ${record.tokenCount} in the file: it was tokenised differently` });
    }
    const incoming = layerRecordContent(record);
    const old = stored.get(record.seq) ?? null;
    if (old === null) return void decisions.push({ seq: record.seq, action: 'add', conflict: false, incoming, stored: null });
    const order = layerOrder(incoming, old);
    const conflict = incoming.revision === old.revision && contentKey(incoming) !== contentKey(old);
    decisions.push({ seq: record.seq, action: order > 0 ? 'replace' : order === 0 ? 'same' : 'older', conflict, incoming, stored: old });
  });
  return errors.length > 0 ? { ok: false, errors } : { ok: true, decisions };
}
