import { useLiveQuery } from 'dexie-react-hooks';
import { useId, useState } from 'react';
import { annotatorList } from '../../../db/annotator-repo';
import { handBackMake, type ProjectExchange } from '../../../db/exchange-repo';
import { useSession } from '../../../state/session';
import { appDb } from '../../app/db';
import { layersFileName } from './team-form';
import { useDownloads } from './use-downloads';

/** The annotator's part: their layer as a layer file for the lead. */
export function HandBackSection({ projectId, projectName, exchange }: { projectId: number; projectName: string; exchange: ProjectExchange }) {
  const id = useId();
  const profile = useSession((s) => s.profile);
  const profileSet = useSession((s) => s.profileSet);
  const known = useLiveQuery(() => annotatorList(appDb(), projectId), [projectId]) ?? [];
  const packAnnotators = [...new Set(exchange.packs.map((p) => p.annotator))];
  const choices = [...new Set([...packAnnotators, ...(profile === null ? [] : [profile.id]), ...known.map((a) => a.id)])];
  const fallback = exchange.role === 'copy' ? packAnnotators.at(-1) : profile?.id;
  const [chosen, setChosen] = useState<string>('');
  const annotator = chosen !== '' ? chosen : (fallback ?? choices[0] ?? '');
  const [links, linksSet] = useDownloads();
  const [said, setSaid] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);

  async function handBack() {
    setProblem(null);
    try {
      const { text, count } = await handBackMake(appDb(), projectId, annotator);
      const name = layersFileName(exchange.name ?? projectName, annotator);
      linksSet([{ name, text, detail: `${count} layer${count === 1 ? '' : 's'} of ${annotator}` }]);
      setSaid(count === 0 ? `${annotator} has no labels here yet; the file holds none.` : `${count} layer${count === 1 ? '' : 's'} of ${annotator} ready. Save the file and give it to the lead.`);
    } catch (error) {
      setProblem(`The layer file could not be made: ${(error as Error).message}`);
    }
  }

  const packFor = exchange.role === 'copy' ? packAnnotators : [];
  const mismatch = packFor.length > 0 && profile !== null && !packFor.includes(profile.id);
  return (
    <section aria-labelledby={`${id}-title`}>
      <h3 id={`${id}-title`}>Hand back my labels</h3>
      {packFor.length > 0 && (profile === null || mismatch) && (
        <p>
          {profile === null ? 'Nobody is chosen as the labeller here yet. ' : `You label as “${profile.id}”, but the pack is for “${packFor.join('”, “')}”: your labels would go to another layer. `}
          {packFor.map((a) => (
            <button key={a} type="button" onClick={() => profileSet({ id: a, name: a, role: 'annotator' })}>
              Label as {a}
            </button>
          ))}
        </p>
      )}
      {choices.length === 0 ? (
        <p className="muted">No layers to hand back yet.</p>
      ) : (
        <div className="row-form">
          <label htmlFor={`${id}-who`}>Layer of</label>
          <select id={`${id}-who`} value={annotator} onChange={(e) => setChosen(e.target.value)}>
            {choices.map((a) => (
              <option key={a} value={a}>
                {a}
              </option>
            ))}
          </select>
          <button type="button" onClick={() => void handBack()}>
            Hand back my layer
          </button>
        </div>
      )}
      <div aria-live="polite">{said !== null && <p role="status">{said}</p>}</div>
      {problem !== null && (
        <p role="alert" className="error">
          {problem}
        </p>
      )}
      {links.length > 0 && (
        <ul aria-label="Layer file to save" className="team-files">
          {links.map((l) => (
            <li key={l.url}>
              <a href={l.url} download={l.name}>
                Save {l.name}
              </a>{' '}
              <span className="muted">({l.detail})</span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
