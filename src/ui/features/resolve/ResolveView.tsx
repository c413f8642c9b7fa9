import type { ProjectViewProps } from '../../app/project-views';

// Placeholder replaced by the feature's own work in progress (issue 6); the route exists so the shell is wired once.
export function ResolveView({ projectId }: ProjectViewProps) {
  return (
    <section aria-labelledby="ResolveView-title">
      <h2 id="ResolveView-title">Resolve</h2>
      <p>Project {projectId}: this screen is being built.</p>
    </section>
  );
}
