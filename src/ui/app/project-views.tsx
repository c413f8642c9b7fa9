import type { ComponentType } from 'react';

/**
 * The per-project screens, composed here so features never import each other. Each feature that is
 * not built yet shows a plain placeholder saying so.
 */
export interface ProjectViewProps {
  projectId: number;
}

function NotYet({ what }: { what: string }) {
  return (
    <section aria-labelledby="not-yet-title">
      <h2 id="not-yet-title">{what}</h2>
      <p>This screen is not built yet.</p>
    </section>
  );
}

export const projectViews: {
  import: ComponentType<ProjectViewProps>;
  export: ComponentType<ProjectViewProps>;
  settings: ComponentType<ProjectViewProps>;
  demoLoad: (() => Promise<number>) | undefined;
} = {
  import: () => <NotYet what="Bring in data" />,
  export: () => <NotYet what="Write out data" />,
  settings: () => <NotYet what="Project settings" />,
  demoLoad: undefined,
};
