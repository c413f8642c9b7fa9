import { create } from 'zustand';

/** The screens of the app; each project screen needs an open project. */
export type View = 'projects' | 'overview' | 'corpus' | 'label' | 'agreement' | 'resolve' | 'rules' | 'mistakes' | 'model' | 'schema' | 'import' | 'export' | 'team' | 'settings';
export const PROJECT_VIEWS: readonly View[] = ['overview', 'corpus', 'label', 'agreement', 'resolve', 'rules', 'mistakes', 'model', 'schema', 'import', 'export', 'team', 'settings'];

export interface NavPlace {
  view: View;
  projectId: number | null;
  /**
   * The screen's own state in the URL (`#/p/3/corpus?slot=area&status=done`), so a filtered view or
   * the utterance being labelled survives a reload and can be shared as a link. Keys sorted, so one
   * state has one URL.
   */
  query: Record<string, string>;
}

export interface NavState extends NavPlace {
  go: (view: View, projectId?: number | null, query?: Record<string, string>) => void;
  /** Replace the current screen's query (no new history entry: typing in a filter is not navigation). */
  queryReplace: (query: Record<string, string>) => void;
}

const VIEW_PATTERN = PROJECT_VIEWS.join('|');
const HASH_PATTERN = new RegExp(`^#/p/(\\d+)/(${VIEW_PATTERN})(?:\\?(.*))?$`);

export function queryParse(text: string): Record<string, string> {
  const query: Record<string, string> = {};
  for (const [key, value] of new URLSearchParams(text)) if (value !== '') query[key] = value;
  return query;
}

export function queryText(query: Record<string, string>): string {
  const entries = Object.entries(query)
    .filter(([, value]) => value !== '')
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return new URLSearchParams(entries).toString();
}

/** Where the app is, mirrored in the URL hash (`#/projects`, `#/p/3/import`) so reload keeps the place. */
export function navFromHash(hash: string): NavPlace {
  const match = HASH_PATTERN.exec(hash);
  if (match) return { view: match[2] as View, projectId: Number(match[1]), query: queryParse(match[3] ?? '') };
  return { view: 'projects', projectId: null, query: {} };
}

export function navToHash(view: View, projectId: number | null, query: Record<string, string> = {}): string {
  if (view === 'projects' || projectId === null) return '#/projects';
  const text = queryText(query);
  return `#/p/${projectId}/${view}${text === '' ? '' : `?${text}`}`;
}

export const useNav = create<NavState>((set, get) => ({
  ...navFromHash(typeof location === 'undefined' ? '' : location.hash),
  go: (view, projectId = null, query = {}) => {
    const next: NavPlace = { view: PROJECT_VIEWS.includes(view) && projectId === null ? 'projects' : view, projectId, query };
    if (typeof location !== 'undefined') {
      const hash = navToHash(next.view, next.projectId, next.query);
      if (location.hash !== hash) history.pushState(null, '', hash);
    }
    set(next);
  },
  queryReplace: (query) => {
    const { view, projectId } = get();
    if (typeof location !== 'undefined') {
      const hash = navToHash(view, projectId, query);
      if (location.hash !== hash) history.replaceState(null, '', hash);
    }
    set({ query });
  },
}));

if (typeof window !== 'undefined') {
  window.addEventListener('popstate', () => useNav.setState(navFromHash(location.hash)));
}
