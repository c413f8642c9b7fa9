import { useId, useState, type ChangeEvent } from 'react';
import { backupRestore, projectList } from '../../../db';
import type { ReadError } from '../../../core/types';
import { appDb } from '../../app/db';
import { backupProjectName, readErrorText, restoreNameFree } from './settings-text';

const ERRORS_SHOWN = 50;

export interface RestoreBackupProps {
  /** Called with the new project once it is stored. */
  onRestored?: (projectId: number, name: string) => void;
  /** When given, the restored project gets an "Open" button calling this. */
  onOpen?: (projectId: number) => void;
}

type State = { kind: 'idle' } | { kind: 'busy'; file: string } | { kind: 'done'; name: string; projectId: number } | { kind: 'refused'; file: string; errors: ReadError[] } | { kind: 'failed'; message: string };

/**
 * Restore a backup file as a new project; an invalid file stores nothing and is explained line by
 * line. Usable on the settings screen and, with no project open, on the project list.
 */
export function RestoreBackup({ onRestored, onOpen }: RestoreBackupProps) {
  const inputId = useId();
  const [state, setState] = useState<State>({ kind: 'idle' });

  async function restore(event: ChangeEvent<HTMLInputElement>) {
    const input = event.target;
    const file = input.files?.[0];
    if (file === undefined) return;
    setState({ kind: 'busy', file: file.name });
    try {
      const text = await file.text();
      const db = appDb();
      const taken = new Set((await projectList(db)).map((p) => p.name));
      // A free name is chosen before the restore, so the project appears under it in the same transaction.
      const original = backupProjectName(text);
      const result = await backupRestore(db, text, original === undefined ? {} : { name: restoreNameFree(original, taken) });
      if (!result.ok) {
        setState({ kind: 'refused', file: file.name, errors: result.errors });
        return;
      }
      const name = (await db.projects.get(result.projectId))?.name ?? original ?? 'project';
      setState({ kind: 'done', name, projectId: result.projectId });
      onRestored?.(result.projectId, name);
    } catch (error) {
      setState({ kind: 'failed', message: (error as Error).message });
    } finally {
      // Choosing the same file again must fire another change.
      input.value = '';
    }
  }

  return (
    <div className="restore">
      <label htmlFor={inputId}>Restore from a backup file</label>{' '}
      <input id={inputId} type="file" accept=".jsonl,.slotsmith-backup.jsonl,application/x-ndjson" onChange={(e) => void restore(e)} disabled={state.kind === 'busy'} />
      <p className="muted">A restore always makes a new project; nothing already here is changed.</p>
      <div aria-live="polite">
        {state.kind === 'busy' && <p>Reading {state.file}…</p>}
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
