import type { ProjectViewProps } from '../../app/project-views';

// Placeholder replaced by the feature's own work in progress (issue 5); the route exists so the shell is wired once.
export function LabelView({ projectId }: ProjectViewProps) {
  return (
    <section aria-labelledby="LabelView-title">
      <h2 id="LabelView-title">Label</h2>
      <p>Project {projectId}: this screen is being built.</p>
    </section>
  );
}
