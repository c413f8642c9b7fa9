import { useLiveQuery } from 'dexie-react-hooks';
import { projectExchange } from '../../../db/exchange-repo';
import { projectGet } from '../../../db/project-repo';
import { appDb } from '../../app/db';
import type { ProjectViewProps } from '../../app/project-views';
import { HandBackSection } from './HandBackSection';
import { MergeSection } from './MergeSection';
import { PacksSection } from './PacksSection';
import { ProgressSection } from './ProgressSection';
import './team.css';

/**
 * Team work without a server: the lead hands out packs and merges the layer files that come back;
 * an annotator, in a project opened from a pack, hands back their layer.
 */
export function TeamView({ projectId }: ProjectViewProps) {
  const data = useLiveQuery(async () => ({ project: await projectGet(appDb(), projectId), exchange: await projectExchange(appDb(), projectId).catch(() => null) }), [projectId]);
  if (data === undefined) return <p>Loading…</p>;
  const { project, exchange } = data;
  if (project === undefined) return <p role="alert">This project no longer exists.</p>;
  const copy = exchange?.role === 'copy';
  return (
    <section aria-labelledby="team-title" className="team">
      <h2 id="team-title">Team work: {project.name}</h2>
      {copy ? (
        <p>
          This project was opened from a pack of “{exchange.name ?? project.name}”. Label as usual, then hand back your layer; the lead merges it into the main project.
        </p>
      ) : (
        <p>
          Hand out utterances as pack files, one per annotator; each opens theirs in Slotsmith on their own computer and hands back a layer file. Files go from person
          to person however you like: nothing is sent anywhere.
        </p>
      )}
      {copy && <HandBackSection projectId={projectId} projectName={project.name} exchange={exchange} />}
      {!copy && <PacksSection projectId={projectId} projectName={project.name} />}
      {!copy && <MergeSection projectId={projectId} />}
      {!copy && exchange !== null && <HandBackSection projectId={projectId} projectName={project.name} exchange={exchange} />}
      <ProgressSection projectId={projectId} />
    </section>
  );
}
