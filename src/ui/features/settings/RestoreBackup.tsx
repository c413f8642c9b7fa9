import { useEffect, useId, useRef, useState, type ChangeEvent } from 'react';
import type { ReadError } from '../../../core/types';
import type { RestoreOutcome, RestoreProgress } from '../../../workers/restore-run';
import { JobCancelledError, type WorkerJob } from '../../../workers/worker-job';
import { restoreStart } from './restore-client';
import { bytesText, readErrorText } from './settings-text';

const ERRORS_SHOWN = 50;

export interface RestoreBackupProps {
  /** Called with the new project once it is stored. */
  onRestored?: (projectId: number, name: string) => void;
  /** When given, the restored project gets an "Open" button calling this. */
  onOpen?: (projectId: number) => void;
}

type State =
  | { kind: 'idle' }
  | { kind: 'busy'; file: string; progress: RestoreProgress | null }
  | { kind: 'done'; name: string; projectId: number }
  | { kind: 'refused'; file: string; errors: ReadError[] }
  | { kind: 'stopped'; file: string }
  | { kind: 'failed'; message: string };

function busyText(file: string, p: RestoreProgress | null): string {
  if (p === null || p.phase === 'reading') return `Reading and checking ${file}${p === null ? '' : ` (${bytesText(p.done)} of ${bytesText(p.total)})`}…`;
  return `Storing ${file} as a new project…`;
}

/**
 * Restore a backup file as a new project, in a worker of its own; an invalid file stores nothing and
 * is explained line by line. Usable on the settings screen and, with no project open, on the project list.
 */
export function RestoreBackup({ onRestored, onOpen }: RestoreBackupProps) {
  const inputId = useId();
  const [state, setState] = useState<State>({ kind: 'idle' });
  const job = useRef<WorkerJob<RestoreOutcome> | null>(null);

  // Leaving the screen while reading stops the worker; nothing has been stored before the last step.
  useEffect(() => () => job.current?.cancel(), []);

  async function restore(event: ChangeEvent<HTMLInputElement>) {
    const input = event.target;
    const file = input.files?.[0];
    // Choosing the same file again must fire another change.
    input.value = '';
    if (file === undefined) return;
    setState({ kind: 'busy', file: file.name, progress: null });
    const current = restoreStart(file, (progress) => {
      if (job.current === current) setState((s) => (s.kind === 'busy' ? { ...s, progress } : s));
    });
    job.current = current;
    try {
      const outcome = await current.result;
      if (!outcome.ok) {
        setState({ kind: 'refused', file: file.name, errors: outcome.errors });
        return;
      }
      setState({ kind: 'done', name: outcome.name, projectId: outcome.projectId });
      onRestored?.(outcome.projectId, outcome.name);
    } catch (error) {
      setState(error instanceof JobCancelledError ? { kind: 'stopped', file: file.name } : { kind: 'failed', message: (error as Error).message });
    } finally {
      if (job.current === current) job.current = null;
    }
  }

  // Only while reading: the store is one transaction that may already be committing.
  const stoppable = state.kind === 'busy' && state.progress?.phase !== 'storing';

  return (
    <div className="restore">
      <label htmlFor={inputId}>Restore from a backup file</label>{' '}
      <input id={inputId} type="file" accept=".jsonl,.slotsmith-backup.jsonl,application/x-ndjson" onChange={(e) => void restore(e)} disabled={state.kind === 'busy'} />
      <p className="muted">A restore always makes a new project; nothing already here is changed.</p>
      <div aria-live="polite">
        {state.kind === 'busy' && (
          <p>
            <progress aria-label="Restore progress" max={state.progress?.total || 1} value={state.progress?.done ?? 0} /> {busyText(state.file, state.progress)}{' '}
            {stoppable && (
              <button type="button" onClick={() => job.current?.cancel()}>
                Stop restoring
              </button>
            )}
          </p>
        )}
        {state.kind === 'stopped' && <p role="status">Stopped restoring {state.file}; nothing was stored.</p>}
        {state.kind === 'done' && (
          <p role="status">
            Restored as the project “{state.name}”.{' '}
            {onOpen !== undefined && (
              <button type="button" onClick={() => onOpen(state.projectId)}>
                Open “{state.name}”
              </button>
            )}
          </p>
        )}
      </div>
      {state.kind === 'refused' && (
        <div role="alert" className="error">
          <p>
            {state.file} was not restored; nothing was stored. {state.errors.length} problem{state.errors.length === 1 ? '' : 's'}:
          </p>
          {state.errors.some((e) => e.message.startsWith('made by a newer')) && <p>This backup comes from a newer Slotsmith. Update Slotsmith, then restore it.</p>}
          <ul aria-label="Problems in the backup file">
            {state.errors.slice(0, ERRORS_SHOWN).map((e, i) => (
              <li key={i}>{readErrorText(e)}</li>
            ))}
          </ul>
          {state.errors.length > ERRORS_SHOWN && <p>… and {state.errors.length - ERRORS_SHOWN} more.</p>}
        </div>
      )}
      {state.kind === 'failed' && (
        <p role="alert" className="error">
          The restore failed and nothing was stored: {state.message}
        </p>
      )}
    </div>
  );
}
