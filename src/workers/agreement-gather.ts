/**
 * Stored layers into the agreement core's aligned corpus. Each annotator's layers go through the
 * core's `AlignLayerGatherer`, so stored tags (kept as imported, illegal ones included) get the same
 * CoNLL-2000 reading as the command line's `agree`. Utterances pair up by database id; both layers of
 * one utterance share its tokens, so only the token count (one per tag) is handed over, never text.
 */
import { AlignLayerGatherer, layerDataAlign, MISSING, type AlignLayerData, type AlignResult } from '../core/agreement';
import { LabelInterner, RawPrefix, RawTagTable } from '../core/agreement/labels';
import { LAYER_STATUSES, type LayerStatus } from '../core/backup/model';
import type { LayerCopy } from '../db/layer-copy';
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

/**
 * One annotator's chosen layers straight from its layer copy (layer-copy.ts): what `LayerGathering`
 * gives for the same rows, without a row object or tag string per layer. Tag names are read once
 * each (the copy's codes map to the core's raw tag table), then the CoNLL-2000 reading runs on ints.
 */
export function gatheredFromCopy(copy: LayerCopy, statuses: readonly LayerStatus[]): GatheredLayer {
  const wanted = new Uint8Array(LAYER_STATUSES.length + 1);
  for (const s of statuses) wanted[LAYER_STATUSES.indexOf(s) + 1] = 1;
  const slots = new LabelInterner(1);
  const raw = new RawTagTable(slots);
  // Filled on a tag's first use, so slots are numbered in the order the row-by-row gatherer meets them.
  const prefixOf = new Int8Array(copy.tagNames.length).fill(-1);
  const slotOf = new Int32Array(copy.tagNames.length);
  const intentNames = new LabelInterner(0);
  const intentOf = new Int32Array(copy.intents.length + 1).fill(MISSING);
  const n = copy.utteranceIds.length;
  let count = 0;
  let tokens = 0;
  for (let k = 0; k < n; k++) {
    if (wanted[copy.status[k] as number] !== 1) continue;
    count++;
    tokens += (copy.tagStart[k + 1] as number) - (copy.tagStart[k] as number);
  }
  const ids = new Array<string | null>(count);
  const utteranceIds = new Int32Array(count);
  const updated = new Float64Array(count);
  const tokenStart = new Int32Array(count + 1);
  const tagCounts = new Int32Array(count);
  const tags = new Int32Array(tokens);
  const intents = new Int32Array(count);
  const byCode = new Int32Array(LAYER_STATUSES.length + 1);
  let u = 0;
  let at = 0;
  for (let k = 0; k < n; k++) {
    const status = copy.status[k] as number;
    if (wanted[status] !== 1) continue;
    byCode[status]! += 1;
    const id = copy.utteranceIds[k] as number;
    ids[u] = String(id);
    utteranceIds[u] = id;
    updated[u] = copy.updated[k] as number;
    const intent = copy.intent[k] as number;
    if (intent !== 0 && intentOf[intent] === MISSING) intentOf[intent] = intentNames.code(copy.intents[intent - 1] as string);
    intents[u] = intentOf[intent] as number;
    const from = copy.tagStart[k] as number;
    const to = copy.tagStart[k + 1] as number;
    // As AlignLayerGatherer reads tags: a stray I-X (or E-X) opens a span, E-X and S-X close one.
    let open = 0;
    for (let t = from; t < to; t++) {
      const c = copy.tags[t] as number;
      if (prefixOf[c] === -1) {
        const code = raw.code(copy.tagNames[c] as string);
        prefixOf[c] = raw.prefix[code] ?? RawPrefix.O;
        slotOf[c] = raw.slot[code] ?? 0;
      }
      const prefix = prefixOf[c] as number;
      const slot = slotOf[c] as number;
      if (prefix === RawPrefix.O) {
        open = 0;
        tags[at++] = 0;
        continue;
      }
      const inside = (prefix === RawPrefix.I || prefix === RawPrefix.E) && open === slot;
      tags[at++] = inside ? 2 * slot : 2 * slot - 1;
      open = prefix === RawPrefix.E || prefix === RawPrefix.S ? 0 : slot;
    }
    tagCounts[u] = to - from;
    tokenStart[++u] = at;
  }
  // Keys in status order (the row-by-row gatherer adds them as first seen): the same counts either way.
  const counted: Partial<Record<LayerStatus, number>> = {};
  LAYER_STATUSES.forEach((s, i) => {
    if ((byCode[i + 1] as number) > 0) counted[s] = byCode[i + 1] as number;
  });
  const data: AlignLayerData = {
    name: copy.annotator,
    count,
    ids,
    lines: new Float64Array(count).fill(Number.NaN),
    texts: new Array<string>(count).fill(''),
    tokenStart,
    // Both layers of an utterance share its tokens: equal (zero) offsets pass the token check.
    ranges: new Int32Array(2 * tokens),
    tokenLines: new Float64Array(tokens).fill(Number.NaN),
    tagCounts,
    tags,
    slotNames: [...slots.names],
    intents,
    intentNames: [...intentNames.names],
  };
  return { annotator: copy.annotator, data, utteranceIds, updated, statuses: counted };
}
