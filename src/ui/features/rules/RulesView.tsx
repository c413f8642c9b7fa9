import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useRef, useState } from 'react';
import { REPAIR_STRATEGIES, type RepairStrategy } from '../../../core/rules';
import { projectGet, RevisionConflictError } from '../../../db';
import { repairNoteOf, repairRecordFromHistory, rulesRepairApply, rulesRepairUndo, type RepairNote, type RepairRecord, type RulesScan, type RulesScanProgress } from '../../../db/rules-repo';
import { useSession } from '../../../state/session';
import { JobCancelledError, type WorkerJob } from '../../../workers/worker-job';
import { appDb } from '../../app/db';
import type { ProjectViewProps } from '../../app/project-views';
import { FindingsTable } from './FindingsTable';
import { RepairPreview } from './RepairPreview';
import { rulesScanStart } from './rules-client';
import { findingRows, findingsFilter, repairPreviewOf, repairTargets, type FindingFilter } from './rules-model';
import './rules.css';

type Phase = { kind: 'scanning'; progress: RulesScanProgress | null } | { kind: 'scanned'; scan: RulesScan } | { kind: 'failed'; message: string };

const STRATEGY_LABELS: Record<RepairStrategy, string> = {
  'begin-span': 'Keep the span: a stray I-X becomes B-X (read as the CoNLL-2000 evaluation does)',
  'drop-stray': 'Drop it: the tokens of a span opened by a stray I-X become O',
};

// The last repair per project, so its undo survives a visit to another screen; a small note of it in
// localStorage (its history rows) lets a reload rebuild it from the database.
const lastRepairs = new Map<number, RepairRecord>();
const noteKey = (projectId: number) => `slotsmith.lastRepair.${projectId}`;

function repairNoteKeep(projectId: number, record: RepairRecord | null): void {
  try {
    const note = record === null ? null : repairNoteOf(record);
    if (note === null) localStorage.removeItem(noteKey(projectId));
    else localStorage.setItem(noteKey(projectId), JSON.stringify(note));
  } catch {
    // Storage refused: the undo still lasts until the page is reloaded.
  }
}

function repairNoteRead(projectId: number): RepairNote | null {
  try {
    const note = JSON.parse(localStorage.getItem(noteKey(projectId)) ?? 'null') as RepairNote | null;
    return note !== null && note.projectId === projectId && Array.isArray(note.history) ? note : null;
  } catch {
    return null;
  }
}
const PAGE = 200;

/** "Rule review": every rule finding across the project's layers, repaired in one go and undoable. */
export function RulesView({ projectId }: ProjectViewProps) {
  const project = useLiveQuery(async () => (await projectGet(appDb(), projectId)) ?? null, [projectId]);
  const profile = useSession((s) => s.profile);
  const [phase, setPhase] = useState<Phase>({ kind: 'scanning', progress: null });
  const [scanRound, setScanRound] = useState(0);
  const [filter, setFilter] = useState<FindingFilter>({ kind: 'all', owner: '' });
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const [strategy, setStrategy] = useState<RepairStrategy>('begin-span');
  const [schemaSpans, setSchemaSpans] = useState(false);
  const [previewKeys, setPreviewKeys] = useState<Set<string> | null>(null);
  const [shown, setShown] = useState(PAGE);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ text: string; error: boolean } | null>(null);
  const [lastRepair, setLastRepair] = useState<RepairRecord | null>(lastRepairs.get(projectId) ?? null);
  const job = useRef<WorkerJob<RulesScan> | null>(null);

  // After a reload: the last repair comes back from its history rows, so it can still be undone.
  useEffect(() => {
    if (lastRepairs.has(projectId)) return;
    const note = repairNoteRead(projectId);
    if (note === null) return;
    let live = true;
    void repairRecordFromHistory(appDb(), note).then((record) => {
      if (!live) return;
      if (record === null) repairNoteKeep(projectId, null);
      else {
        lastRepairs.set(projectId, record);
        setLastRepair(record);
      }
    });
    return () => {
      live = false;
    };
  }, [projectId]);

  useEffect(() => {
    const current = rulesScanStart(projectId, (progress) => {
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

  function rescan() {
    setPhase({ kind: 'scanning', progress: null });
    setSelected(new Set());
    setPreviewKeys(null);
    setShown(PAGE);
    setScanRound((n) => n + 1);
  }

  if (project === undefined) return <p>Loading…</p>;
  if (project === null) return <p role="alert">This project does not exist (it may have been deleted in another tab).</p>;

  const scan = phase.kind === 'scanned' ? phase.scan : null;
  const rows = scan === null ? [] : findingRows(scan);
  const visible = findingsFilter(rows, filter);
  const owners = scan === null ? [] : [...new Set(scan.layers.map((l) => l.annotator))].sort();
  const allKeys = new Set(rows.map((r) => r.layerKey));
  const preview = scan !== null && previewKeys !== null ? repairPreviewOf(scan, previewKeys, { strategy, schemaSpans }) : null;
  const who = profile?.id ?? null;

  function toggle(key: string, on: boolean) {
    setSelected((s) => {
      const next = new Set(s);
      if (on) next.add(key);
      else next.delete(key);
      return next;
    });
  }

  async function apply() {
    if (scan === null || preview === null || who === null) return;
    setBusy(true);
    try {
      const record = await rulesRepairApply(appDb(), projectId, repairTargets(preview), { strategy, schemaSpans, who });
      lastRepairs.set(projectId, record);
      repairNoteKeep(projectId, record);
      setLastRepair(record);
      setMessage({ text: `Repaired ${record.layers.length} layer${record.layers.length === 1 ? '' : 's'} (${preview.tagsChanged} tags) in one step. You can undo it below.`, error: false });
      rescan();
    } catch (error) {
      const text =
        error instanceof RevisionConflictError
          ? 'Nothing was repaired: a layer changed after the scan (perhaps in another tab). The list has been scanned again; preview and apply once more.'
          : `Nothing was repaired: ${(error as Error).message}`;
      setMessage({ text, error: true });
      rescan();
    } finally {
      setBusy(false);
    }
  }

  async function undo() {
    if (lastRepair === null || who === null) return;
    setBusy(true);
    try {
      const count = await rulesRepairUndo(appDb(), lastRepair, { who });
      lastRepairs.delete(projectId);
      repairNoteKeep(projectId, null);
      setLastRepair(null);
      setMessage({ text: `Undone: the previous tags of ${count} layer${count === 1 ? '' : 's'} are back.`, error: false });
    } catch (error) {
      const text =
        error instanceof RevisionConflictError
          ? 'Nothing was undone: a repaired layer has been edited since, and undo never overwrites newer work.'
          : `Nothing was undone: ${(error as Error).message}`;
      setMessage({ text, error: true });
    } finally {
      setBusy(false);
      rescan();
    }
  }

  const transitionCount = rows.filter((r) => r.finding.kind === 'transition').length;
  return (
    <section aria-labelledby="rules-title" className="rules">
      <h2 id="rules-title">Rule review: {project.name}</h2>
      <p>
        Every tag sequence that breaks the {project.scheme.toUpperCase()} rules, and every label the project&apos;s slot and intent lists do not allow, in every layer
        (annotators, gold and model).
      </p>
      <div aria-live="polite">
        {phase.kind === 'scanning' && (
          <p>
            <progress max={phase.progress?.total || 1} value={phase.progress?.done ?? 0} aria-label="Scan progress" /> Checking layers
            {phase.progress === null ? '…' : ` ${phase.progress.done} of ${phase.progress.total}…`}
          </p>
        )}
        {phase.kind === 'failed' && (
          <p role="alert" className="error">
            The scan failed: {phase.message}
          </p>
        )}
        {scan !== null && (
          <p role="status" className="rules-summary">
            {rows.length} finding{rows.length === 1 ? '' : 's'} in {scan.layers.length} layer{scan.layers.length === 1 ? '' : 's'} ({scan.layersScanned} checked): {transitionCount} transition rule
            {transitionCount === 1 ? '' : 's'}, {rows.length - transitionCount} schema rule{rows.length - transitionCount === 1 ? '' : 's'}.
          </p>
        )}
        {message !== null && <p className={message.error ? 'error' : 'rules-done'}>{message.text}</p>}
      </div>
      <div className="row-form">
        <button type="button" onClick={rescan} disabled={phase.kind === 'scanning' || busy}>
          Scan again
        </button>
        {lastRepair !== null && (
          <button type="button" onClick={() => void undo()} disabled={busy || who === null}>
            Undo the last repair ({lastRepair.layers.length} layer{lastRepair.layers.length === 1 ? '' : 's'})
          </button>
        )}
      </div>
      {who === null && <p className="rules-note">No profile is chosen: choose who you are in the header before repairing, so the history says who changed the tags.</p>}
      {scan !== null && rows.length > 0 && (
        <>
          <fieldset className="rules-options">
            <legend>How to repair</legend>
            {REPAIR_STRATEGIES.map((s) => (
              <label key={s} className="choice">
                <input type="radio" name="strategy" value={s} checked={strategy === s} onChange={() => setStrategy(s)} />
                {STRATEGY_LABELS[s]}
              </label>
            ))}
            <label className="choice">
              <input type="checkbox" checked={schemaSpans} onChange={(e) => setSchemaSpans(e.target.checked)} />
              Also drop spans the schema does not allow (unknown slot, or a slot not allowed with the intent): their tokens become O
            </label>
          </fieldset>
          <div className="row-form">
            <label>
              Show{' '}
              <select value={filter.kind} onChange={(e) => setFilter({ ...filter, kind: e.target.value as FindingFilter['kind'] })}>
                <option value="all">all findings</option>
                <option value="transition">transition rules only</option>
                <option value="schema">schema rules only</option>
              </select>
            </label>
            <label>
              Layer{' '}
              <select value={filter.owner} onChange={(e) => setFilter({ ...filter, owner: e.target.value })}>
                <option value="">every layer</option>
                {owners.map((o) => (
                  <option key={o} value={o}>
                    {o}
                  </option>
                ))}
              </select>
            </label>
            <button type="button" onClick={() => setSelected(new Set([...selected, ...visible.map((r) => r.layerKey)]))}>
              Select all shown
            </button>
            <button type="button" onClick={() => setSelected(new Set())} disabled={selected.size === 0}>
              Clear the selection
            </button>
          </div>
          <div className="row-form">
            <button type="button" disabled={selected.size === 0} onClick={() => setPreviewKeys(new Set(selected))}>
              Preview the repair of the selected layers ({selected.size})
            </button>
            <button type="button" onClick={() => setPreviewKeys(allKeys)}>
              Preview the repair of all {allKeys.size} layers
            </button>
          </div>
        </>
      )}
      {preview !== null && (
        <section aria-labelledby="rules-preview-title" className="rules-preview-box">
          <h3 id="rules-preview-title">Before and after</h3>
          <p>
            {preview.layers.length} layer{preview.layers.length === 1 ? '' : 's'} would change ({preview.tagsChanged} tag{preview.tagsChanged === 1 ? '' : 's'})
            {preview.unchanged > 0 ? `; ${preview.unchanged} chosen layer${preview.unchanged === 1 ? '' : 's'} would stay as they are with these choices (a schema finding needs the option to drop spans; an unknown intent needs relabelling)` : ''}.
          </p>
          <div className="row-form">
            <button type="button" onClick={() => void apply()} disabled={busy || who === null || preview.layers.length === 0}>
              Apply this repair to {preview.layers.length} layer{preview.layers.length === 1 ? '' : 's'}
            </button>
            <button type="button" onClick={() => setPreviewKeys(null)}>
              Close the preview
            </button>
          </div>
          <RepairPreview preview={preview} />
        </section>
      )}
      {scan !== null && visible.length > 0 && (
        <>
          <FindingsTable
            rows={visible.slice(0, shown)}
            selected={selected}
            onToggle={toggle}
            onPreviewOne={(key) => {
              setSelected(new Set([key]));
              setPreviewKeys(new Set([key]));
            }}
          />
          {visible.length > shown && (
            <button type="button" onClick={() => setShown((n) => n + PAGE)}>
              Show {Math.min(PAGE, visible.length - shown)} more of {visible.length - shown}
            </button>
          )}
        </>
      )}
      {scan !== null && rows.length === 0 && <p>No findings: every layer follows the rules.</p>}
    </section>
  );
}
