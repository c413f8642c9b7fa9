/**
 * The aligned corpus straight from layer copies (src/db/layer-copy.ts), for the dashboard's common
 * case: what `gatheredAlign(copies.map(gatheredFromCopy))` gives, without the per-layer gathered
 * form in between (id strings, token ranges and lines per layer, a map from id to position). Copies
 * hold ascending utterance ids, so utterances pair up by merging sorted integer arrays. When two
 * layers of one utterance disagree on its token count (which the database's rules never produce),
 * it returns null and the caller takes the general path, which words the error.
 */
import { MISSING, type AlignedCorpus } from '../core/agreement';
import { LabelInterner, RawPrefix, RawTagTable } from '../core/agreement/labels';
import { LAYER_STATUSES, type LayerStatus } from '../core/backup/model';
import type { LayerCopy } from '../db/layer-copy';

export interface CopiesAligned {
  corpus: AlignedCorpus;
  /** Per layer: how many of its layers were chosen, by status (keys in status order). */
  counted: { annotator: string; layers: number; statuses: Partial<Record<LayerStatus, number>> }[];
  /** Per layer, per aligned position: the layer's `updated` time, NaN where it is absent. */
  updated: Float64Array[];
}

/** Positions (in the copy) of the layers whose status is wanted. */
function chosen(copy: LayerCopy, wanted: Uint8Array): Int32Array {
  const n = copy.utteranceIds.length;
  let count = 0;
  for (let k = 0; k < n; k++) if (wanted[copy.status[k] as number] === 1) count++;
  const out = new Int32Array(count);
  let at = 0;
  for (let k = 0; k < n; k++) if (wanted[copy.status[k] as number] === 1) out[at++] = k;
  return out;
}

/**
 * Aligned order as `layerDataAlign` makes it by id: the first layer's utterances, then those first
 * met in each later layer, in that layer's order. Returns each layer's aligned position per chosen layer.
 */
function positionsOf(copies: readonly LayerCopy[], picks: readonly Int32Array[]): { ids: Int32Array; positions: Int32Array[] } {
  // Sorted union of the ids placed so far, with their aligned positions.
  let unionIds = new Int32Array(0);
  let unionPos = new Int32Array(0);
  let placed = 0;
  const order: number[] = [];
  const positions = copies.map((copy, l) => {
    const pick = picks[l] as Int32Array;
    const mine = new Int32Array(pick.length);
    const mergedIds = new Int32Array(unionIds.length + pick.length);
    const mergedPos = new Int32Array(unionIds.length + pick.length);
    let i = 0;
    let m = 0;
    for (let j = 0; j < pick.length; j++) {
      const id = copy.utteranceIds[pick[j] as number] as number;
      while (i < unionIds.length && (unionIds[i] as number) < id) {
        mergedIds[m] = unionIds[i] as number;
        mergedPos[m++] = unionPos[i++] as number;
      }
      if (i < unionIds.length && unionIds[i] === id) {
        mine[j] = unionPos[i] as number;
        continue;
      }
      mine[j] = placed++;
      order.push(id);
      mergedIds[m] = id;
      mergedPos[m++] = mine[j] as number;
    }
    while (i < unionIds.length) {
      mergedIds[m] = unionIds[i] as number;
      mergedPos[m++] = unionPos[i++] as number;
    }
    unionIds = mergedIds.subarray(0, m);
    unionPos = mergedPos.subarray(0, m);
    return mine;
  });
  return { ids: Int32Array.from(order), positions };
}

/** Per copy, raw tag code -> prefix kind and global slot code; only tags of chosen layers are named. */
function tagTables(copies: readonly LayerCopy[], picks: readonly Int32Array[], slots: LabelInterner): { prefix: Int8Array; slot: Int32Array }[] {
  const raw = new RawTagTable(slots);
  return copies.map((copy, l) => {
    const used = new Uint8Array(copy.tagNames.length);
    const pick = picks[l] as Int32Array;
    for (let j = 0; j < pick.length; j++) {
      const k = pick[j] as number;
      for (let t = copy.tagStart[k] as number; t < (copy.tagStart[k + 1] as number); t++) used[copy.tags[t] as number] = 1;
    }
    const prefix = new Int8Array(copy.tagNames.length);
    const slot = new Int32Array(copy.tagNames.length);
    // Named in first-use order (as the row-by-row gatherer meets them) is not needed: slots are sorted by name below.
    for (let c = 0; c < used.length; c++) {
      if (used[c] !== 1) continue;
      const code = raw.code(copy.tagNames[c] as string);
      prefix[c] = raw.prefix[code] ?? RawPrefix.O;
      slot[c] = raw.slot[code] ?? 0;
    }
    return { prefix, slot };
  });
}

/**
 * How each raw tag code reads, the CoNLL-2000 way as AlignLayerGatherer does (a stray I-X or E-X
 * opens a span, E-X and S-X close one), as lookups instead of branches: its code when the span
 * open before it is its own slot (`inside`), else (`begin`), and the slot open after it (`next`).
 */
interface TagReading {
  slot: Int32Array;
  inside: Int32Array;
  begin: Int32Array;
  next: Int32Array;
}

function tagReading(prefixOf: Int8Array, slotOf: Int32Array): TagReading {
  const n = prefixOf.length;
  const reading = { slot: slotOf, inside: new Int32Array(n), begin: new Int32Array(n), next: new Int32Array(n) };
  for (let c = 0; c < n; c++) {
    const prefix = prefixOf[c] as number;
    const s = slotOf[c] as number;
    if (prefix === RawPrefix.O) {
      // Slot 0 with both codes 0: whatever was open, an O reads as O and closes it.
      reading.slot[c] = 0;
      continue;
    }
    const continues = prefix === RawPrefix.I || prefix === RawPrefix.E;
    reading.begin[c] = 2 * s - 1;
    reading.inside[c] = continues ? 2 * s : 2 * s - 1;
    reading.next[c] = prefix === RawPrefix.E || prefix === RawPrefix.S ? 0 : s;
  }
  return reading;
}

/** Layer k's tags from `copy` into `out` at `at`, read as `reading` says. */
function tagsRead(copy: LayerCopy, k: number, reading: TagReading, out: Int32Array, at: number): void {
  const { slot, inside, begin, next } = reading;
  const tags = copy.tags;
  const to = copy.tagStart[k + 1] as number;
  let open = 0;
  for (let t = copy.tagStart[k] as number; t < to; t++) {
    const c = tags[t] as number;
    out[at++] = open === slot[c] ? (inside[c] as number) : (begin[c] as number);
    open = next[c] as number;
  }
}

export function copiesAlign(copies: readonly LayerCopy[], statuses: readonly LayerStatus[]): CopiesAligned | null {
  const wanted = new Uint8Array(LAYER_STATUSES.length + 1);
  for (const s of statuses) wanted[LAYER_STATUSES.indexOf(s) + 1] = 1;
  const picks = copies.map((c) => chosen(c, wanted));
  const { ids, positions } = positionsOf(copies, picks);
  const count = ids.length;

  // Token counts per position from the first layer holding it; any other layer must agree.
  const tokensAt = new Int32Array(count).fill(-1);
  for (let l = 0; l < copies.length; l++) {
    const copy = copies[l] as LayerCopy;
    const pick = picks[l] as Int32Array;
    const mine = positions[l] as Int32Array;
    for (let j = 0; j < pick.length; j++) {
      const k = pick[j] as number;
      const n = (copy.tagStart[k + 1] as number) - (copy.tagStart[k] as number);
      const u = mine[j] as number;
      if (tokensAt[u] === -1) tokensAt[u] = n;
      else if (tokensAt[u] !== n) return null;
    }
  }
  const offsets = new Int32Array(count + 1);
  for (let u = 0; u < count; u++) offsets[u + 1] = (offsets[u] as number) + (tokensAt[u] as number);
  const tokenCount = offsets[count] as number;

  const slots = new LabelInterner(1);
  const tables = tagTables(copies, picks, slots);
  const slotOrder = slots.sorted();
  const intents = new LabelInterner(0);
  const intentLocal = copies.map((copy, l) => {
    const local = new Int32Array(copy.intents.length + 1).fill(MISSING);
    const pick = picks[l] as Int32Array;
    for (let j = 0; j < pick.length; j++) {
      const code = copy.intent[pick[j] as number] as number;
      if (code !== 0 && local[code] === MISSING) local[code] = intents.code(copy.intents[code - 1] as string);
    }
    return local;
  });
  const intentOrder = intents.sorted();

  const tagArrays: Int32Array[] = [];
  const intentArrays: Int32Array[] = [];
  const presentArrays: Uint8Array[] = [];
  const lineArrays: Int32Array[] = [];
  const hasIntents: boolean[] = [];
  const updated: Float64Array[] = [];
  const counted: CopiesAligned['counted'] = [];
  copies.forEach((copy, l) => {
    const pick = picks[l] as Int32Array;
    const mine = positions[l] as Int32Array;
    const { prefix: prefixOf, slot: localSlot } = tables[l] as { prefix: Int8Array; slot: Int32Array };
    const reading = tagReading(prefixOf, Int32Array.from(localSlot, (s) => slotOrder.remap[s] ?? s));
    const local = intentLocal[l] as Int32Array;
    const tags = new Int32Array(tokenCount).fill(MISSING);
    const intentCodes = new Int32Array(count).fill(MISSING);
    const present = new Uint8Array(count);
    const times = new Float64Array(count).fill(Number.NaN);
    const byCode = new Int32Array(LAYER_STATUSES.length + 1);
    let anyIntent = false;
    for (let j = 0; j < pick.length; j++) {
      const k = pick[j] as number;
      const u = mine[j] as number;
      present[u] = 1;
      times[u] = copy.updated[k] as number;
      byCode[copy.status[k] as number]! += 1;
      const intent = copy.intent[k] as number;
      if (intent !== 0) {
        intentCodes[u] = intentOrder.remap[local[intent] as number] as number;
        anyIntent = true;
      }
      tagsRead(copy, k, reading, tags, offsets[u] as number);
    }
    tagArrays.push(tags);
    intentArrays.push(intentCodes);
    presentArrays.push(present);
    lineArrays.push(new Int32Array(count));
    hasIntents.push(anyIntent);
    updated.push(times);
    const statusCounts: Partial<Record<LayerStatus, number>> = {};
    LAYER_STATUSES.forEach((s, i) => {
      if ((byCode[i + 1] as number) > 0) statusCounts[s] = byCode[i + 1] as number;
    });
    counted.push({ annotator: copy.annotator, layers: pick.length, statuses: statusCounts });
  });
  const tagLabels = ['O'];
  for (const slot of slotOrder.names) tagLabels.push(`B-${slot}`, `I-${slot}`);
  const corpus: AlignedCorpus = {
    by: 'id',
    layers: copies.map((c) => c.annotator),
    ids: Array.from(ids, (id) => String(id)),
    utteranceCount: count,
    tokenCount,
    offsets,
    slots: ['O', ...slotOrder.names],
    tagLabels,
    intentLabels: intentOrder.names,
    tags: tagArrays,
    intents: intentArrays,
    present: presentArrays,
    lines: lineArrays,
    hasIntents,
  };
  return { corpus, counted, updated };
}
