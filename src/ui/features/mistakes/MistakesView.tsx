import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useMemo, useRef, useState } from 'react';
import type { FindingKind, FindingLocation } from '../../../core/error-detect';
import { projectGet } from '../../../db';
import { dismissalsOf, findingsDismiss, findingsRestore } from '../../../db/findings-repo';
import { navToHash, useNav } from '../../../state/nav';
import { useSession } from '../../../state/session';
import { FINDING_KINDS } from '../../../workers/findings-choose';
import type { FindingsScan, FindingsScanProgress, ModelUse } from '../../../workers/findings-run';
import { JobCancelledError, type WorkerJob } from '../../../workers/worker-job';
import { appDb } from '../../app/db';
import type { ProjectViewProps } from '../../app/project-views';
import { FindingCard } from './FindingCard';
import { findingsScanStart } from './mistakes-client';
import { findingGroups, findingHeadline, KIND_TEXT, labelQueryOf, mistakesFilterFromQuery, mistakesFilterToQuery, type FindingItem } from './mistakes-model';
import './mistakes.css';

type Phase = { kind: 'scanning'; progress: FindingsScanProgress | null } | { kind: 'scanned'; scan: FindingsScan } | { kind: 'failed'; message: string };

const PAGE = 25;
const PHASE_TEXT: Record<FindingsScanProgress['phase'], string> = { reading: 'Reading layers', tagging: 'Tagging with the model', checking: 'Running the checks' };
const plural = (n: number, one: string, many = `${one}s`) => `${n.toLocaleString('en')} ${n === 1 ? one : many}`;

function modelText(model: ModelUse): string {
  if (model.kind === 'used') return `Checked against the model saved in this project (${model.origin === 'trained' ? 'trained here' : 'loaded from a file'} on ${new Date(model.saved).toLocaleString('en')}).`;
  if (model.kind === 'none') return 'The model check was skipped: no model is saved in this project. Train one on the Model screen to add this check.';
  return `The model check was skipped: the saved model cannot be read by this version (${model.message}).`;
}

/** "Likely mistakes": findings of the error detectors over the project's finished labels, ranked, each opening in Label; dismissals kept. */
export function MistakesView({ projectId }: ProjectViewProps) {
  const project = useLiveQuery(async () => (await projectGet(appDb(), projectId)) ?? null, [projectId]);
  const profile = useSession((s) => s.profile);
  const { query, queryReplace, go } = useNav();
  const filter = mistakesFilterFromQuery(query);
  const [phase, setPhase] = useState<Phase>({ kind: 'scanning', progress: null });
  const [scanRound, setScanRound] = useState(0);
  const [shown, setShown] = useState<Partial<Record<FindingKind, number>>>({});
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ text: string; error: boolean; undo: FindingItem | null } | null>(null);
  const undoButton = useRef<HTMLButtonElement>(null);
  const messageLine = useRef<HTMLParagraphElement>(null);
  const job = useRef<WorkerJob<FindingsScan> | null>(null);

  useEffect(() => {
    const current = findingsScanStart(projectId, (progress) => {
      if (job.current === current) setPhase({ kind: 'scanning', progress });
    });
    job.current = current;
    current.result.then(
      (scan) => {
        if (job.current === current) setPhase({ kind: 'scanned', scan });
      },
      (error: unknown) => {
        if (job.current === current && !(error instanceof JobCancelledError)) setPhase({ kind: 'failed', message: (error as Error).message });
      },
    );
    return () => {
      job.current = null;
      current.cancel();
    };
  }, [projectId, scanRound]);

  // After a dismissal the card may leave the list, and after an undo the button itself goes: keep
  // keyboard focus on the undo, then on the message, instead of dropping it to the page.
  const focusNext = useRef<'undo' | 'message' | null>(null);
  useEffect(() => {
    if (focusNext.current === 'undo') undoButton.current?.focus();
    else if (focusNext.current === 'message') messageLine.current?.focus();
    focusNext.current = null;
  }, [message]);

  const dismissed = useMemo(() => new Set(project ? Object.keys(dismissalsOf(project)) : []), [project]);

  if (project === undefined) return <p>Loading…</p>;
  if (project === null) return <p role="alert">This project does not exist (it may have been deleted in another tab).</p>;

  const scan = phase.kind === 'scanned' ? phase.scan : null;
  const groups = scan === null ? [] : findingGroups(scan, dismissed, filter);
  const open = scan === null ? 0 : scan.findings.filter((f) => !dismissed.has(f.key)).length;
  const hiddenCount = scan === null ? 0 : scan.findings.length - open;

  const labelHref = (location: FindingLocation) => navToHash('label', projectId, labelQueryOf(location));
  const onOpen = (location: FindingLocation) => go('label', projectId, labelQueryOf(location));

  async function dismiss(item: FindingItem) {
    setBusy(true);
    try {
      await findingsDismiss(appDb(), projectId, [item.key], profile?.id ?? null);
      focusNext.current = 'undo';
      setMessage({ text: `Dismissed ${KIND_TEXT[item.finding.kind].short} “${findingHeadline(item.finding)}”.`, error: false, undo: item });
    } catch (error) {
      setMessage({ text: `Not dismissed: ${(error as Error).message}`, error: true, undo: null });
    } finally {
      setBusy(false);
    }
  }

  async function restore(item: FindingItem, fromUndo = false) {
    setBusy(true);
    try {
      await findingsRestore(appDb(), projectId, [item.key]);
      if (fromUndo) focusNext.current = 'message';
      setMessage({ text: `Brought back ${KIND_TEXT[item.finding.kind].short} “${findingHeadline(item.finding)}”.`, error: false, undo: null });
    } catch (error) {
      setMessage({ text: `Not brought back: ${(error as Error).message}`, error: true, undo: null });
    } finally {
      setBusy(false);
    }
  }

  function rescan() {
    setPhase({ kind: 'scanning', progress: null });
    setShown({});
    setScanRound((n) => n + 1);
  }

  return (
    <section aria-labelledby="mistakes-title" className="mistakes">
      <h2 id="mistakes-title">Likely mistakes: {project.name}</h2>
      <p>
        Places where the finished labels disagree with themselves or with the model, most telling first. Each one opens in the Label screen; dismiss the ones that are right
        as they are, and they stay dismissed on later scans.
      </p>
      <p className="mistakes-choice">
        What is checked: an utterance&apos;s gold layer where that is done, since the decided labels are the ones that count; elsewhere every annotator&apos;s done layer, so each
        person&apos;s finished work is checked. Drafts and the model&apos;s suggestions are not checked. Where the only difference is between two people&apos;s layers of the same
        utterance, it is left to the Agreement and Resolve screens.
      </p>
      <div aria-live="polite">
        {phase.kind === 'scanning' && (
          <p>
            <progress max={phase.progress?.total || 1} value={phase.progress?.done ?? 0} aria-label="Scan progress" />{' '}
            {phase.progress === null ? 'Starting the scan…' : `${PHASE_TEXT[phase.progress.phase]}: ${phase.progress.done.toLocaleString('en')} of ${phase.progress.total.toLocaleString('en')}…`}
          </p>
        )}
        {phase.kind === 'failed' && (
          <p role="alert" className="error">
            The scan failed: {phase.message}
          </p>
        )}
        {scan !== null && (
          <p role="status" className="mistakes-summary">
            {plural(open, 'likely mistake')} to look at{hiddenCount > 0 ? ` (${hiddenCount.toLocaleString('en')} dismissed)` : ''}, from {plural(scan.layersChecked, 'layer')} of{' '}
            {plural(scan.utterancesChecked, 'utterance')}: {scan.fromGold.toLocaleString('en')} gold, {scan.fromPeople.toLocaleString('en')} from annotators.
            {scan.sameUtteranceDropped > 0 ? ` ${plural(scan.sameUtteranceDropped, 'difference')} within single utterances left to the Resolve screen.` : ''}
          </p>
        )}
        {scan !== null && <p className={scan.model.kind === 'used' ? 'mistakes-model' : 'mistakes-model is-skipped'}>{modelText(scan.model)}</p>}
        {message !== null && (
          <p className={message.error ? 'error' : 'mistakes-done'} ref={messageLine} tabIndex={-1}>
            {message.text}{' '}
            {message.undo !== null && (
              <button
                type="button"
                ref={undoButton}
                disabled={busy}
                onClick={() => {
                  if (message.undo !== null) void restore(message.undo, true);
                }}
              >
                Undo
              </button>
            )}
          </p>
        )}
      </div>
      <div className="row-form">
        <label>
          Show{' '}
          <select value={filter.kind} onChange={(e) => queryReplace(mistakesFilterToQuery({ ...filter, kind: e.target.value as FindingKind | 'all' }, query))}>
            <option value="all">every kind</option>
            {FINDING_KINDS.map((k) => (
              <option key={k} value={k}>
                {KIND_TEXT[k].title}
              </option>
            ))}
          </select>
        </label>
        <label className="choice">
          <input type="checkbox" checked={filter.showDismissed} onChange={(e) => queryReplace(mistakesFilterToQuery({ ...filter, showDismissed: e.target.checked }, query))} /> Show
          dismissed findings
        </label>
        <button type="button" onClick={rescan} disabled={phase.kind === 'scanning'}>
          Scan again
        </button>
      </div>
      {scan !== null &&
        groups.map((group) => {
          const limit = shown[group.kind] ?? PAGE;
          const titleId = `mistakes-${group.kind}`;
          const skipped = group.kind === 'model-disagreement' && scan.model.kind !== 'used';
          return (
            <section key={group.kind} aria-labelledby={titleId} className="mistakes-group">
              <h3 id={titleId}>
                {KIND_TEXT[group.kind].title} ({(group.total - group.dismissed).toLocaleString('en')}
                {group.dismissed > 0 ? `, ${group.dismissed.toLocaleString('en')} dismissed` : ''})
              </h3>
              <p className="muted">{KIND_TEXT[group.kind].about}</p>
              {skipped && <p>Not checked: {scan.model.kind === 'none' ? 'no model is saved in this project.' : 'the saved model cannot be read.'}</p>}
              {!skipped && group.items.length === 0 && <p>{group.total === 0 ? 'None found.' : 'All of these are dismissed.'}</p>}
              {group.items.length > 0 && (
                <ol className="mistakes-list" aria-labelledby={titleId}>
                  {group.items.slice(0, limit).map((item) => (
                    <FindingCard
                      key={item.key}
                      item={item}
                      utterances={scan.utterances}
                      labelHref={labelHref}
                      onOpen={onOpen}
                      onDismiss={(i) => void dismiss(i)}
                      onRestore={(i) => void restore(i)}
                      busy={busy}
                    />
                  ))}
                </ol>
              )}
              {group.items.length > limit && (
                <button type="button" onClick={() => setShown((s) => ({ ...s, [group.kind]: limit + PAGE }))}>
                  Show {Math.min(PAGE, group.items.length - limit)} more of {group.items.length - limit} ({KIND_TEXT[group.kind].short})
                </button>
              )}
            </section>
          );
        })}
    </section>
  );
}
