import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useState } from 'react';
import { LAYER_STATUSES, type LayerStatus } from '../../../core/backup/model';
import { projectGet } from '../../../db/project-repo';
import { useNav } from '../../../state/nav';
import type { OverviewResult } from '../../../workers/agreement-overview';
import { layerStatusCounts, type LayerScanProgress } from '../../../workers/agreement-read';
import { JobCancelledError } from '../../../workers/worker-job';
import { appDb } from '../../app/db';
import type { ProjectViewProps } from '../../app/project-views';
import { BarList } from './charts/BarList';
import { LineChart } from './charts/LineChart';
import { LazyDetails } from './LazyDetails';
import { StatusBars } from './charts/StatusBars';
import { overviewStart } from './overview-client';
import { distributionStatuses, overviewSourceOf, peopleLayers, progressTableRows } from './overview-model';
import './overview.css';

type RunState = { kind: 'running'; progress: LayerScanProgress | null } | { kind: 'done'; result: OverviewResult } | { kind: 'failed'; message: string };

const fmt = (n: number) => n.toLocaleString('en');

function useOverview(projectId: number, source: string | null, drafts: boolean, stamp: string): RunState {
  const [state, setState] = useState<RunState>({ kind: 'running', progress: null });
  useEffect(() => {
    if (stamp === '') return;
    let live = true;
    const job = overviewStart({ projectId, source, statuses: distributionStatuses(drafts) }, (progress) => live && setState({ kind: 'running', progress }));
    job.result.then(
      (result) => live && setState({ kind: 'done', result }),
      (error: unknown) => live && !(error instanceof JobCancelledError) && setState({ kind: 'failed', message: (error as Error).message }),
    );
    return () => {
      live = false;
      job.cancel();
    };
  }, [projectId, source, drafts, stamp]);
  return state;
}

function Headline({ result }: { result: OverviewResult }) {
  const h = result.headline;
  const items: [string, string][] = [
    ['Utterances', fmt(result.utterances)],
    ['Annotators', fmt(h.people)],
    ['Layers done', `${fmt(h.doneLayers)} of ${fmt(peopleLayers(result))}`],
    ['Utterances done by two or more', fmt(h.overlapDone)],
    ['Gold layers', fmt(h.goldLayers)],
    ['Utterances nobody has started', fmt(h.untouched)],
  ];
  return (
    <dl className="overview-headline" aria-label="Headline numbers">
      {items.map(([name, value]) => (
        <div key={name}>
          <dt>{name}</dt>
          <dd>{value}</dd>
        </div>
      ))}
    </dl>
  );
}

function ProgressSection({ result }: { result: OverviewResult }) {
  const rows = result.annotators.map((a) => ({ name: a.annotator, statuses: a.statuses }));
  const series = result.annotators.filter((a) => a.doneByDay.length > 0).map((a) => ({ name: a.annotator, points: a.doneByDay.map((d) => ({ time: d.day, value: d.done })) }));
  return (
    <section aria-labelledby="overview-progress-title">
      <h3 id="overview-progress-title">Progress per annotator</h3>
      <StatusBars rows={rows} />
      <LazyDetails className="overview-table" summary="Layers by status as a table">
        {() => (
        <table>
          <caption>Layers per annotator by status</caption>
          <thead>
            <tr>
              <th scope="col">Annotator</th>
              {LAYER_STATUSES.map((s) => (
                <th key={s} scope="col">
                  {s}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {progressTableRows(result).map((r) => (
              <tr key={r.annotator}>
                <th scope="row">{r.annotator}</th>
                {r.counts.map((n, i) => (
                  <td key={LAYER_STATUSES[i]}>{fmt(n)}</td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
        )}
      </LazyDetails>
      <h4>Layers done over time</h4>
      <LineChart title="Layers done per annotator, running total by day of their last change" series={series} yTitle="layers done" />
      <p className="overview-note">By the day (UTC) each layer now marked done was last changed; a layer reopened later counts from its new day.</p>
      <LazyDetails className="overview-table" summary="Layers done over time as a table">
        {() => (
        <table>
          <caption>Layers done, running total by day</caption>
          <thead>
            <tr>
              <th scope="col">Annotator</th>
              <th scope="col">Day (UTC)</th>
              <th scope="col">Done by then</th>
            </tr>
          </thead>
          <tbody>
            {series.flatMap((s) =>
              s.points.map((p) => (
                <tr key={`${s.name}-${p.time}`}>
                  <th scope="row">{s.name}</th>
                  <td>{new Date(p.time).toISOString().slice(0, 10)}</td>
                  <td>{fmt(p.value)}</td>
                </tr>
              )),
            )}
          </tbody>
        </table>
        )}
      </LazyDetails>
    </section>
  );
}

function DistributionTable({ caption, head, rows }: { caption: string; head: string; rows: { name: string; value: number }[] }) {
  return (
    <LazyDetails className="overview-table" summary={`${caption} as a table`}>
      {() => (
      <table>
        <caption>{caption}</caption>
        <thead>
          <tr>
            <th scope="col">{head}</th>
            <th scope="col">Count</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.name}>
              <th scope="row">{r.name}</th>
              <td>{fmt(r.value)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      )}
    </LazyDetails>
  );
}

export function OverviewView({ projectId }: ProjectViewProps) {
  const { query, queryReplace } = useNav();
  const project = useLiveQuery(() => projectGet(appDb(), projectId), [projectId]);
  const counts = useLiveQuery(() => layerStatusCounts(appDb(), projectId), [projectId]);
  const owners = counts === undefined ? [] : Object.keys(counts).sort();
  const source = overviewSourceOf(query.source, owners);
  const drafts = query.drafts === '1';
  // Status counts change when a layer is created or changes status: then the figures are read again.
  const state = useOverview(projectId, source, drafts, counts === undefined ? '' : JSON.stringify(counts));
  const statuses: LayerStatus[] = distributionStatuses(drafts);
  const set = (next: { source?: string | null; drafts?: boolean }) => {
    const s = next.source === undefined ? source : next.source;
    const d = next.drafts ?? drafts;
    queryReplace({ ...(s !== null && { source: s }), ...(d && { drafts: '1' }) });
  };
  return (
    <section aria-labelledby="overview-title" className="overview">
      <h2 id="overview-title">Overview{project === undefined ? '' : `: ${project.name}`}</h2>
      {state.kind === 'running' && (
        <div role="status" className="overview-progress">
          <progress aria-label="Reading the layers" {...(state.progress === null ? {} : { value: state.progress.done, max: Math.max(1, state.progress.total) })} />
          <span>{state.progress === null ? 'Starting…' : `Reading layers: ${state.progress.total === 0 ? 0 : Math.floor((100 * state.progress.done) / state.progress.total)}%`}</span>
        </div>
      )}
      {state.kind === 'failed' && (
        <p role="alert" className="error">
          The overview could not be computed: {state.message}
        </p>
      )}
      {state.kind === 'done' && (
        <>
          <Headline result={state.result} />
          <ProgressSection result={state.result} />
          <section aria-labelledby="overview-labels-title">
            <h3 id="overview-labels-title">Label distribution</h3>
            <form className="overview-choice" onSubmit={(e) => e.preventDefault()}>
              <label>
                Whose labels{' '}
                <select value={source ?? ''} onChange={(e) => set({ source: e.target.value === '' ? null : e.target.value })}>
                  <option value="">Every annotator</option>
                  {owners.map((o) => (
                    <option key={o} value={o}>
                      {o}
                    </option>
                  ))}
                </select>
              </label>
              <label>
                <input type="checkbox" checked={drafts} onChange={(e) => set({ drafts: e.target.checked })} /> Count draft layers too
              </label>
            </form>
            <p className="overview-note">
              Counted {fmt(state.result.countedLayers)} layers with status {statuses.join(' or ')}
              {source === null ? ' of every annotator (gold and model layers left out)' : ` of ${source}`}. Spans are read as the CoNLL-2000 evaluation reads tags (a stray I- starts a span).
            </p>
            <h4>Spans per slot</h4>
            <BarList title="Spans per slot" unit="spans" items={state.result.slots.map((s) => ({ name: s.slot, value: s.spans }))} />
            <DistributionTable caption="Spans per slot" head="Slot" rows={state.result.slots.map((s) => ({ name: s.slot, value: s.spans }))} />
            <h4>Utterances per intent</h4>
            <BarList title="Utterances per intent" unit="utterances" items={state.result.intents.map((i) => ({ name: i.intent, value: i.count }))} />
            <DistributionTable caption="Utterances per intent" head="Intent" rows={state.result.intents.map((i) => ({ name: i.intent, value: i.count }))} />
          </section>
        </>
      )}
    </section>
  );
}
