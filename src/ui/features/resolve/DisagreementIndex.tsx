import { useLiveQuery } from 'dexie-react-hooks';
import { useState } from 'react';
import { disagreementPage } from '../../../db/adjudication-repo';
import { appDb } from '../../app/db';

interface Props {
  projectId: number;
  a: string;
  b: string;
  openId: number | null;
  onOpen: (utteranceId: number) => void;
}

const PAGE = 15;

/** The project's disagreements a page at a time, with the state of each one's gold layer. */
export function DisagreementIndex({ projectId, a, b, openId, onOpen }: Props) {
  // Keyset paging: the seq each page started after, so "Back" retraces exactly.
  const [starts, setStarts] = useState<(number | null)[]>([null]);
  const after = starts[starts.length - 1] ?? null;
  const page = useLiveQuery(() => disagreementPage(appDb(), projectId, a, b, after, PAGE), [projectId, a, b, after]);
  return (
    <details className="resolve-index-list">
      <summary>All disagreements between {a} and {b}</summary>
      {page === undefined ? (
        <p>Loading…</p>
      ) : (
        <>
          <ul aria-label="Disagreements in the project">
            {page.rows.map((row) => {
              const state = row.gold === 'done' ? 'resolved' : row.gold === null ? 'open' : 'in progress';
              return (
                <li key={row.utteranceId}>
                  <button type="button" onClick={() => onOpen(row.utteranceId)} aria-current={row.utteranceId === openId ? 'true' : undefined}>
                    {row.seq}: {row.text}
                  </button>{' '}
                  <span className="muted">
                    ({row.regions} span disagreement{row.regions === 1 ? '' : 's'}
                    {row.intentDiffers ? ', intent' : ''}; {state})
                  </span>
                </li>
              );
            })}
          </ul>
          <div className="row-form">
            <button type="button" disabled={starts.length === 1} onClick={() => setStarts((s) => s.slice(0, -1))}>
              Previous page
            </button>
            <button type="button" disabled={page.next === null} onClick={() => setStarts((s) => [...s, page.next])}>
              Next page
            </button>
          </div>
        </>
      )}
    </details>
  );
}
