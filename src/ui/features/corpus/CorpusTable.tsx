import { createColumnHelper, rowSortingFeature, tableFeatures, useTable, type ReactTable, type Row, type SortingState, type Updater } from '@tanstack/react-table';
import { useVirtualizer } from '@tanstack/react-virtual';
import { memo, useCallback, useEffect, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import type { ProjectSchema } from '../../../core/backup/model';
import { CORPUS_SORT_DEFAULT, CORPUS_SORT_KEYS, type CorpusSort, type CorpusSortKey } from '../../../db/corpus-query';
import { corpusRowsRead, type CorpusRow } from '../../../db/corpus-rows';
import { appDb } from '../../app/db';
import { corpusMark } from './corpus-client';
import { rowIndexAfterKey } from './row-keys';
import { SlotText } from './SlotText';

/** Fixed row height (px): a fixed size lets the virtualiser place any of 100k rows without measuring. */
export const CORPUS_ROW_HEIGHT = 40;
/** Rows read from the database at a time; windows are whole pages so small scrolls reuse a read. */
const PAGE = 50;
/** Rows the table reads first at the top (its first page and the margin after it). */
export const CORPUS_ROWS_FIRST = 2 * PAGE;
/** Rows kept in memory beyond the visible window, so scrolling back does not flash placeholders. */
const CACHE_MAX = 1000;

interface RowCache {
  key: string;
  rows: Map<number, CorpusRow>;
  /** Rows of the same view before the data changed, shown until the fresh ones arrive. */
  stale: Map<number, CorpusRow>;
  reading: Set<number>;
  /** The pre-read rows already taken in. */
  seeded: unknown;
}

/** One place in the table: its position and the row when read. */
interface Slot {
  index: number;
  row: CorpusRow | undefined;
}

const features = tableFeatures({ rowSortingFeature });
const helper = createColumnHelper<typeof features, Slot>();

export interface CorpusTableProps {
  projectId: number;
  ids: Int32Array;
  layer: string | null;
  blind: boolean;
  schema: ProjectSchema;
  sort: CorpusSort;
  onSort: (sort: CorpusSort) => void;
  onOpen: (utteranceId: number) => void;
  describedBy: string;
  busy: boolean;
  /** Changes whenever the project's data does (see corpusIndexSignature), so visible rows are read again. */
  signature: string;
  /** Rows read ahead of the ids (the top of the plain table), for the view and data state `key` names (see corpusRowsKey). */
  preread?: { key: string; rows: readonly CorpusRow[] } | null;
}

/** What rows read for a table belong to: one way of showing them and one state of the data. */
export function corpusRowsKey(projectId: number, layer: string | null, blind: boolean, signature: string): string {
  return `${projectId}|${layer ?? ''}|${blind}|${signature}`;
}

const placeholder = <span className="corpus-wait">…</span>;

function columnsMake(schema: ProjectSchema, blind: boolean) {
  const columns = helper.columns([
    helper.accessor((s) => s.row?.seq ?? 0, {
      id: 'id',
      header: 'Id',
      cell: ({ row }) => (row.original.row === undefined ? placeholder : (row.original.row.externalId ?? `#${row.original.row.seq}`)),
    }),
    helper.accessor((s) => s.row?.text ?? '', {
      id: 'text',
      header: 'Text',
      cell: ({ row }) => {
        const r = row.original.row;
        return r === undefined ? placeholder : <SlotText text={r.text} tokens={r.tokens} tags={r.tags} schema={schema} />;
      },
    }),
    helper.accessor((s) => s.row?.intent ?? '', {
      id: 'intent',
      header: 'Intent',
      cell: ({ row }) => {
        const r = row.original.row;
        if (r === undefined) return placeholder;
        if (r.intent === null) return <span className="corpus-none">none</span>;
        return r.intentFromFile ? <span title="From the imported file; no layer gave one">{r.intent} (file)</span> : r.intent;
      },
    }),
    helper.accessor((s) => s.row?.status ?? '', { id: 'status', header: 'Status', cell: ({ row }) => row.original.row?.status ?? placeholder }),
    helper.accessor((s) => s.row?.done ?? 0, {
      id: 'done',
      header: 'Done',
      cell: ({ row }) => {
        const r = row.original.row;
        return r === undefined ? placeholder : `${r.done} of ${r.layers}`;
      },
    }),
    helper.accessor((s) => s.row?.violations ?? 0, {
      id: 'violations',
      header: 'Rule problems',
      cell: ({ row }) => {
        const r = row.original.row;
        if (r === undefined) return placeholder;
        return r.violations === 0 ? <span className="corpus-none">0</span> : <strong className="corpus-bad">{r.violations}</strong>;
      },
    }),
  ]);
  if (blind) return columns;
  return helper.columns([
    ...columns,
    helper.accessor((s) => (s.row?.disagreement === true ? 1 : 0), {
      id: 'disagreement',
      header: 'Differs',
      enableSorting: false,
      cell: ({ row }) => {
        const r = row.original.row;
        if (r === undefined) return placeholder;
        return r.disagreement === true ? <strong className="corpus-bad">differs</strong> : '';
      },
    }),
  ]);
}

const ARIA_SORT = { asc: 'ascending', desc: 'descending' } as const;

interface RowViewProps {
  row: Row<typeof features, Slot>;
  start: number;
  tabbable: boolean;
  /** Opens the row at a table position (its id is known before the row is read). */
  onOpenAt: (index: number) => void;
  onFocusIndex: (index: number) => void;
  Render: ReactTable<typeof features, Slot>['FlexRender'];
  /** Only for the comparison: new columns must render the row again. */
  columns: unknown;
}

const RowView = memo(function RowView({ row, start, tabbable, onOpenAt, onFocusIndex, Render }: RowViewProps) {
  const { index } = row.original;
  return (
    <div
      role="row"
      aria-rowindex={index + 2}
      data-index={index}
      tabIndex={tabbable ? 0 : -1}
      className="corpus-row"
      style={{ transform: `translateY(${start}px)` }}
      onClick={() => onOpenAt(index)}
      onFocus={() => onFocusIndex(index)}
    >
      {row.getAllCells().map((cell) => (
        <div role="cell" key={cell.id} className={`corpus-cell corpus-cell-${cell.column.id}`}>
          <Render cell={cell} />
        </div>
      ))}
    </div>
  );
},
// A new page of data gives every row a new table object; a row whose data, place and focus did not change need not render again.
(a, b) => a.row.original.row === b.row.original.row && a.row.original.index === b.row.original.index && a.start === b.start && a.tabbable === b.tabbable && a.columns === b.columns && a.onOpenAt === b.onOpenAt);

/** The utterance table: every matching row reachable by scrolling, only the visible ones rendered and read. */
export function CorpusTable({ projectId, ids, layer, blind, schema, sort, onSort, onOpen, describedBy, busy, signature, preread = null }: CorpusTableProps) {
  const scrollRef = useRef<HTMLDivElement>(null);
  // The virtualiser's object changes meaning on every scroll, so nothing derived from it may be memoised; this component does not.
  // eslint-disable-next-line react-hooks/incompatible-library
  const virtualizer = useVirtualizer({
    count: ids.length,
    getScrollElement: () => scrollRef.current,
    estimateSize: () => CORPUS_ROW_HEIGHT,
    overscan: 10,
    // Let React batch scroll updates instead of rendering inside each scroll event.
    useFlushSync: false,
  });
  const items = virtualizer.getVirtualItems();
  const first = items[0]?.index ?? 0;
  const last = items[items.length - 1]?.index ?? -1;
  const pageFrom = Math.floor(first / PAGE) * PAGE;
  const pageTo = Math.min(ids.length, (Math.floor(Math.max(last, 0) / PAGE) + 1) * PAGE);

  // Rows already read, by utterance id, for one way of showing them (layer, blind) and one state of
  // the data; after an edit the old rows stay on screen until their fresh copies arrive.
  const cacheKey = corpusRowsKey(projectId, layer, blind, signature);
  const cache = useRef<RowCache>({ key: cacheKey, rows: new Map(), stale: new Map(), reading: new Set(), seeded: null });
  if (cache.current.key !== cacheKey) {
    const old = cache.current;
    const sameView = old.key.slice(0, old.key.lastIndexOf('|')) === cacheKey.slice(0, cacheKey.lastIndexOf('|'));
    cache.current = { key: cacheKey, rows: new Map(), stale: sameView ? new Map([...old.stale, ...old.rows]) : new Map(), reading: new Set(), seeded: null };
  }
  if (preread !== null && preread.key === cacheKey && cache.current.seeded !== preread) {
    // Only rows not read since: the table's own reads are as fresh or fresher.
    for (const r of preread.rows) if (!cache.current.rows.has(r.id)) cache.current.rows.set(r.id, r);
    cache.current.seeded = preread;
  }
  const [version, setVersion] = useState(0);
  useEffect(() => {
    const c = cache.current;
    // A page of margin on both sides: rows are read before they scroll into view.
    const from = Math.max(0, pageFrom - PAGE);
    const to = Math.min(ids.length, pageTo + PAGE);
    const missing: number[] = [];
    for (let i = from; i < to; i++) {
      const id = ids[i] as number;
      if (!c.rows.has(id) && !c.reading.has(id)) missing.push(id);
    }
    if (missing.length === 0) return;
    for (const id of missing) c.reading.add(id);
    corpusMark('rows-ask');
    corpusRowsRead(appDb(), missing, { projectId, layer, blind })
      .then((read) => {
        corpusMark('rows-read');
        for (const r of read) {
          c.rows.set(r.id, r);
          c.stale.delete(r.id);
        }
        // Oldest first out: what is on screen was read last.
        for (const id of c.rows.keys()) {
          if (c.rows.size <= CACHE_MAX) break;
          c.rows.delete(id);
        }
        if (cache.current === c) setVersion((v) => v + 1);
      })
      .catch(() => undefined)
      .finally(() => {
        for (const id of missing) c.reading.delete(id);
      });
    // Not on `version`: an id the database no longer has would be asked for again and again.
  }, [ids, pageFrom, pageTo, cacheKey, projectId, layer, blind]);
  const data = useMemo(() => {
    const { rows, stale } = cache.current;
    const slots: Slot[] = [];
    for (let i = pageFrom; i < pageTo; i++) {
      const id = ids[i] as number;
      slots.push({ index: i, row: rows.get(id) ?? stale.get(id) });
    }
    return slots;
    // `version` and `cacheKey` say when the cache holds something new.
  }, [ids, pageFrom, pageTo, version, cacheKey, preread]); // eslint-disable-line react-hooks/exhaustive-deps

  const columns = useMemo(() => columnsMake(schema, blind), [schema, blind]);
  const sorting = useMemo<SortingState>(() => [{ id: sort.key, desc: sort.desc }], [sort.key, sort.desc]);
  const state = useMemo(() => ({ sorting }), [sorting]);
  const table = useTable({
    features,
    columns,
    data,
    getRowId: (slot) => String(slot.index),
    state,
    manualSorting: true,
    enableMultiSort: false,
    enableSortingRemoval: false,
    sortDescFirst: false,
    onSortingChange: (updater: Updater<SortingState>) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      const top = next[0];
      const key = top === undefined || !(CORPUS_SORT_KEYS as readonly string[]).includes(top.id) ? null : (top.id as CorpusSortKey);
      onSort(key === null || top === undefined ? CORPUS_SORT_DEFAULT : { key, desc: top.desc });
    },
  });
  const rows = table.getRowModel().rows;

  const [focusIndex, setFocusIndex] = useState(0);
  const focusWanted = useRef(false);
  useEffect(() => {
    setFocusIndex((i) => Math.min(i, Math.max(0, ids.length - 1)));
  }, [ids]);
  useEffect(() => {
    if (!focusWanted.current) return;
    const element = scrollRef.current?.querySelector<HTMLElement>(`[data-index="${focusIndex}"]`);
    if (element) {
      element.focus({ preventScroll: true });
      focusWanted.current = false;
    }
  });
  const tabbableIndex = focusIndex >= first && focusIndex <= last ? focusIndex : first;
  const visibleRows = Math.max(1, Math.floor((scrollRef.current?.clientHeight ?? CORPUS_ROW_HEIGHT * 10) / CORPUS_ROW_HEIGHT) - 1);

  const openAt = useCallback(
    (index: number) => {
      const id = ids[index];
      if (id !== undefined) onOpen(id);
    },
    [ids, onOpen],
  );

  function keyDown(event: KeyboardEvent<HTMLDivElement>) {
    // The focused row may have scrolled out and unmounted (focus then sits on the body), so the place comes from state.
    const at = focusIndex;
    if (event.key === 'Enter') {
      openAt(at);
      event.preventDefault();
      return;
    }
    const next = rowIndexAfterKey(event.key, at, ids.length, visibleRows);
    if (next === null) return;
    event.preventDefault();
    // Keep the keys coming here while the target row is not rendered yet; the effect above moves focus onto it.
    if (next < first || next > last) scrollRef.current?.focus({ preventScroll: true });
    focusWanted.current = true;
    setFocusIndex(next);
    virtualizer.scrollToIndex(next, { align: 'auto' });
  }

  return (
    <div role="table" aria-label="Utterances" aria-describedby={describedBy} aria-rowcount={ids.length + 1} aria-busy={busy} className="corpus-table">
      <div role="rowgroup" className="corpus-head">
        {table.getHeaderGroups().map((group) => (
          <div role="row" aria-rowindex={1} key={group.id} className="corpus-row corpus-row-head">
            {group.headers.map((header) => {
              const sorted = header.column.getIsSorted();
              const canSort = header.column.getCanSort();
              return (
                <div
                  role="columnheader"
                  key={header.id}
                  aria-sort={canSort ? (sorted === false ? 'none' : ARIA_SORT[sorted]) : undefined}
                  className={`corpus-cell corpus-cell-${header.column.id}`}
                >
                  {canSort ? (
                    <button type="button" onClick={header.column.getToggleSortingHandler()}>
                      <table.FlexRender header={header} />
                      <span aria-hidden="true" className="corpus-sort-mark">
                        {sorted === 'asc' ? ' ▲' : sorted === 'desc' ? ' ▼' : ''}
                      </span>
                    </button>
                  ) : (
                    <table.FlexRender header={header} />
                  )}
                </div>
              );
            })}
          </div>
        ))}
      </div>
      <div role="rowgroup" ref={scrollRef} className="corpus-body" tabIndex={-1} onKeyDown={keyDown}>
        <div role="none" className="corpus-sizer" style={{ height: virtualizer.getTotalSize() }}>
          {items.map((item) => {
            const row = rows[item.index - pageFrom];
            if (row === undefined) return null;
            return (
              <RowView
                key={item.index}
                row={row}
                start={item.start}
                tabbable={item.index === tabbableIndex}
                onOpenAt={openAt}
                onFocusIndex={setFocusIndex}
                Render={table.FlexRender}
                columns={columns}
              />
            );
          })}
        </div>
      </div>
    </div>
  );
}
