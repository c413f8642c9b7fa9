import { useLiveQuery } from 'dexie-react-hooks';
import { useState, type FormEvent } from 'react';
import { projectDelete, projectRename, utteranceCount, type ProjectRow as Project } from '../../../db';
import { projectCachesForget } from '../../../db/project-caches';
import { appDb } from '../../app/db';

type Mode = 'show' | 'rename' | 'confirm-delete';

/** One project: open it, rename it in place, or delete it after an explicit second step. */
export function ProjectRow({ project, onOpen }: { project: Project; onOpen: (id: number) => void }) {
  const count = useLiveQuery(() => utteranceCount(appDb(), project.id), [project.id]);
  const [mode, setMode] = useState<Mode>('show');
  const [name, setName] = useState(project.name);
  const [error, setError] = useState<string | null>(null);

  async function rename(event: FormEvent) {
    event.preventDefault();
    try {
      await projectRename(appDb(), project.id, name);
      setMode('show');
      setError(null);
    } catch (caught) {
      setError((caught as Error).message);
    }
  }

  async function remove() {
    try {
      await projectDelete(appDb(), project.id);
      await projectCachesForget(indexedDB, project.id);
    } catch (caught) {
      setError((caught as Error).message);
      setMode('show');
    }
  }

  return (
    <li className="project-row">
      {mode === 'rename' ? (
        <form onSubmit={(e) => void rename(e)} className="row-form">
          <label htmlFor={`rename-${project.id}`}>New name for {project.name}</label>
          <input id={`rename-${project.id}`} value={name} onChange={(e) => setName(e.target.value)} required maxLength={200} autoFocus />
          <button type="submit">Save name</button>
          <button type="button" onClick={() => setMode('show')}>
            Cancel
          </button>
        </form>
      ) : (
        <>
          <span className="project-name">{project.name}</span>
          <span className="project-count">{count === undefined ? '' : `${count} utterance${count === 1 ? '' : 's'}`}</span>
          <button type="button" onClick={() => onOpen(project.id)} aria-label={`Open ${project.name}`}>
            Open
          </button>
          <button type="button" onClick={() => setMode('rename')} aria-label={`Rename ${project.name}`}>
            Rename
          </button>
          <button type="button" onClick={() => setMode('confirm-delete')} aria-label={`Delete ${project.name}`}>
            Delete
          </button>
        </>
      )}
      {mode === 'confirm-delete' && (
        <div role="alertdialog" aria-labelledby={`confirm-${project.id}`} className="confirm">
          <p id={`confirm-${project.id}`}>
            Delete “{project.name}” with all its utterances and labels? This cannot be undone; make a backup first if
            unsure.
          </p>
          <button type="button" onClick={() => void remove()}>
            Delete for good
          </button>
          <button type="button" onClick={() => setMode('show')} autoFocus>
            Keep it
          </button>
        </div>
      )}
      {error !== null && (
        <p role="alert" className="error">
          {error}
        </p>
      )}
    </li>
  );
}
