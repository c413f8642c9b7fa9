/**
 * Stored layers into the agreement core's aligned corpus. Each annotator's layers go through the
 * core's `AlignLayerGatherer`, so stored tags (kept as imported, illegal ones included) get the same
 * CoNLL-2000 reading as the command line's `agree`. Utterances pair up by database id; both layers of
 * one utterance share its tokens, so only the token count (one per tag) is handed over, never text.
 */
import { AlignLayerGatherer, layerDataAlign, type AlignLayerData, type AlignResult } from '../core/agreement';
import type { LayerStatus } from '../core/backup/model';
import type { Token, Utterance } from '../core/types';
import type { LayerRow } from '../db/schema';

const NO_META: Record<string, string> = {};
const NO_TOKEN: Token = { start: 0, end: 0 };
/** Shared placeholder token lists by length: the gatherer reads only their length and (equal) offsets. */
const placeholders: Token[][] = [];

function tokensOfLength(count: number): Token[] {
  let tokens = placeholders[count];
  if (tokens === undefined) {
    tokens = new Array<Token>(count).fill(NO_TOKEN);
    placeholders[count] = tokens;
  }
  return tokens;
}

/** One annotator's layers as gathered, with what the dashboard needs beyond the core's figures. */
export interface GatheredLayer {
  annotator: string;
  data: AlignLayerData;
  /** Per gathered utterance, in gather order: database id, `updated` time stamp, status. */
  utteranceIds: Int32Array;
  updated: Float64Array;
  statuses: Partial<Record<LayerStatus, number>>;
}

/** Collects chosen layers row by row (rows of one annotator in utterance order, as `layersScan` gives them). */
export class LayerGathering {
  private readonly gatherers: AlignLayerGatherer[];
  private readonly ids: number[][];
  private readonly times: number[][];
  private readonly statuses: Partial<Record<LayerStatus, number>>[];
  private readonly position = new Map<string, number>();

  constructor(readonly annotators: readonly string[], sizes: readonly number[] = []) {
    this.gatherers = annotators.map((a, i) => {
      const n = sizes[i] ?? 1024;
      // Utterances of this scenario are short: 16 tokens each is a generous first allocation.
      return new AlignLayerGatherer(a, { utterances: n, tokens: 16 * n });
    });
    annotators.forEach((a, i) => this.position.set(a, i));
    this.ids = annotators.map(() => []);
    this.times = annotators.map(() => []);
    this.statuses = annotators.map(() => ({}));
  }

  rowAdd(row: Pick<LayerRow, 'utteranceId' | 'annotator' | 'tags' | 'intent' | 'status' | 'updated'>): void {
    const l = this.position.get(row.annotator);
    if (l === undefined) return;
    const utterance: Utterance = { id: String(row.utteranceId), text: '', tokens: tokensOfLength(row.tags.length), tags: row.tags, meta: NO_META };
    if (row.intent !== null) utterance.intent = row.intent;
    this.gatherers[l]?.utteranceAdd(utterance);
    this.ids[l]?.push(row.utteranceId);
    this.times[l]?.push(row.updated);
    const statuses = this.statuses[l];
    if (statuses !== undefined) statuses[row.status] = (statuses[row.status] ?? 0) + 1;
  }

  done(): GatheredLayer[] {
    return this.annotators.map((annotator, l) => ({
      annotator,
      data: (this.gatherers[l] as AlignLayerGatherer).done(),
      utteranceIds: Int32Array.from(this.ids[l] ?? []),
      updated: Float64Array.from(this.times[l] ?? []),
      statuses: this.statuses[l] ?? {},
    }));
  }
}

/** The aligned corpus of gathered layers, by utterance id, in the order given. */
export function gatheredAlign(layers: readonly GatheredLayer[]): AlignResult {
  return layerDataAlign(
    layers.map((l) => l.data),
    { by: 'id' },
  );
}

/**
 * Per aligned position and layer, the layer's `updated` time (NaN where the layer is absent).
 * `ids` are the corpus's aligned ids (database ids as strings).
 */
export function updatedByPosition(ids: readonly (string | null)[], layers: readonly GatheredLayer[]): Float64Array[] {
  const at = new Map<number, number>();
  ids.forEach((id, u) => {
    if (id !== null) at.set(Number(id), u);
  });
  return layers.map((layer) => {
    const times = new Float64Array(ids.length).fill(Number.NaN);
    layer.utteranceIds.forEach((id, k) => {
      const u = at.get(id);
      if (u !== undefined) times[u] = layer.updated[k] ?? Number.NaN;
    });
    return times;
  });
}
