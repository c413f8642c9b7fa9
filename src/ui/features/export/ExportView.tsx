import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useRef, useState, type FormEvent } from 'react';
import { EXPORT_PRIVACY_CAUTION, GOLD_ANNOTATOR, LAYER_STATUSES, type ExportFormat, type LayerStatus } from '../../../core/export';
import { annotatorList, projectCounts, projectGet } from '../../../db';
import type { ExportOutcome, ExportProgress, ExportRequest } from '../../../workers/export-run';
import { appDb } from '../../app/db';
import type { ProjectViewProps } from '../../app/project-views';
import { JobCancelledError, type WorkerJob } from '../../../workers/worker-job';
import { exportStart, type ExportWorkerKept } from './export-client';
import { exportFormDefault, exportFormRequest, exportReportText, type ExportForm, type PolicyKind } from './export-form';
import { ExportDownloads, type DownloadLink } from './ExportDownloads';
import { exportFileName } from './file-names';
import { RefusalList } from './RefusalList';
import './export.css';

type Phase =
  | { kind: 'idle' }
  | { kind: 'running'; progress: ExportProgress | null }
  | { kind: 'refused'; outcome: Extract<ExportOutcome, { kind: 'refused' }>; request: ExportRequest }
  | { kind: 'empty'; report: string }
  | { kind: 'written'; links: DownloadLink[]; report: string }
  | { kind: 'cancelled' }
  | { kind: 'failed'; message: string };

const FORMATS: { value: ExportFormat; label: string }[] = [
  { value: 'iob2', label: 'IOB2 columns' },
  { value: 'bioes', label: 'BIOES columns' },
  { value: 'jsonl', label: 'JSON Lines (spans with code-point offsets)' },
];

const POLICIES: { value: PolicyKind; label: string }[] = [
  { value: 'gold', label: 'Gold (the agreed labels)' },
  { value: 'annotator', label: 'One annotator' },
  { value: 'gold-else', label: 'Gold where there is one, else one annotator' },
];

function progressText(p: ExportProgress | null): string {
  if (p === null) return 'Starting…';
  return p.phase === 'reading' ? `Reading ${p.done} of ${p.total} utterances…` : `Writing ${p.done} of ${p.total} utterances…`;
}

/** "Write out data": choose the layer, statuses, format, split and masking, then save the files. */
export function ExportView({ projectId }: ProjectViewProps) {
  const project = useLiveQuery(() => projectGet(appDb(), projectId), [projectId]);
  const counts = useLiveQuery(() => projectCounts(appDb(), projectId), [projectId]);
  const people = useLiveQuery(() => annotatorList(appDb(), projectId), [projectId]);
  const [edits, setEdits] = useState<Partial<ExportForm>>({});
  const [problem, setProblem] = useState<string | null>(null);
  const [phase, setPhase] = useState<Phase>({ kind: 'idle' });
  const urls = useRef<string[]>([]);
  const job = useRef<WorkerJob<ExportOutcome> | null>(null);
  // The worker of the refusal on screen: "as they are" writes what it read, without reading again.
  const kept = useRef<ExportWorkerKept | null>(null);
  const keptEnd = () => {
    kept.current?.end();
    kept.current = null;
  };

  // Object URLs hold their Blobs alive: let them go with the screen, and a run still going ends with it.
  useEffect(
    () => () => {
      urls.current.forEach((u) => URL.revokeObjectURL(u));
      job.current?.cancel();
      kept.current?.end();
    },
    [],
  );

  if (project === undefined || counts === undefined || people === undefined) return <p>Loading…</p>;

  const owners = [...new Set([...people.map((p) => p.id), ...Object.keys(counts.layers)])].filter((a) => a !== GOLD_ANNOTATOR).sort();
  const form: ExportForm = { ...exportFormDefault(counts.layers[GOLD_ANNOTATOR] !== undefined, owners[0] ?? ''), ...edits };
  const set = (patch: Partial<ExportForm>) => {
    setEdits((e) => ({ ...e, ...patch }));
    // A refusal's "as they are" would write the old choices: it goes once the choices change.
    if (phase.kind === 'refused') {
      setPhase({ kind: 'idle' });
      keptEnd();
    }
  };
  const running = phase.kind === 'running';
  const projectName = project?.name ?? 'project';

  function statusToggle(status: LayerStatus, on: boolean) {
    set({ statuses: on ? [...form.statuses, status] : form.statuses.filter((s) => s !== status) });
  }

  async function run(request: ExportRequest) {
    urls.current.forEach((u) => URL.revokeObjectURL(u));
    urls.current = [];
    setPhase({ kind: 'running', progress: null });
    const reuse = request.asIs ? (kept.current ?? undefined) : undefined;
    if (reuse === undefined) keptEnd();
    kept.current = null;
    // Progress of this run only, and only while it runs: never over a later run or a finished screen.
    const started = exportStart(
      request,
      (progress) => {
        if (job.current === current) setPhase((p) => (p.kind === 'running' ? { kind: 'running', progress } : p));
      },
      reuse,
    );
    const current = started.job;
    job.current = current;
    try {
      const outcome = await current.result;
      if (job.current !== current) return;
      const report = exportReportText(outcome.report);
      if (outcome.kind === 'refused') {
        kept.current = started.worker;
        setPhase({ kind: 'refused', outcome, request });
      }
      else if (outcome.kind === 'empty') setPhase({ kind: 'empty', report });
      else {
        const now = new Date();
        const links = outcome.files.map((f) => {
          const url = URL.createObjectURL(f.blob);
          urls.current.push(url);
          return { name: exportFileName(projectName, request.format, f.part, now), url, count: f.count, bytes: f.blob.size };
        });
        setPhase({ kind: 'written', links, report });
      }
    } catch (error) {
      if (job.current !== current) return;
      setPhase(error instanceof JobCancelledError ? { kind: 'cancelled' } : { kind: 'failed', message: (error as Error).message });
    } finally {
      if (job.current === current) job.current = null;
    }
  }

  function cancel() {
    job.current?.cancel();
  }

  function submit(event: FormEvent) {
    event.preventDefault();
    const built = exportFormRequest(form, projectId);
    if ('problem' in built) {
      setProblem(built.problem);
      return;
    }
    setProblem(null);
    void run(built.request);
  }

  const statusCount = (status: LayerStatus): number => {
    const of = (a: string) => counts.layers[a]?.[status] ?? 0;
    return form.policy === 'gold' ? of(GOLD_ANNOTATOR) : form.policy === 'annotator' ? of(form.annotator) : of(GOLD_ANNOTATOR) + of(form.annotator);
  };

  return (
    <section aria-labelledby="export-title" className="export">
      <h2 id="export-title">Write out data</h2>
      <p>
        {counts.utterances} utterance{counts.utterances === 1 ? '' : 's'} in “{projectName}”. The files are built on this computer.
      </p>
      <form onSubmit={submit} className="export-form">
        <fieldset>
          <legend>Whose labels</legend>
          {POLICIES.map((p) => (
            <label key={p.value} className="choice">
              <input type="radio" name="policy" value={p.value} checked={form.policy === p.value} onChange={() => set({ policy: p.value })} />
              {p.label}
            </label>
          ))}
          <label className="inline">
            Annotator{' '}
            <select value={form.annotator} onChange={(e) => set({ annotator: e.target.value })} disabled={form.policy === 'gold' || owners.length === 0}>
              {owners.length === 0 && <option value="">none yet</option>}
              {owners.map((a) => (
                <option key={a} value={a}>
                  {people.find((p) => p.id === a)?.name ?? a}
                </option>
              ))}
            </select>
          </label>
        </fieldset>
        <fieldset>
          <legend>Statuses to write</legend>
          {LAYER_STATUSES.map((s) => (
            <label key={s} className="choice">
              <input type="checkbox" checked={form.statuses.includes(s)} onChange={(e) => statusToggle(s, e.target.checked)} />
              {s} <span className="muted">({statusCount(s)})</span>
            </label>
          ))}
        </fieldset>
        <fieldset>
          <legend>Format</legend>
          {FORMATS.map((f) => (
            <label key={f.value} className="choice">
              <input type="radio" name="format" value={f.value} checked={form.format === f.value} onChange={() => set({ format: f.value })} />
              {f.label}
            </label>
          ))}
        </fieldset>
        <fieldset>
          <legend>Train, dev and test</legend>
          <label className="choice">
            <input type="checkbox" checked={form.split} onChange={(e) => set({ split: e.target.checked })} />
            Split into three files, keeping each intent&apos;s share alike
          </label>
          {form.split && (
            <div className="split-grid">
              {(['train', 'dev', 'test'] as const).map((part) => (
                <label key={part}>
                  {part[0]?.toUpperCase()}
                  {part.slice(1)} share
                  <input type="number" min={0} max={1} step="any" value={form[part]} onChange={(e) => set({ [part]: e.target.value })} />
                </label>
              ))}
              <label>
                Seed
                <input type="number" step={1} value={form.seed} onChange={(e) => set({ seed: e.target.value })} />
              </label>
            </div>
          )}
        </fieldset>
        <fieldset aria-describedby="privacy-caution">
          <legend>Privacy</legend>
          <label className="choice">
            <input type="checkbox" checked={form.maskDigits} onChange={(e) => set({ maskDigits: e.target.checked })} />
            Mask digits (each becomes 0)
          </label>
          <label className="choice">
            <input type="checkbox" checked={form.maskEmail} onChange={(e) => set({ maskEmail: e.target.checked })} />
            Mask e-mail addresses
          </label>
          <p id="privacy-caution" className="caution">
            {EXPORT_PRIVACY_CAUTION}
          </p>
        </fieldset>
        {problem !== null && (
          <p role="alert" className="error">
            {problem}
          </p>
        )}
        <div className="export-actions">
          <button type="submit" disabled={running}>
            Write
          </button>
          {running && (
            <button type="button" onClick={cancel}>
              Cancel writing
            </button>
          )}
        </div>
      </form>
      <div aria-live="polite">
        {phase.kind === 'running' && (
          <p>
            <progress max={phase.progress?.total || 1} value={phase.progress?.done ?? 0} aria-label="Export progress" /> {progressText(phase.progress)}
          </p>
        )}
        {phase.kind === 'cancelled' && <p role="status">Writing was cancelled; no file was made.</p>}
        {phase.kind === 'empty' && <p role="status">Nothing to write with these choices. {phase.report}</p>}
        {phase.kind === 'failed' && (
          <p role="alert" className="error">
            The export failed: {phase.message}
          </p>
        )}
      </div>
      {phase.kind === 'refused' && (
        <RefusalList violations={phase.outcome.violations} utterances={phase.outcome.utterances} busy={false} onAsIs={() => void run({ ...phase.request, asIs: true })} />
      )}
      {phase.kind === 'written' && <ExportDownloads links={phase.links} report={phase.report} />}
    </section>
  );
}
