import { useLiveQuery } from 'dexie-react-hooks';
import { useState, type FormEvent, type ReactNode } from 'react';
import { projectCreate, projectList } from '../../../db';
import { appDb } from '../../app/db';
import { ProjectRow } from './ProjectRow';

export interface ProjectsViewProps {
  onOpen: (projectId: number) => void;
  /** Creates the demo project and returns its id; absent until the import pipeline exists. */
  onDemo: (() => Promise<number>) | undefined;
  /** Extra controls composed in by the app shell (e.g. restoring a backup). */
  extra?: ReactNode;
}

/** The list of projects on this machine: create, open, rename, delete. */
export function ProjectsView({ onOpen, onDemo, extra }: ProjectsViewProps) {
  const projects = useLiveQuery(() => projectList(appDb()), []);
  const [name, setName] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function create(event: FormEvent) {
    event.preventDefault();
    setError(null);
    try {
      const project = await projectCreate(appDb(), { name });
      setName('');
      onOpen(project.id);
    } catch (caught) {
      setError((caught as Error).message);
    }
  }

  async function demo() {
    if (onDemo === undefined) return;
    setBusy(true);
    setError(null);
    try {
      onOpen(await onDemo());
    } catch (caught) {
      setError(`The demo project could not be made: ${(caught as Error).message}`);
    } finally {
      setBusy(false);
    }
  }

  return (
    <section aria-labelledby="projects-title">
      <h2 id="projects-title">Projects on this machine</h2>
      {onDemo !== undefined && (
        <p>
          <button type="button" onClick={() => void demo()} disabled={busy}>
            {busy ? 'Making the demo project…' : 'Try the demo project (invented home-repair requests)'}
          </button>
        </p>
      )}
      <form onSubmit={(e) => void create(e)} className="row-form">
        <label htmlFor="project-name">New project name</label>
        <input id="project-name" value={name} onChange={(e) => setName(e.target.value)} required maxLength={200} />
        <button type="submit">Create project</button>
      </form>
      {extra}
      {error !== null && (
        <p role="alert" className="error">
          {error}
        </p>
      )}
      {projects === undefined ? (
        <p>Loading…</p>
      ) : projects.length === 0 ? (
        <p>No projects yet. Create one above{onDemo === undefined ? '' : ', or try the demo'}.</p>
      ) : (
        <ul className="project-list" aria-label="Projects">
          {projects.map((p) => (
            <ProjectRow key={p.id} project={p} onOpen={onOpen} />
          ))}
        </ul>
      )}
    </section>
  );
}
