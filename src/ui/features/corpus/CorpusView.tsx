import * as Comlink from 'comlink';
import { useLiveQuery } from 'dexie-react-hooks';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { projectGet } from '../../../db';
import { corpusIndexSignature } from '../../../db/corpus-index';
import type { CorpusFilter, CorpusQuery, CorpusSort } from '../../../db/corpus-query';
import { corpusAnnotators, corpusIdsInSeqOrder, corpusRowsFirst, type CorpusRow } from '../../../db/corpus-rows';
import type { CorpusAnswer } from '../../../db/corpus-service';
import { useNav } from '../../../state/nav';
import { useSession } from '../../../state/session';
import type { ProjectViewProps } from '../../app/project-views';
import { appDb } from '../../app/db';
import { corpusMark, corpusWorker } from './corpus-client';
import { corpusFilterCount, corpusStateFromQuery, corpusStateNeedsIndex, corpusStateToQuery, type CorpusViewState } from './corpus-url';
import { CorpusFilters } from './CorpusFilters';
import { CORPUS_ROWS_FIRST, corpusRowsKey, CorpusTable } from './CorpusTable';
import './corpus.css';

interface Answer {
  key: string;
  ids: Int32Array;
  /** Utterances in the project. */
  total: number;
}

const fmt = (n: number) => n.toLocaleString('en');
const union = (...lists: readonly (readonly string[])[]) => [...new Set(lists.flat())].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));

/** The default layer outside blind mode: the labeller's own when they have one here, else the first person's. */
function layerDefault(profileId: string | null, annotators: readonly string[]): string | null {
  if (profileId !== null && annotators.includes(profileId)) return profileId;
  return annotators[0] ?? profileId;
}

/** The utterances of a project as a filterable, sortable table; a row opens in the Label screen. */
export function CorpusView({ projectId }: ProjectViewProps) {
  const { query, queryReplace, go } = useNav();
  const { profile, blind: blindSetting } = useSession();
  const blind = profile !== null && profile.role === 'annotator' && blindSetting;
  const state = useMemo(() => corpusStateFromQuery(query), [query]);
  const project = useLiveQuery(() => projectGet(appDb(), projectId), [projectId]);
  const annotators = useLiveQuery(() => corpusAnnotators(appDb(), projectId), [projectId]);
  // As text, so an unchanged project does not count as a change.
  const signature = useLiveQuery(async () => JSON.stringify(await corpusIndexSignature(appDb(), projectId)), [projectId]);
  useEffect(() => corpusMark('mount'), []);
  // The worker starts and loads the saved index while this page reads its own first facts.
  useEffect(() => {
    corpusWorker()
      .warm(projectId)
      .then(async (how) => {
        corpusMark(`warm-${how ?? 'none'}`);
        for (const [step, at] of await corpusWorker().steps()) corpusMark(`worker-${step}`, at - performance.timeOrigin);
      })
      .catch(() => undefined);
    void appDb()
      .open()
      .then(() => corpusMark('db-open'))
      .catch(() => undefined);
  }, [projectId]);
  useEffect(() => {
    if (signature !== undefined) corpusMark('signature');
  }, [signature]);
  useEffect(() => {
    if (annotators !== undefined) corpusMark('annotators');
  }, [annotators]);
  const annotatorsKey = annotators?.join('\n');
  const layer = blind ? profile.id : (state.layer ?? layerDefault(profile?.id ?? null, annotators ?? []));
  const filter: CorpusFilter = useMemo(() => {
    if (!blind || state.filter.disagreement === undefined) return state.filter;
    const { disagreement: _hidden, ...rest } = state.filter;
    return rest;
  }, [state.filter, blind]);
  const needsIndex = corpusStateNeedsIndex(state, blind);
  const key = JSON.stringify([projectId, layer, filter, state.sort, blind]);
  const [answer, setAnswer] = useState<Answer | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [progress, setProgress] = useState<{ done: number; total: number } | null>(null);

  // The worker's index is known to match this project state (then it answers even the plain view, quicker than reading the keys).
  const warm = useRef<string | null>(null);
  const [choices, setChoices] = useState<{ slots: string[]; intents: string[] }>({ slots: [], intents: [] });
  const answered = (a: CorpusAnswer, state: string) => {
    warm.current = state;
    setChoices({ slots: a.slots, intents: a.intents });
  };

  useEffect(() => {
    if (signature === undefined || annotatorsKey === undefined) return undefined;
    let live = true;
    const request: CorpusQuery = { layer, filter, sort: state.sort, blind };
    const dataState = `${projectId}|${signature}`;
    const run = async (): Promise<Answer> => {
      corpusMark('ask');
      if (needsIndex || warm.current === dataState) {
        const a = await corpusWorker().query(
          projectId,
          request,
          Comlink.proxy((done: number, total: number) => live && setProgress({ done, total })),
        );
        if (live) answered(a, dataState);
        corpusMark(`answer-${a.index}`);
        return { key, ids: a.ids, total: a.total };
      }
      // A saved index answers quickest; without one, every utterance in seq order from the index keys
      // alone (no build), so a big project shows at once. Their number is the total too.
      const saved = await corpusWorker().queryIfIndexed(projectId, request);
      if (saved !== null) {
        corpusMark(`answer-${saved.index}`);
        if (live) answered(saved, dataState);
        return { key, ids: saved.ids, total: saved.total };
      }
      corpusMark('answer-none');
      const ids = await corpusIdsInSeqOrder(appDb(), projectId);
      corpusMark('answer-keys');
      return { key, ids: state.sort.desc ? ids.reverse() : ids, total: ids.length };
    };
    run()
      .then((a) => {
        if (!live) return;
        setAnswer(a);
        setError(null);
        setProgress(null);
      })
      .catch((e: unknown) => live && setError(e instanceof Error ? e.message : String(e)));
    return () => {
      live = false;
    };
    // `key` stands for layer, filter, sort and blind.
  }, [key, signature, annotatorsKey, needsIndex, projectId]); // eslint-disable-line react-hooks/exhaustive-deps

  // The plain table's top rows, read while the worker answers: they do not depend on its answer.
  const [preread, setPreread] = useState<{ key: string; rows: CorpusRow[] } | null>(null);
  const plain = corpusFilterCount(filter) === 0 && state.sort.key === 'id' && !state.sort.desc;
  const hasAnswer = answer !== null;
  useEffect(() => {
    if (!plain || hasAnswer || signature === undefined || annotatorsKey === undefined) return undefined;
    let live = true;
    const rowsKey = corpusRowsKey(projectId, layer, blind, signature);
    corpusRowsFirst(appDb(), CORPUS_ROWS_FIRST, { projectId, layer, blind })
      .then((rows) => live && setPreread({ key: rowsKey, rows }))
      .catch(() => undefined);
    return () => {
      live = false;
    };
  }, [plain, hasAnswer, signature, annotatorsKey, projectId, layer, blind]);

  // With the first rows on screen, build (or bring up to date) the filter index in the worker, so the next filter is quick.
  const shown = answer !== null;
  useEffect(() => {
    if (!shown || signature === undefined) return undefined;
    const dataState = `${projectId}|${signature}`;
    if (warm.current === dataState) return undefined;
    let live = true;
    const timer = setTimeout(() => {
      corpusWorker()
        .query(projectId, { layer, filter: {}, sort: { key: 'id', desc: false }, blind })
        .then((a) => live && answered(a, dataState))
        .catch(() => undefined);
    }, 1000);
    return () => {
      live = false;
      clearTimeout(timer);
    };
  }, [shown, signature, projectId, layer, blind]);

  const stateSet = useCallback((next: CorpusViewState) => queryReplace(corpusStateToQuery(next)), [queryReplace]);
  const onFilter = useCallback((f: CorpusFilter) => stateSet({ ...state, filter: f }), [state, stateSet]);
  const onSort = useCallback((sort: CorpusSort) => stateSet({ ...state, sort }), [state, stateSet]);
  const onLayer = useCallback((l: string) => stateSet({ ...state, layer: l }), [state, stateSet]);
  const onOpen = useCallback((utteranceId: number) => go('label', projectId, { u: String(utteranceId) }), [go, projectId]);
  const clear = () => stateSet({ filter: {}, sort: state.sort, layer: state.layer });

  const schema = project?.schema ?? { slots: [], intents: [] };
  const slots = union(
    schema.slots.map((s) => s.name),
    choices.slots,
  );
  const intents = union(
    schema.intents.map((i) => i.name),
    choices.intents,
  );
  const busy = answer === null || answer.key !== key;
  const filters = corpusFilterCount(filter);

  return (
    <section aria-labelledby="corpus-title" className="corpus-view">
      <h2 id="corpus-title">Utterances{project === undefined ? '' : `: ${project.name}`}</h2>
      {blind && (
        <p className="corpus-note">
          Blind mode: you see only your own labels (<strong>{profile.id}</strong>); others’ labels and their disagreements stay hidden.
        </p>
      )}
      <CorpusFilters
        filter={filter}
        slots={slots}
        intents={intents}
        annotators={annotators ?? []}
        layer={layer}
        onLayer={blind ? null : onLayer}
        blind={blind}
        onFilter={onFilter}
      />
      <div className="corpus-summary">
        <p role="status" data-testid="corpus-count">
          {answer === null ? 'Reading the utterances…' : `Showing ${fmt(answer.ids.length)} of ${fmt(answer.total)} utterances`}
          {busy && answer !== null ? ' (updating…)' : ''}
        </p>
        {busy && progress !== null && progress.done < progress.total && (
          <p className="corpus-note">
            Preparing the filters: {fmt(progress.done)} of {fmt(progress.total)} utterances read.
          </p>
        )}
        {filters > 0 && (
          <button type="button" onClick={clear}>
            Clear filters
          </button>
        )}
      </div>
      {error !== null && (
        <p role="alert" className="error">
          The table could not be read: {error}
        </p>
      )}
      <p id="corpus-help" className="corpus-note">
        Arrow keys move between rows, Enter opens the utterance for labelling; column headings sort.
      </p>
      {answer !== null && (
        <CorpusTable
          projectId={projectId}
          ids={answer.ids}
          layer={layer}
          blind={blind}
          schema={schema}
          sort={state.sort}
          onSort={onSort}
          onOpen={onOpen}
          describedBy="corpus-help"
          busy={busy}
          signature={signature ?? ''}
          preread={preread}
        />
      )}
    </section>
  );
}
