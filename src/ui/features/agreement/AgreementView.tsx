import { useLiveQuery } from 'dexie-react-hooks';
import { memo, useEffect, useState } from 'react';
import { projectGet } from '../../../db/project-repo';
import { useNav } from '../../../state/nav';
import type { AgreementProgress, AgreementResult } from '../../../workers/agreement-run';
import { corpusIndexSignature } from '../../../db/corpus-index';
import { layerStatusesPresent } from '../../../workers/agreement-read';
import { appDb } from '../../app/db';
import type { ProjectViewProps } from '../../app/project-views';
import { choiceFromQuery, choiceQuery, choiceRequest, choiceStatuses, layerOwners, type AgreementChoice } from './agreement-choice';
import { countText, listText } from './agreement-format';
import { ConfusionTable, SlotTable, TimeTable } from './ChartTables';
import { ConfusionHeatmap } from './charts/ConfusionHeatmap';
import { SlotBars } from './charts/SlotBars';
import { TimeChart } from './charts/TimeChart';
import { DisagreementList } from './DisagreementList';
import { FiguresTable } from './FiguresTable';
import { MultiFigures } from './MultiFigures';
import { useAgreementRun } from './use-agreement-run';
import './agreement.css';

function progressText(p: AgreementProgress | null): string {
  if (p === null) return 'Starting…';
  if (p.phase === 'reading') return `Reading layers: ${p.total === 0 ? 0 : Math.floor((100 * p.done) / p.total)}%`;
  if (p.phase === 'computing') return 'Computing the figures…';
  return `Intervals: ${countText(p.done)} of ${countText(p.total)} resamples`;
}

/**
 * Everything but the figures table: the same objects in the early result and the final one (the
 * final only adds the intervals; see `useAgreementRun`), so the final render leaves them alone.
 */
interface SectionsProps {
  report: AgreementResult['report'];
  overTime: AgreementResult['overTime'];
  disagreements: AgreementResult['disagreements'];
  projectId: number;
}

/** The parts of the report the sections show, compared by reference (the intervals, `ci`, are not among them). */
function sectionsSame(x: SectionsProps, y: SectionsProps): boolean {
  const a = x.report;
  const b = y.report;
  return (
    x.overTime === y.overTime &&
    x.disagreements === y.disagreements &&
    x.projectId === y.projectId &&
    a.layers === b.layers &&
    a.pairNames === b.pairNames &&
    a.perSlot === b.perSlot &&
    a.confusion === b.confusion &&
    a.disagreements === b.disagreements &&
    a.fleissKappa === b.fleissKappa &&
    a.alpha === b.alpha &&
    a.pairwise === b.pairwise
  );
}

const Sections = memo(function Sections({ report, overTime, disagreements, projectId }: SectionsProps) {
  const { go } = useNav();
  const names = report.pairNames;
  return (
    <>
      <MultiFigures report={report} />
      <section aria-labelledby="agreement-slots-title">
        <h3 id="agreement-slots-title">Per slot</h3>
        <SlotBars perSlot={report.perSlot} names={names} />
        <SlotTable perSlot={report.perSlot} names={names} />
      </section>
      <section aria-labelledby="agreement-confusion-title">
        <h3 id="agreement-confusion-title">Which slot types get confused</h3>
        <ConfusionHeatmap labels={report.confusion.labels} counts={report.confusion.counts} names={names} />
        <ConfusionTable labels={report.confusion.labels} counts={report.confusion.counts} names={names} />
      </section>
      <section aria-labelledby="agreement-time-title">
        <h3 id="agreement-time-title">Agreement over time</h3>
        <TimeChart points={overTime} />
        <TimeTable points={overTime} />
      </section>
      <section aria-labelledby="agreement-list-title">
        <h3 id="agreement-list-title">Disagreeing utterances</h3>
        <DisagreementList
          items={disagreements}
          total={report.disagreements.total}
          names={names}
          onOpen={(d) => go('resolve', projectId, { u: String(d.utteranceId), a: names[0], b: names[1] })}
        />
      </section>
    </>
  );
}, sectionsSame);

/**
 * How long the early figures stand alone before the sections under them are drawn anyway. On two
 * cores the intervals are resampled on both while the page lays out the charts and the list (~1,700
 * layout objects): the layout then waited for a core (a 130 ms task, the renderer trace said) and
 * slowed the resampling. Drawn with the intervals instead, unless those take longer than this.
 */
const SECTIONS_WAIT_MS = 1000;

function useSectionsDue(pending: boolean): boolean {
  const [due, setDue] = useState(!pending);
  useEffect(() => {
    if (due || !pending) return;
    const timer = setTimeout(() => setDue(true), SECTIONS_WAIT_MS);
    return () => clearTimeout(timer);
  }, [due, pending]);
  return due || !pending;
}

/** Memoised: progress messages re-render the screen, never the dashboard under them. */
const Dashboard = memo(function Dashboard({ result, projectId }: { result: AgreementResult; projectId: number }) {
  const sectionsDue = useSectionsDue(result.intervalsPending);
  const { report } = result;
  const names = report.pairNames;
  return (
    <>
      <p data-testid="agreement-compared" data-pending={String(result.intervalsPending)} data-worker-ms={result.timings.totalMs.toFixed(1)} data-read-ms={result.timings.readMs.toFixed(1)} data-compute-ms={result.timings.computeMs.toFixed(1)} data-kept={String(result.keptFrom !== undefined)}
        data-steps={Object.entries(result.timings.steps)
          .map(([name, ms]) => `${name} ${ms.toFixed(0)} ms`)
          .join(', ')}
      >
        Compared {countText(report.utterances)} utterances ({countText(report.tokens)} tokens) that both {names[0]} and {names[1]} hold. Counted layers with status{' '}
        {listText(result.statuses)}: {result.counted.map((c) => `${c.annotator} ${countText(c.layers)}`).join(', ')}.{' '}
        {result.keptFrom === undefined
          ? `Computed in ${(result.timings.totalMs / 1000).toFixed(2)} s.`
          : `Kept from ${new Date(result.keptFrom).toLocaleString()}: no layer of this project has changed since, so the figures are the same.`}
      </p>
      <section aria-labelledby="agreement-figures-title">
        <h3 id="agreement-figures-title">Figures</h3>
        <FiguresTable report={report} intervalsPending={result.intervalsPending} />
      </section>
      {sectionsDue && <Sections report={report} overTime={result.overTime} disagreements={result.disagreements} projectId={projectId} />}
    </>
  );
});

function ChoiceForm({ owners, choice, onChange, onAgain, busy }: { owners: string[]; choice: AgreementChoice; onChange: (c: AgreementChoice) => void; onAgain: () => void; busy: boolean }) {
  return (
    <form className="agreement-choice" onSubmit={(e) => e.preventDefault()}>
      <label>
        Layer A{' '}
        <select value={choice.a} onChange={(e) => onChange({ ...choice, a: e.target.value })}>
          {owners.map((o) => (
            <option key={o} value={o}>
              {o}
            </option>
          ))}
        </select>
      </label>
      <label>
        Layer B{' '}
        <select value={choice.b} onChange={(e) => onChange({ ...choice, b: e.target.value })}>
          {owners.map((o) => (
            <option key={o} value={o}>
              {o}
            </option>
          ))}
        </select>
      </label>
      <label>
        <input type="checkbox" checked={choice.all} onChange={(e) => onChange({ ...choice, all: e.target.checked })} /> Every annotator together (adds Fleiss’ kappa, Krippendorff’s alpha)
      </label>
      <label>
        <input type="checkbox" checked={choice.drafts} onChange={(e) => onChange({ ...choice, drafts: e.target.checked })} /> Count draft layers too
      </label>
      <button type="button" onClick={onAgain} disabled={busy}>
        Compute again
      </button>
    </form>
  );
}

export function AgreementView({ projectId }: ProjectViewProps) {
  const { query, queryReplace } = useNav();
  const project = useLiveQuery(() => projectGet(appDb(), projectId), [projectId]);
  // Which owners and statuses exist is all the choice needs: no counting (it walks the index).
  const counts = useLiveQuery(() => layerStatusesPresent(appDb(), projectId), [projectId]);
  // Changes with every edit, import or schema change: figures computed before it are marked stale.
  const signature = useLiveQuery(async () => JSON.stringify(await corpusIndexSignature(appDb(), projectId)), [projectId]);
  const owners = counts === undefined ? [] : layerOwners(counts);
  const choice = counts === undefined ? null : choiceFromQuery(query, owners);
  const planned = choice === null || counts === undefined ? null : choiceRequest(projectId, choice, counts);
  // Started once the signature is known, so the run is stamped with the data it read.
  const request = planned !== null && 'request' in planned && signature !== undefined ? planned.request : null;
  const stamp = signature ?? '';
  const { state, early, cancel, again } = useAgreementRun(request, stamp);
  const stale = state.kind === 'done' && signature !== undefined && state.stamp !== stamp;
  const shown = state.kind === 'done' ? (state.outcome.ok ? state.outcome : null) : state.kind === 'running' ? early : null;
  return (
    <section aria-labelledby="agreement-title" className="agreement">
      <h2 id="agreement-title">Agreement{project === undefined ? '' : `: ${project.name}`}</h2>
      {counts !== undefined && choice === null && <p>Agreement needs layers of at least two annotators; this project has {owners.length === 0 ? 'none' : `only ${owners.join('')}`}.</p>}
      {choice !== null && (
        <>
          <ChoiceForm owners={owners} choice={choice} onChange={(c) => queryReplace(choiceQuery(c))} onAgain={again} busy={state.kind === 'running'} />
          <p className="agreement-note">
            Counting layers with status {listText(choiceStatuses(choice))} only
            {choice.drafts ? '' : ' (tick “Count draft layers too” to include drafts)'}; skipped, flagged and unlabelled layers never count.
          </p>
        </>
      )}
      {planned !== null && 'problem' in planned && <p className="error">{planned.problem}</p>}
      {state.kind === 'running' && (
        <div className="agreement-progress" role="status">
          <progress aria-label="Agreement computation" {...(state.progress !== null && state.progress.phase !== 'computing' ? { value: state.progress.done, max: Math.max(1, state.progress.total) } : {})} />
          <span>{progressText(state.progress)}</span>
          <button type="button" onClick={cancel}>
            Cancel
          </button>
        </div>
      )}
      {state.kind === 'cancelled' && <p role="status">Cancelled; nothing was computed. Use “Compute again” to start over.</p>}
      {state.kind === 'failed' && <p role="alert" className="error">The computation failed: {state.message}</p>}
      {state.kind === 'done' && !state.outcome.ok && (
        <div role="alert" className="error">
          <p>{state.outcome.message}</p>
          {state.outcome.errors !== undefined && (
            <ul>
              {state.outcome.errors.map((e) => (
                <li key={`${e.kind}-${e.index}`}>{e.message}</li>
              ))}
            </ul>
          )}
        </div>
      )}
      {stale && <p role="status">Labels or layers have changed since these figures were computed; use “Compute again” to bring them up to date.</p>}
      {/* One place for the early figures and the final ones: the final render updates the dashboard instead of mounting it anew. */}
      {shown !== null && <Dashboard result={shown} projectId={projectId} />}
    </section>
  );
}
