import { useLiveQuery } from 'dexie-react-hooks';
import { useId } from 'react';
import { LAYER_STATUSES } from '../../../core/backup/model';
import { packProgress } from '../../../db/exchange-repo';
import { projectCounts } from '../../../db/utterance-repo';
import { appDb } from '../../app/db';

/** How far each annotator and each pack has come, as far as their layers are in this project. */
export function ProgressSection({ projectId }: { projectId: number }) {
  const id = useId();
  const packs = useLiveQuery(() => packProgress(appDb(), projectId), [projectId]);
  const counts = useLiveQuery(() => projectCounts(appDb(), projectId), [projectId]);
  if (packs === undefined || counts === undefined) return <p>Loading progress…</p>;
  const annotators = Object.keys(counts.layers).sort();
  return (
    <section aria-labelledby={`${id}-title`}>
      <h3 id={`${id}-title`}>Progress</h3>
      {annotators.length === 0 ? (
        <p className="muted">No layers yet.</p>
      ) : (
        <table aria-label="Progress per annotator">
          <thead>
            <tr>
              <th scope="col">Layer</th>
              {LAYER_STATUSES.map((s) => (
                <th key={s} scope="col">
                  {s}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {annotators.map((a) => (
              <tr key={a}>
                <th scope="row">{a}</th>
                {LAYER_STATUSES.map((s) => (
                  <td key={s}>{counts.layers[a]?.[s] ?? 0}</td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {packs.length > 0 && (
        <table aria-label="Progress per pack">
          <thead>
            <tr>
              <th scope="col">Pack</th>
              <th scope="col">Made</th>
              <th scope="col">Utterances</th>
              <th scope="col">Done</th>
              <th scope="col">Skipped</th>
              <th scope="col">Started</th>
              <th scope="col">Not started</th>
            </tr>
          </thead>
          <tbody>
            {packs.map((p) => (
              <tr key={`${p.id}|${p.annotator}`}>
                <th scope="row">
                  {p.annotator} <span className="muted">({p.id.slice(0, 8)})</span>
                </th>
                <td>{new Date(p.created).toLocaleString()}</td>
                <td>{p.total}</td>
                <td>{p.statuses.done}</td>
                <td>{p.statuses.skipped}</td>
                <td>{p.statuses.draft + p.statuses.flagged}</td>
                <td>{p.statuses.unlabelled}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
