/**
 * The alignment as it was before the streaming builder (commit f02dd71), kept verbatim as the
 * reference the builder-based `layersAlign` must equal (tests/core/agreement/align-builder.test.ts).
 */
import type { Utterance } from '../../../src/core/types';
import { AlignErrorList, lineText, placeText, utteranceName } from '../../../src/core/agreement/align-errors';
import { LabelInterner, RawPrefix, RawTagTable } from '../../../src/core/agreement/labels';
import {
  MISSING,
  type AlignBy,
  type AlignedCorpus,
  type AlignErrorPlace,
  type AlignLayer,
  type AlignOptions,
  type AlignResult,
} from '../../../src/core/agreement/types';

function placeOf(layer: string, utterance: Utterance): AlignErrorPlace {
  return { layer, line: utterance.line ?? null };
}

/** Where a token sits: its own line when the reader recorded one, else the utterance's. */
function tokenPlaceText(layer: string, utterance: Utterance, token: number): string {
  return `${layer} (${lineText(utterance.tokenLines?.[token] ?? utterance.line)})`;
}

function tokenText(utterance: Utterance, token: number): string {
  const range = utterance.tokens[token];
  return range === undefined ? '' : utterance.text.slice(range.start, range.end);
}

/** Index of the first token whose text differs, -1 when the sequences match (counts must be equal). */
function tokensFirstDifference(a: Utterance, b: Utterance): number {
  const sameText = a.text === b.text;
  for (let t = 0; t < a.tokens.length; t++) {
    const x = a.tokens[t];
    const y = b.tokens[t];
    if (x === undefined || y === undefined) return t;
    if (sameText && x.start === y.start && x.end === y.end) continue;
    if (a.text.slice(x.start, x.end) !== b.text.slice(y.start, y.end)) return t;
  }
  return -1;
}

function idOf(utterance: Utterance): string | null {
  return utterance.id === undefined || utterance.id === '' ? null : utterance.id;
}

/** Per layer, the index of its utterance at each aligned position (-1 where absent). */
interface Rows {
  count: number;
  rows: Int32Array[];
  ids: (string | null)[];
}

function rowsById(layers: readonly AlignLayer[], errors: AlignErrorList): Rows {
  const positions = new Map<string, number>();
  const ids: string[] = [];
  const lists: number[][] = layers.map(() => []);
  layers.forEach((layer, l) => {
    const list = lists[l] ?? [];
    layer.utterances.forEach((utterance, k) => {
      const id = idOf(utterance);
      if (id === null) {
        const place = placeOf(layer.name, utterance);
        errors.add('missing-id', null, k, [place], `${placeText(place)}: utterance without an id; aligning by id needs one on every utterance`);
        return;
      }
      let position = positions.get(id);
      if (position === undefined) {
        position = ids.length;
        positions.set(id, position);
        ids.push(id);
      }
      const earlier = list[position];
      if (earlier !== undefined && earlier >= 0) {
        const first = placeOf(layer.name, layer.utterances[earlier] ?? utterance);
        const second = placeOf(layer.name, utterance);
        errors.add('duplicate-id', id, position, [first, second], `id ${id} occurs twice in ${layer.name} (${lineText(first.line)} and ${lineText(second.line)})`);
        return;
      }
      while (list.length < position) list.push(-1);
      list[position] = k;
    });
  });
  const rows = lists.map((list) => {
    const row = new Int32Array(ids.length).fill(-1);
    row.set(list);
    return row;
  });
  return { count: ids.length, rows, ids };
}

function rowsByPosition(layers: readonly AlignLayer[]): Rows {
  const count = Math.max(0, ...layers.map((layer) => layer.utterances.length));
  const rows = layers.map((layer) => {
    const row = new Int32Array(count).fill(-1);
    for (let k = 0; k < layer.utterances.length; k++) row[k] = k;
    return row;
  });
  const ids = Array.from({ length: count }, (_, u) => {
    for (const layer of layers) {
      const utterance = layer.utterances[u];
      if (utterance !== undefined) return idOf(utterance);
    }
    return null;
  });
  return { count, rows, ids };
}

/** Check every present utterance against the first layer holding it; returns each position's reference. */
function tokensCheck(layers: readonly AlignLayer[], rows: Rows, errors: AlignErrorList): (Utterance | undefined)[] {
  const references: (Utterance | undefined)[] = new Array<Utterance | undefined>(rows.count);
  for (let u = 0; u < rows.count; u++) {
    let reference: Utterance | undefined;
    let referenceLayer = '';
    const name = utteranceName(rows.ids[u] ?? null, u);
    layers.forEach((layer, l) => {
      const k = rows.rows[l]?.[u] ?? -1;
      const utterance = k >= 0 ? layer.utterances[k] : undefined;
      if (utterance === undefined) return;
      if (utterance.tags.length !== utterance.tokens.length) {
        const place = placeOf(layer.name, utterance);
        const counts = `${String(utterance.tokens.length)} tokens but ${String(utterance.tags.length)} tags`;
        errors.add('tags-count', rows.ids[u] ?? null, u, [place], `${name} in ${placeText(place)}: ${counts}`);
      }
      if (reference === undefined) {
        reference = utterance;
        referenceLayer = layer.name;
        return;
      }
      const places = [placeOf(referenceLayer, reference), placeOf(layer.name, utterance)];
      if (utterance.tokens.length !== reference.tokens.length) {
        const a = `${placeText(places[0] ?? { layer: '', line: null })} has ${String(reference.tokens.length)} tokens`;
        const b = `${placeText(places[1] ?? { layer: '', line: null })} has ${String(utterance.tokens.length)}`;
        errors.add('tokens-differ', rows.ids[u] ?? null, u, places, `${name}: ${a}, ${b}`);
        return;
      }
      const t = tokensFirstDifference(reference, utterance);
      if (t >= 0) {
        const a = `${JSON.stringify(tokenText(reference, t))} in ${tokenPlaceText(referenceLayer, reference, t)}`;
        const b = `${JSON.stringify(tokenText(utterance, t))} in ${tokenPlaceText(layer.name, utterance, t)}`;
        errors.add('tokens-differ', rows.ids[u] ?? null, u, places, `${name}, token ${String(t + 1)}: ${a} but ${b}`);
      }
    });
    references[u] = reference;
  }
  return references;
}

/**
 * Write one utterance's tags as IOB2 codes: the lenient CoNLL-2000 reading of `spansFromTags` then
 * IOB2 encoding, i.e. what `tagsConvert(tags, 'iob2')` gives, without building strings.
 */
function tagsEncode(tags: readonly string[], raw: RawTagTable, out: Int32Array, at: number): void {
  let open = 0;
  for (let t = 0; t < tags.length; t++) {
    const code = raw.code(tags[t] ?? 'O');
    const prefix = raw.prefix[code] ?? RawPrefix.O;
    const slot = raw.slot[code] ?? 0;
    if (prefix === RawPrefix.O) {
      open = 0;
      out[at + t] = 0;
      continue;
    }
    if ((prefix === RawPrefix.I || prefix === RawPrefix.E) && open === slot) {
      out[at + t] = 2 * slot;
    } else {
      out[at + t] = 2 * slot - 1;
      open = slot;
    }
    if (prefix === RawPrefix.E || prefix === RawPrefix.S) open = 0;
  }
}

function codesRemap(codes: Int32Array, remap: Int32Array): void {
  for (let i = 0; i < codes.length; i++) {
    const code = codes[i] ?? MISSING;
    if (code !== MISSING) codes[i] = remap[code] ?? code;
  }
}

/** Tag code remap induced by a slot remap (the B/I layout keeps its parity). */
function tagRemapFromSlots(slotRemap: Int32Array): Int32Array {
  const remap = new Int32Array(2 * slotRemap.length - 1);
  for (let s = 1; s < slotRemap.length; s++) {
    const to = slotRemap[s] ?? s;
    remap[2 * s - 1] = 2 * to - 1;
    remap[2 * s] = 2 * to;
  }
  return remap;
}

function corpusBuild(layers: readonly AlignLayer[], rows: Rows, by: AlignBy, references: (Utterance | undefined)[]): AlignedCorpus {
  const offsets = new Int32Array(rows.count + 1);
  for (let u = 0; u < rows.count; u++) offsets[u + 1] = (offsets[u] ?? 0) + (references[u]?.tokens.length ?? 0);
  const tokenCount = offsets[rows.count] ?? 0;
  const slots = new LabelInterner(1);
  const intents = new LabelInterner(0);
  const raw = new RawTagTable(slots);
  const tagArrays: Int32Array[] = [];
  const intentArrays: Int32Array[] = [];
  const presentArrays: Uint8Array[] = [];
  const lineArrays: Int32Array[] = [];
  const hasIntents: boolean[] = [];
  layers.forEach((layer, l) => {
    const row = rows.rows[l] ?? new Int32Array(rows.count).fill(-1);
    const tags = new Int32Array(tokenCount).fill(MISSING);
    const intentCodes = new Int32Array(rows.count).fill(MISSING);
    const present = new Uint8Array(rows.count);
    const lines = new Int32Array(rows.count);
    let anyIntent = false;
    for (let u = 0; u < rows.count; u++) {
      const utterance = layer.utterances[row[u] ?? -1];
      if (utterance === undefined) continue;
      present[u] = 1;
      lines[u] = utterance.line ?? 0;
      tagsEncode(utterance.tags, raw, tags, offsets[u] ?? 0);
      if (utterance.intent !== undefined) {
        intentCodes[u] = intents.code(utterance.intent);
        anyIntent = true;
      }
    }
    tagArrays.push(tags);
    intentArrays.push(intentCodes);
    presentArrays.push(present);
    lineArrays.push(lines);
    hasIntents.push(anyIntent);
  });
  const slotOrder = slots.sorted();
  const intentOrder = intents.sorted();
  const tagRemap = tagRemapFromSlots(slotOrder.remap);
  for (const tags of tagArrays) codesRemap(tags, tagRemap);
  for (const codes of intentArrays) codesRemap(codes, intentOrder.remap);
  const slotNames = ['O', ...slotOrder.names];
  const tagLabels = ['O'];
  for (const slot of slotOrder.names) tagLabels.push(`B-${slot}`, `I-${slot}`);
  return {
    by,
    layers: layers.map((layer) => layer.name),
    ids: rows.ids,
    utteranceCount: rows.count,
    tokenCount,
    offsets,
    slots: slotNames,
    tagLabels,
    intentLabels: intentOrder.names,
    tags: tagArrays,
    intents: intentArrays,
    present: presentArrays,
    lines: lineArrays,
    hasIntents,
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
export function layersAlignPrevious(layers: readonly AlignLayer[], options: AlignOptions = {}): AlignResult {
  const errors = new AlignErrorList(options.errorLimit ?? 100);
  const allHaveIds = layers.every((layer) => layer.utterances.every((utterance) => idOf(utterance) !== null));
  const by: AlignBy = options.by === undefined || options.by === 'auto' ? (allHaveIds ? 'id' : 'position') : options.by;
  const rows = by === 'id' ? rowsById(layers, errors) : rowsByPosition(layers);
  const references = tokensCheck(layers, rows, errors);
  if (errors.count > 0) return { ok: false, errors: errors.errors, errorCount: errors.count };
  return { ok: true, corpus: corpusBuild(layers, rows, by, references) };
}
