/**
 * The utterance table's state in the URL query (`#/p/3/corpus?slot=area&sort=-violations`), so a
 * filtered view can be bookmarked, shared and restored on reload. Values that do not parse are
 * dropped rather than guessed; the default sort (id, ascending) is left out of the URL.
 */
import { LAYER_STATUSES, type LayerStatus } from '../../../core/backup/model';
import { CORPUS_SORT_DEFAULT, CORPUS_SORT_KEYS, type CorpusFilter, type CorpusSort, type CorpusSortKey } from '../../../db/corpus-query';

export interface CorpusViewState {
  filter: CorpusFilter;
  sort: CorpusSort;
  /** The layer chosen to show (non-blind mode); null: the default one. */
  layer: string | null;
}

export const CORPUS_QUERY_KEYS = {
  text: 'q',
  slot: 'slot',
  intent: 'intent',
  status: 'status',
  annotator: 'by',
  violations: 'problems',
  disagreement: 'differ',
  layer: 'layer',
  sort: 'sort',
} as const;

const K = CORPUS_QUERY_KEYS;

function nonEmpty(value: string | undefined): string | undefined {
  return value === undefined || value === '' ? undefined : value;
}

export function corpusSortParse(value: string | undefined): CorpusSort {
  if (value === undefined) return CORPUS_SORT_DEFAULT;
  const desc = value.startsWith('-');
  const key = desc ? value.slice(1) : value;
  return (CORPUS_SORT_KEYS as readonly string[]).includes(key) ? { key: key as CorpusSortKey, desc } : CORPUS_SORT_DEFAULT;
}

export function corpusStateFromQuery(query: Readonly<Record<string, string>>): CorpusViewState {
  const filter: CorpusFilter = {};
  const text = nonEmpty(query[K.text]);
  if (text !== undefined) filter.text = text;
  const slot = nonEmpty(query[K.slot]);
  if (slot !== undefined) filter.slot = slot;
  const intent = nonEmpty(query[K.intent]);
  if (intent !== undefined) filter.intent = intent;
  const status = query[K.status];
  if (status !== undefined && (LAYER_STATUSES as readonly string[]).includes(status)) filter.status = status as LayerStatus;
  const annotator = nonEmpty(query[K.annotator]);
  if (annotator !== undefined) filter.annotator = annotator;
  if (query[K.violations] === '1') filter.violations = true;
  if (query[K.disagreement] === '1') filter.disagreement = true;
  return { filter, sort: corpusSortParse(query[K.sort]), layer: nonEmpty(query[K.layer]) ?? null };
}

export function corpusStateToQuery(state: CorpusViewState): Record<string, string> {
  const { filter, sort, layer } = state;
  const query: Record<string, string> = {};
  if (filter.text !== undefined && filter.text !== '') query[K.text] = filter.text;
  if (filter.slot !== undefined) query[K.slot] = filter.slot;
  if (filter.intent !== undefined) query[K.intent] = filter.intent;
  if (filter.status !== undefined) query[K.status] = filter.status;
  if (filter.annotator !== undefined) query[K.annotator] = filter.annotator;
  if (filter.violations === true) query[K.violations] = '1';
  if (filter.disagreement === true) query[K.disagreement] = '1';
  if (layer !== null) query[K.layer] = layer;
  if (sort.key !== CORPUS_SORT_DEFAULT.key || sort.desc !== CORPUS_SORT_DEFAULT.desc) query[K.sort] = `${sort.desc ? '-' : ''}${sort.key}`;
  return query;
}

/** True when the table needs the filter index: anything but every utterance in seq order. */
export function corpusStateNeedsIndex(state: CorpusViewState, blind: boolean): boolean {
  const f = state.filter;
  const filtered =
    (f.text ?? '') !== '' || f.slot !== undefined || f.intent !== undefined || f.status !== undefined || f.annotator !== undefined || f.violations === true || (f.disagreement === true && !blind);
  return filtered || state.sort.key !== 'id';
}

/** How many filters are set (the layer choice and the sort are not filters). */
export function corpusFilterCount(filter: CorpusFilter): number {
  return Object.values(filter).filter((v) => v !== undefined && v !== '' && v !== false).length;
}
