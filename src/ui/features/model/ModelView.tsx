import { useLiveQuery } from 'dexie-react-hooks';
import { projectGet } from '../../../db';
import { projectModel } from '../../../db/model-repo';
import { appDb } from '../../app/db';
import type { ProjectViewProps } from '../../app/project-views';
import { CrossValidationTable } from './CrossValidationTable';
import { ModelFileSection } from './ModelFileSection';
import { PrelabelSection } from './PrelabelSection';
import { TrainSection } from './TrainSection';
import './model.css';

/** "Model": train the project's tagger, see how far to trust it, and pre-label with it. */
export function ModelView({ projectId }: ProjectViewProps) {
  const data = useLiveQuery(async () => {
    const project = (await projectGet(appDb(), projectId)) ?? null;
    return { project, stored: project === null ? null : await projectModel(appDb(), projectId) };
  }, [projectId]);
  if (data === undefined) return <p>Loading…</p>;
  const { project, stored } = data;
  if (project === null) return <p role="alert">This project does not exist (it may have been deleted in another tab).</p>;
  return (
    <section aria-labelledby="model-title" className="model">
      <h2 id="model-title">Model: {project.name}</h2>
      <p>
        A statistical tagger (a linear-chain conditional random field) learns the slot labels from finished work, right here in the browser, and suggests labels for the rest.
      </p>
      <TrainSection projectId={projectId} />
      {stored !== null && stored.crossValidation !== null && <CrossValidationTable cv={stored.crossValidation} />}
      <ModelFileSection projectId={projectId} projectName={project.name} stored={stored} />
      <PrelabelSection projectId={projectId} scheme={project.scheme} modelJson={stored?.json ?? null} />
    </section>
  );
}
