import { useEffect, useState, type ReactNode } from 'react';
import { batchActiveByLocks, batchesCleanUnfinished, storageStatus } from '../../db';
import { PRODUCT_NAME } from '../../core/version';
import { useNav, type View } from '../../state/nav';
import { ProjectsView } from '../features/projects/ProjectsView';
import { StorageFullAlert } from '../components/StorageFullAlert';
import { appDb } from './db';
import { projectViews } from './project-views';

const VIEW_LABELS: Record<Exclude<View, 'projects'>, string> = {
  overview: 'Overview',
  corpus: 'Utterances',
  label: 'Label',
  agreement: 'Agreement',
  resolve: 'Resolve',
  rules: 'Rule review',
  mistakes: 'Likely mistakes',
  model: 'Model',
  schema: 'Slots and intents',
  import: 'Bring in data',
  export: 'Write out data',
  team: 'Team work',
  settings: 'Project settings',
};

/** Roll back imports a closed tab left half-done, and say so once. */
function useStartupCleanup(): string | null {
  const [notice, setNotice] = useState<string | null>(null);
  useEffect(() => {
    const locks = typeof navigator !== 'undefined' ? navigator.locks : undefined;
    const options = locks === undefined ? {} : { isActive: batchActiveByLocks(locks) };
    batchesCleanUnfinished(appDb(), options)
      .then((report) => {
        if (report.cleaned.length === 0) return;
        const files = report.cleaned.map((c) => c.batch.fileName).join(', ');
        setNotice(`An unfinished import was undone after the tab closed: ${files}. Nothing from it was kept.`);
      })
      .catch((error: unknown) => setNotice(`Start-up check failed: ${(error as Error).message}`));
    // Ask once that the browser keep this origin's data when it clears space; the settings screen shows the answer.
    void storageStatus({ requestPersist: true }).catch(() => undefined);
  }, []);
  return notice;
}

/** When a project opens, once the page is idle: start what a first look at its figures needs. */
function useProjectWarm(projectId: number | null): void {
  useEffect(() => {
    if (projectId === null) return;
    if (typeof requestIdleCallback === 'undefined') {
      const timer = setTimeout(projectViews.projectWarm, 1000);
      return () => clearTimeout(timer);
    }
    const idle = requestIdleCallback(projectViews.projectWarm, { timeout: 2000 });
    return () => cancelIdleCallback(idle);
  }, [projectId]);
}

export function App() {
  const { view, projectId, go } = useNav();
  const notice = useStartupCleanup();
  useProjectWarm(projectId);
  let screen: ReactNode;
  const Restore = projectViews.restore;
  const PackOpen = projectViews.packOpen;
  const Profile = projectViews.profile;
  if (view === 'projects' || projectId === null) {
    const restore = (
      <>
        <Restore onOpen={(id) => go('settings', id)} />
        <PackOpen onOpen={(id) => go('team', id)} />
      </>
    );
    screen = <ProjectsView onOpen={(id) => go('corpus', id)} onDemo={projectViews.demoLoad} extra={restore} />;
  }
  else {
    const Screen = projectViews[view];
    screen = <Screen projectId={projectId} />;
  }
  return (
    <div className="shell">
      <header className="shell-header">
        <h1>
          {PRODUCT_NAME} <span className="shell-version">v{__APP_VERSION__}</span>
        </h1>
        <p className="shell-tagline">Slot and intent labelling for chat utterances, kept on this machine.</p>
        <Profile />
        <nav aria-label="Screens" className="shell-nav">
          <button type="button" aria-current={view === 'projects' ? 'page' : undefined} onClick={() => go('projects')}>
            All projects
          </button>
          {projectId !== null &&
            (Object.keys(VIEW_LABELS) as (keyof typeof VIEW_LABELS)[]).map((v) => (
              <button key={v} type="button" aria-current={view === v ? 'page' : undefined} onClick={() => go(v, projectId)}>
                {VIEW_LABELS[v]}
              </button>
            ))}
        </nav>
      </header>
      {notice !== null && (
        <p role="status" className="shell-notice">
          {notice}
        </p>
      )}
      <StorageFullAlert />
      <main className="shell-main">{screen}</main>
    </div>
  );
}
