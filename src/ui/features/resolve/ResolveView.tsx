import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useMemo, useState } from 'react';
import { ANNOTATORS_RESERVED } from '../../../core/backup/model';
import { annotatorList, projectGet } from '../../../db';
import { disagreementSet, disagreementStep, goldDoneIds, summaryFrom } from '../../../db/adjudication-repo';
import { useNav } from '../../../state/nav';
import { useSession } from '../../../state/session';
import { appDb } from '../../app/db';
import type { ProjectViewProps } from '../../app/project-views';
import { DisagreementIndex } from './DisagreementIndex';
import { KeyList } from './KeyList';
import { ResolveUtterance } from './ResolveUtterance';
import './resolve.css';

/** Who may write here, in words; null when the profile may. */
function readOnlyReason(profile: { name: string; role: string } | null): string | null {
  if (profile === null) return 'No profile is chosen, so this screen is read-only. Choose who you are in the header; only an adjudicator writes the gold layer.';
  if (profile.role !== 'adjudicator') return `You are working as ${profile.name}, an annotator: only adjudicators write the gold layer, so this screen is read-only. Choose an adjudicator profile in the header to resolve.`;
  return null;
}

/** "Resolve": two annotators' layers side by side, each disagreement settled into the gold layer. */
export function ResolveView({ projectId }: ProjectViewProps) {
  const db = appDb();
  const project = useLiveQuery(async () => (await projectGet(db, projectId)) ?? null, [projectId]);
  const people = useLiveQuery(() => annotatorList(db, projectId), [projectId]);
  const profile = useSession((s) => s.profile);
  const { query, queryReplace } = useNav();
  const humans = (people ?? []).map((p) => p.id).filter((id) => !ANNOTATORS_RESERVED.includes(id)).sort();
  const a = query.a ?? humans[0] ?? '';
  const b = query.b ?? humans.find((id) => id !== a) ?? '';
  const ready = a !== '' && b !== '' && a !== b;
  // Two watches: a gold save re-reads gold's index keys only; comparing A and B (every layer of both)
  // runs again only when one of their layers changes.
  const disagreeing = useLiveQuery(() => (ready ? disagreementSet(db, projectId, a, b) : undefined), [projectId, a, b, ready]);
  const goldDone = useLiveQuery(() => goldDoneIds(db, projectId), [projectId]);
  const summary = useMemo(() => (disagreeing === undefined || goldDone === undefined ? undefined : summaryFrom(disagreeing, goldDone)), [disagreeing, goldDone]);
  const uId = query.u === undefined ? null : Number(query.u);
  const [searching, setSearching] = useState<'idle' | 'none'>('idle');
  // Arriving from the next utterance (going back) starts at its last disagreement.
  const [enterAt, setEnterAt] = useState<'first' | 'last'>('first');

  // Without an utterance in the URL, open the first one still to resolve (else the first disagreement).
  useEffect(() => {
    if (!ready || uId !== null) return;
    let live = true;
    void (async () => {
      const found = (await disagreementStep(db, projectId, a, b, null, 1, { unresolvedOnly: true })) ?? (await disagreementStep(db, projectId, a, b, null, 1));
      if (!live) return;
      if (found === undefined) setSearching('none');
      else queryReplace({ ...query, a, b, u: String(found.utteranceId) });
    })();
    return () => {
      live = false;
    };
  }, [db, projectId, a, b, ready, uId, query, queryReplace]);

  if (project === undefined || people === undefined) return <p>Loading…</p>;
  if (project === null) return <p role="alert">This project does not exist (it may have been deleted in another tab).</p>;
  const readOnly = readOnlyReason(profile);
  const choose = (side: 'a' | 'b', id: string) => {
    const next = { ...query, a, b, [side]: id };
    delete next.u;
    setSearching('idle');
    queryReplace(next);
  };

  return (
    <section aria-labelledby="resolve-title" className="resolve">
      <h2 id="resolve-title">Resolve: {project.name}</h2>
      <p>Where two annotators disagree, choose what goes into the gold layer: one side, the other, or your own edit.</p>
      {readOnly !== null && (
        <p className="resolve-readonly" role="note">
          {readOnly}
        </p>
      )}
      {humans.length < 2 ? (
        <p>This project needs layers from two annotators before there is anything to resolve.</p>
      ) : (
        <div className="row-form">
          <label>
            A{' '}
            <select value={a} onChange={(e) => choose('a', e.target.value)}>
              {humans.map((id) => (
                <option key={id} value={id}>
                  {id}
                </option>
              ))}
            </select>
          </label>
          <label>
            B{' '}
            <select value={b} onChange={(e) => choose('b', e.target.value)}>
              {humans.map((id) => (
                <option key={id} value={id}>
                  {id}
                </option>
              ))}
            </select>
          </label>
          {a === b && <span className="error">Choose two different annotators.</span>}
        </div>
      )}
      {ready && summary !== undefined && (
        <p className="resolve-progress">
          <progress max={Math.max(1, summary.disagreeing)} value={summary.resolved} aria-label="Utterances resolved" />{' '}
          <span role="status" aria-live="polite">
            Resolved {summary.resolved} of {summary.disagreeing} utterances where {a} and {b} disagree
          </span>{' '}
          <span className="muted">({summary.shared} labelled by both)</span>
        </p>
      )}
      {ready && (
        <DisagreementIndex
          projectId={projectId}
          a={a}
          b={b}
          openId={uId}
          onOpen={(id) => {
            setEnterAt('first');
            queryReplace({ ...query, a, b, u: String(id) });
          }}
        />
      )}
      {ready && uId === null && searching === 'none' && <p>{a} and {b} agree on every utterance they both labelled: nothing to resolve.</p>}
      {ready && uId !== null && (
        <ResolveUtterance
          key={`${uId}|${a}|${b}`}
          projectId={projectId}
          project={project}
          utteranceId={uId}
          a={a}
          b={b}
          who={readOnly === null && profile !== null ? profile.id : null}
          enterAt={enterAt}
          onOpen={(id, at) => {
            setEnterAt(at);
            queryReplace({ ...query, a, b, u: String(id) });
          }}
        />
      )}
      <KeyList />
    </section>
  );
}
