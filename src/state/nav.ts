import { create } from 'zustand';

/** The screens of the app; each project screen needs an open project. */
export type View = 'projects' | 'import' | 'export' | 'settings';
export const PROJECT_VIEWS: readonly View[] = ['import', 'export', 'settings'];

export interface NavState {
  view: View;
  projectId: number | null;
  go: (view: View, projectId?: number | null) => void;
}

/** Where the app is, mirrored in the URL hash (`#/projects`, `#/p/3/import`) so reload keeps the place. */
export function navFromHash(hash: string): Pick<NavState, 'view' | 'projectId'> {
  const match = /^#\/p\/(\d+)\/(import|export|settings)$/.exec(hash);
  if (match) return { view: match[2] as View, projectId: Number(match[1]) };
  return { view: 'projects', projectId: null };
}

export function navToHash(view: View, projectId: number | null): string {
  return view === 'projects' || projectId === null ? '#/projects' : `#/p/${projectId}/${view}`;
}

export const useNav = create<NavState>((set) => ({
  ...navFromHash(typeof location === 'undefined' ? '' : location.hash),
  go: (view, projectId = null) => {
    const next = { view: PROJECT_VIEWS.includes(view) && projectId === null ? 'projects' : view, projectId };
    if (typeof location !== 'undefined') {
      const hash = navToHash(next.view, next.projectId);
      if (location.hash !== hash) history.pushState(null, '', hash);
    }
    set(next);
  },
}));

if (typeof window !== 'undefined') {
  window.addEventListener('popstate', () => useNav.setState(navFromHash(location.hash)));
}
