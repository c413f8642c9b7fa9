import type { ProjectViewProps } from '../../app/project-views';

// Placeholder replaced by the feature's own work in progress (issue 5); the route exists so the shell is wired once.
export function CorpusView({ projectId }: ProjectViewProps) {
  return (
    <section aria-labelledby="CorpusView-title">
      <h2 id="CorpusView-title">Utterances</h2>
      <p>Project {projectId}: this screen is being built.</p>
    </section>
  );
}
