/**
 * Filtering and sorting the utterance table over a CorpusIndex (corpus-index.ts): the answer is the
 * matching utterance ids, in order, as one Int32Array; no row is read here.
 */
import { LAYER_STATUSES, type LayerStatus } from '../core/backup/model';
import { STATUS_CODE, type CorpusIndex, type LayerColumn } from './corpus-index';

export interface CorpusFilter {
  /** Case-insensitive substring of the text. */
  text?: string;
  slot?: string;
  intent?: string;
  status?: LayerStatus;
  /** Utterances this annotator has a layer on. */
  annotator?: string;
  violations?: boolean;
  disagreement?: boolean;
}

export const CORPUS_SORT_KEYS = ['id', 'text', 'intent', 'status', 'done', 'violations'] as const;
export type CorpusSortKey = (typeof CORPUS_SORT_KEYS)[number];

export interface CorpusSort {
  key: CorpusSortKey;
  desc: boolean;
}

export interface CorpusQuery {
  /** The layer whose labels the table shows, filters and sorts by (null: none, only the file's intent). */
  layer: string | null;
  filter: CorpusFilter;
  sort: CorpusSort;
  /** Blind mode: nothing derived from other people's labels may filter or order the rows. */
  blind: boolean;
}

export const CORPUS_SORT_DEFAULT: CorpusSort = { key: 'id', desc: false };

function emptyColumn(n: number): LayerColumn {
  return { status: new Uint8Array(n), intent: new Uint16Array(n), violations: new Uint16Array(n), slots: new Map() };
}

/** Intent code shown for utterance i: the layer's, or the file's when the layer has none. */
function intentCodes(index: CorpusIndex, column: LayerColumn): Uint16Array {
  const n = index.ids.length;
  const codes = new Uint16Array(n);
  for (let i = 0; i < n; i++) codes[i] = column.status[i] !== 0 ? (column.intent[i] ?? 0) : (index.intentHint[i] ?? 0);
  return codes;
}

/** Positions (in seq order) of utterances whose text contains `needle` (already lower-cased). */
function textMatches(index: CorpusIndex, needle: string): Uint8Array {
  const n = index.ids.length;
  const hit = new Uint8Array(n);
  const { text, textStart } = index;
  let from = 0;
  let i = 0;
  for (;;) {
    const at = text.indexOf(needle, from);
    if (at < 0) break;
    // Texts are in order, so the owner of a later hit is found by walking forward.
    while (i + 1 < n && (textStart[i + 1] as number) <= at) i++;
    hit[i] = 1;
    if (i + 1 >= n) break;
    from = textStart[i + 1] as number;
  }
  return hit;
}

const textRanks = new WeakMap<CorpusIndex, Int32Array>();
const collator = new Intl.Collator(undefined, { sensitivity: 'base', numeric: true });

/**
 * The text's sort key: lower-cased (already, in the index) with accents taken off, compared by code
 * unit. A collator compares 100k texts several times slower; this order differs from it only for
 * digits and letters outside the basic Latin ones.
 */
export function textSortKey(lowerText: string): string {
  return lowerText.normalize('NFD').replace(/\p{M}+/gu, '');
}

/** Rank of each text in alphabetical order (computed once per index, on the first sort by text). */
function textRank(index: CorpusIndex): Int32Array {
  let rank = textRanks.get(index);
  if (rank !== undefined) return rank;
  const n = index.ids.length;
  const keys: string[] = new Array<string>(n);
  for (let i = 0; i < n; i++) keys[i] = textSortKey(index.text.slice(index.textStart[i], (index.textStart[i + 1] as number) - 1));
  const order = Int32Array.from({ length: n }, (_, i) => i).sort((a, b) => {
    const ka = keys[a] as string;
    const kb = keys[b] as string;
    return ka < kb ? -1 : ka > kb ? 1 : a - b;
  });
  rank = new Int32Array(n);
  order.forEach((position, r) => {
    (rank as Int32Array)[position] = r;
  });
  textRanks.set(index, rank);
  return rank;
}

/** Rank of each intent code by name (code 0, no intent, first). */
function intentRank(index: CorpusIndex): Int32Array {
  const names = index.intents.map((name, i) => ({ name, code: i + 1 })).sort((a, b) => collator.compare(a.name, b.name));
  const rank = new Int32Array(index.intents.length + 1);
  names.forEach((entry, r) => {
    rank[entry.code] = r + 1;
  });
  return rank;
}

function sortKeys(index: CorpusIndex, column: LayerColumn, key: CorpusSortKey): ArrayLike<number> | null {
  switch (key) {
    case 'id':
      return null;
    case 'text':
      return textRank(index);
    case 'intent': {
      const codes = intentCodes(index, column);
      const rank = intentRank(index);
      return Int32Array.from(codes, (c) => rank[c] ?? 0);
    }
    case 'status':
      // No layer sorts with unlabelled.
      return Uint8Array.from(column.status, (s) => (s === 0 ? STATUS_CODE.unlabelled : s));
    case 'done':
      return index.done;
    case 'violations':
      return column.violations;
  }
}

/** The ids of the utterances that pass the filter, in the requested order (ties in seq order). */
export function corpusQueryRun(index: CorpusIndex, query: CorpusQuery): Int32Array {
  const n = index.ids.length;
  const column = (query.layer === null ? undefined : index.layers.get(query.layer)) ?? emptyColumn(n);
  const { filter } = query;
  // U+0000 separates the texts in the index, so it can never be part of a match.
  const needle = (filter.text ?? '').replaceAll('\u0000', '').toLowerCase();
  const textHit = needle === '' ? null : textMatches(index, needle);
  const slotHit = filter.slot === undefined ? null : (column.slots.get(filter.slot) ?? new Uint8Array(n));
  const intents = filter.intent === undefined ? null : intentCodes(index, column);
  const intentWanted = filter.intent === undefined ? -1 : index.intents.indexOf(filter.intent) + 1;
  const statusWanted = filter.status === undefined ? 0 : STATUS_CODE[filter.status];
  const owner = filter.annotator === undefined ? null : (index.layers.get(filter.annotator)?.status ?? new Uint8Array(n));
  const disagreement = filter.disagreement === true && !query.blind;
  const matches = new Int32Array(n);
  let count = 0;
  for (let i = 0; i < n; i++) {
    if (textHit !== null && textHit[i] === 0) continue;
    if (slotHit !== null && slotHit[i] !== 1) continue;
    if (intents !== null && (intentWanted === 0 || intents[i] !== intentWanted)) continue;
    if (statusWanted !== 0) {
      const s = column.status[i] === 0 ? STATUS_CODE.unlabelled : column.status[i];
      if (s !== statusWanted) continue;
    }
    if (owner !== null && owner[i] === 0) continue;
    if (filter.violations === true && column.violations[i] === 0) continue;
    if (disagreement && index.disagree[i] === 0) continue;
    matches[count++] = i;
  }
  const order = matches.subarray(0, count);
  const keys = sortKeys(index, column, query.sort.key);
  if (keys !== null) {
    const sign = query.sort.desc ? -1 : 1;
    order.sort((a, b) => sign * ((keys[a] as number) - (keys[b] as number)) || a - b);
  } else if (query.sort.desc) {
    order.reverse();
  }
  const ids = new Int32Array(count);
  for (let r = 0; r < count; r++) ids[r] = index.ids[order[r] as number] as number;
  return ids;
}

/** Statuses in display order, for filter choices. */
export const CORPUS_STATUSES: readonly LayerStatus[] = LAYER_STATUSES;
