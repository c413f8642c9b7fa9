import type { Utterance } from '../types';
import { AlignErrorList, lineText, placeText, utteranceName } from './align-errors';
import {
  AlignLayerGatherer,
  layerLine,
  layerTokenCount,
  layerTokenLine,
  layerTokensFirstDifference,
  layerTokenText,
  type AlignLayerData,
} from './align-layer';
import { LabelInterner } from './labels';
import { MISSING, type AlignBy, type AlignedCorpus, type AlignErrorPlace, type AlignLayer, type AlignOptions, type AlignResult } from './types';

/** Per layer, the index of its utterance at each aligned position (-1 where absent). */
interface Rows {
  count: number;
  rows: Int32Array[];
  ids: (string | null)[];
}

function placeAt(layer: AlignLayerData, k: number): AlignErrorPlace {
  return { layer: layer.name, line: layerLine(layer, k) };
}

/**
 * The common case without a map: every layer has the first layer's ids in the same order, and the
 * first layer's ids rise strictly (code-unit order), so they are distinct. `rowsById` would then
 * give every layer the identity row and report nothing; null when the case does not hold.
 */
function rowsInSameOrder(layers: readonly AlignLayerData[]): Rows | null {
  const first = layers[0];
  if (first === undefined) return null;
  const ids = first.ids;
  const count = first.count;
  let previous = '';
  for (let k = 0; k < count; k++) {
    const id = ids[k] ?? null;
    if (id === null || (k > 0 && !(previous < id))) return null;
    previous = id;
  }
  for (let l = 1; l < layers.length; l++) {
    const other = layers[l] as AlignLayerData;
    if (other.count !== count) return null;
    const otherIds = other.ids;
    for (let k = 0; k < count; k++) if (otherIds[k] !== ids[k]) return null;
  }
  const identity = new Int32Array(count);
  for (let k = 0; k < count; k++) identity[k] = k;
  return { count, rows: layers.map(() => identity.slice()), ids: ids.slice(0, count) };
}

function rowsById(layers: readonly AlignLayerData[], errors: AlignErrorList): Rows {
  const same = rowsInSameOrder(layers);
  if (same !== null) return same;
  const positions = new Map<string, number>();
  const ids: string[] = [];
  const lists: number[][] = layers.map(() => []);
  layers.forEach((layer, l) => {
    const list = lists[l] ?? [];
    for (let k = 0; k < layer.count; k++) {
      const id = layer.ids[k] ?? null;
      if (id === null) {
        const place = placeAt(layer, k);
        errors.add('missing-id', null, k, [place], `${placeText(place)}: utterance without an id; aligning by id needs one on every utterance`);
        continue;
      }
      let position = positions.get(id);
      if (position === undefined) {
        position = ids.length;
        positions.set(id, position);
        ids.push(id);
      }
      const earlier = list[position];
      if (earlier !== undefined && earlier >= 0) {
        const first = placeAt(layer, earlier);
        const second = placeAt(layer, k);
        errors.add('duplicate-id', id, position, [first, second], `id ${id} occurs twice in ${layer.name} (${lineText(first.line)} and ${lineText(second.line)})`);
        continue;
      }
      while (list.length < position) list.push(-1);
      list[position] = k;
    }
  });
  const rows = lists.map((list) => {
    const row = new Int32Array(ids.length).fill(-1);
    row.set(list);
    return row;
  });
  return { count: ids.length, rows, ids };
}

function rowsByPosition(layers: readonly AlignLayerData[]): Rows {
  const count = Math.max(0, ...layers.map((layer) => layer.count));
  const rows = layers.map((layer) => {
    const row = new Int32Array(count).fill(-1);
    for (let k = 0; k < layer.count; k++) row[k] = k;
    return row;
  });
  const ids = Array.from({ length: count }, (_, u) => {
    const layer = layers.find((candidate) => u < candidate.count);
    return layer === undefined ? null : (layer.ids[u] ?? null);
  });
  return { count, rows, ids };
}

/** Check every present utterance against the first layer holding it; returns each position's token count. */
function tokensCheck(layers: readonly AlignLayerData[], rows: Rows, errors: AlignErrorList): Int32Array {
  const counts = new Int32Array(rows.count);
  // Plain loops, and places built only for an error: this runs once per utterance and layer.
  for (let u = 0; u < rows.count; u++) {
    let reference: AlignLayerData | undefined;
    let referenceK = -1;
    let referenceTokens = 0;
    for (let l = 0; l < layers.length; l++) {
      const layer = layers[l] as AlignLayerData;
      const k = rows.rows[l]?.[u] ?? -1;
      if (k < 0) continue;
      const tokens = layerTokenCount(layer, k);
      const tags = layer.tagCounts[k] ?? 0;
      if (tags !== tokens) {
        const id = rows.ids[u] ?? null;
        const place = placeAt(layer, k);
        errors.add('tags-count', id, u, [place], `${utteranceName(id, u)} in ${placeText(place)}: ${String(tokens)} tokens but ${String(tags)} tags`);
      }
      if (reference === undefined) {
        reference = layer;
        referenceK = k;
        referenceTokens = tokens;
        counts[u] = tokens;
        continue;
      }
      if (tokens !== referenceTokens) {
        const id = rows.ids[u] ?? null;
        const places = [placeAt(reference, referenceK), placeAt(layer, k)];
        const a = `${placeText(places[0] ?? { layer: '', line: null })} has ${String(referenceTokens)} tokens`;
        const b = `${placeText(places[1] ?? { layer: '', line: null })} has ${String(tokens)}`;
        errors.add('tokens-differ', id, u, places, `${utteranceName(id, u)}: ${a}, ${b}`);
        continue;
      }
      const t = layerTokensFirstDifference(reference, referenceK, layer, k);
      if (t >= 0) {
        const id = rows.ids[u] ?? null;
        const places = [placeAt(reference, referenceK), placeAt(layer, k)];
        const a = `${JSON.stringify(layerTokenText(reference, referenceK, t))} in ${reference.name} (${lineText(layerTokenLine(reference, referenceK, t))})`;
        const b = `${JSON.stringify(layerTokenText(layer, k, t))} in ${layer.name} (${lineText(layerTokenLine(layer, k, t))})`;
        errors.add('tokens-differ', id, u, places, `${utteranceName(id, u)}, token ${String(t + 1)}: ${a} but ${b}`);
      }
    }
  }
  return counts;
}

/** Per layer, local tag code -> final tag code (slots renumbered by name; the B/I layout keeps its parity). */
function tagRemaps(layers: readonly AlignLayerData[]): { remaps: Int32Array[]; slotNames: string[] } {
  const slots = new LabelInterner(1);
  const global = layers.map((layer) => layer.slotNames.map((name) => slots.code(name)));
  const order = slots.sorted();
  const remaps = global.map((codes) => {
    const remap = new Int32Array(2 * codes.length + 1);
    codes.forEach((code, i) => {
      const to = order.remap[code] ?? code;
      remap[2 * (i + 1) - 1] = 2 * to - 1;
      remap[2 * (i + 1)] = 2 * to;
    });
    return remap;
  });
  return { remaps, slotNames: order.names };
}

function intentRemaps(layers: readonly AlignLayerData[]): { remaps: Int32Array[]; names: string[] } {
  const intents = new LabelInterner(0);
  const global = layers.map((layer) => layer.intentNames.map((name) => intents.code(name)));
  const order = intents.sorted();
  return { remaps: global.map((codes) => Int32Array.from(codes, (code) => order.remap[code] ?? code)), names: order.names };
}

function corpusBuild(layers: readonly AlignLayerData[], rows: Rows, by: AlignBy, counts: Int32Array): AlignedCorpus {
  const offsets = new Int32Array(rows.count + 1);
  for (let u = 0; u < rows.count; u++) offsets[u + 1] = (offsets[u] ?? 0) + (counts[u] ?? 0);
  const tokenCount = offsets[rows.count] ?? 0;
  const slotMaps = tagRemaps(layers);
  const intentMaps = intentRemaps(layers);
  const tagArrays: Int32Array[] = [];
  const intentArrays: Int32Array[] = [];
  const presentArrays: Uint8Array[] = [];
  const lineArrays: Int32Array[] = [];
  const hasIntents: boolean[] = [];
  layers.forEach((layer, l) => {
    const row = rows.rows[l] ?? new Int32Array(rows.count).fill(-1);
    const tagRemap = slotMaps.remaps[l] ?? new Int32Array(1);
    const intentRemap = intentMaps.remaps[l] ?? new Int32Array(0);
    const tags = new Int32Array(tokenCount).fill(MISSING);
    const intentCodes = new Int32Array(rows.count).fill(MISSING);
    const present = new Uint8Array(rows.count);
    const lines = new Int32Array(rows.count);
    for (let u = 0; u < rows.count; u++) {
      const k = row[u] ?? -1;
      if (k < 0) continue;
      present[u] = 1;
      lines[u] = layerLine(layer, k) ?? 0;
      const from = layer.tokenStart[k] ?? 0;
      const to = layer.tokenStart[k + 1] ?? 0;
      const at = (offsets[u] ?? 0) - from;
      for (let t = from; t < to; t++) tags[at + t] = tagRemap[layer.tags[t] ?? 0] ?? 0;
      const intent = layer.intents[k] ?? MISSING;
      if (intent !== MISSING) intentCodes[u] = intentRemap[intent] ?? intent;
    }
    tagArrays.push(tags);
    intentArrays.push(intentCodes);
    presentArrays.push(present);
    lineArrays.push(lines);
    hasIntents.push(layer.intents.some((intent) => intent !== MISSING));
  });
  const tagLabels = ['O'];
  for (const slot of slotMaps.slotNames) tagLabels.push(`B-${slot}`, `I-${slot}`);
  return {
    by,
    layers: layers.map((layer) => layer.name),
    ids: rows.ids,
    utteranceCount: rows.count,
    tokenCount,
    offsets,
    slots: ['O', ...slotMaps.slotNames],
    tagLabels,
    intentLabels: intentMaps.names,
    tags: tagArrays,
    intents: intentArrays,
    present: presentArrays,
    lines: lineArrays,
    hasIntents,
  };
}

/** `layersAlign` over layers already gathered (streamed, or gathered on other threads). */
export function layerDataAlign(layers: readonly AlignLayerData[], options: AlignOptions = {}): AlignResult {
  const errors = new AlignErrorList(options.errorLimit ?? 100);
  const allHaveIds = layers.every((layer) => layer.ids.every((id) => id !== null));
  const by: AlignBy = options.by === undefined || options.by === 'auto' ? (allHaveIds ? 'id' : 'position') : options.by;
  const rows = by === 'id' ? rowsById(layers, errors) : rowsByPosition(layers);
  const counts = tokensCheck(layers, rows, errors);
  if (errors.count > 0) return { ok: false, errors: errors.errors, errorCount: errors.count };
  return { ok: true, corpus: corpusBuild(layers, rows, by, counts) };
}

/** Builds an alignment from layers whose utterances stream by one at a time; none is kept as an object. */
export interface AlignBuilder {
  /** `size` (when known) lets the layer's arrays be allocated once. */
  layerBegin(name: string, size?: { utterances: number; tokens: number }): void;
  utteranceAdd(utterance: Utterance): void;
  layerEnd(): void;
  /** A layer gathered elsewhere (e.g. on a worker thread with `AlignLayerGatherer`). */
  layerAdd(layer: AlignLayerData): void;
  finish(): AlignResult;
}

export function alignBuilder(options: AlignOptions = {}): AlignBuilder {
  const layers: AlignLayerData[] = [];
  let open: AlignLayerGatherer | null = null;
  const openLayer = (): AlignLayerGatherer => {
    if (open === null) throw new Error('alignBuilder: utteranceAdd or layerEnd outside layerBegin … layerEnd');
    return open;
  };
  return {
    layerBegin(name, size) {
      if (open !== null) throw new Error('alignBuilder: layerBegin before the previous layerEnd');
      open = new AlignLayerGatherer(name, size);
    },
    utteranceAdd(utterance) {
      openLayer().utteranceAdd(utterance);
    },
    layerEnd() {
      layers.push(openLayer().done());
      open = null;
    },
    layerAdd(layer) {
      if (open !== null) throw new Error('alignBuilder: layerAdd inside layerBegin … layerEnd');
      layers.push(layer);
    },
    finish() {
      if (open !== null) throw new Error('alignBuilder: finish before layerEnd');
      return layerDataAlign(layers, options);
    },
  };
}

/**
 * Put annotation layers of the same utterances on one token grid. Utterances pair up by id, or by
 * position (then a shorter layer lacks the trailing utterances); one missing from a layer is kept
 * with missing values there. Aligned order: the first layer's utterances, then ids first seen in
 * later layers. Tags of any scheme become IOB2 as `tagsConvert` makes them (its lenient CoNLL-2000
 * reading is one for all three schemes, so `scheme` only names the source). Mismatched tokens,
 * duplicate or missing ids are all reported (up to `errorLimit`), never skipped.
 */
export function layersAlign(layers: readonly AlignLayer[], options: AlignOptions = {}): AlignResult {
  const builder = alignBuilder(options);
  for (const layer of layers) {
    let tokens = 0;
    for (const utterance of layer.utterances) tokens += utterance.tokens.length;
    builder.layerBegin(layer.name, { utterances: layer.utterances.length, tokens });
    for (const utterance of layer.utterances) builder.utteranceAdd(utterance);
    builder.layerEnd();
  }
  return builder.finish();
}
