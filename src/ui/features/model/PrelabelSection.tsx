import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useRef, useState } from 'react';
import { ANNOTATOR_MODEL } from '../../../core/backup/model';
import type { Scheme } from '../../../core/types';
import { modelLayersWrite, modelQueue, modelUnlabelled } from '../../../db/model-repo';
import { useNav } from '../../../state/nav';
import { useSession } from '../../../state/session';
import { appDb } from '../../app/db';
import { modelTaggerOpen } from './model-client';

/** Utterances per worker round trip and per write: small enough that cancel answers within a moment. */
const CHUNK = 100;

type Phase =
  | { kind: 'idle' }
  | { kind: 'running'; done: number; total: number }
  | { kind: 'finished'; written: number; cancelled: boolean }
  | { kind: 'failed'; message: string; written: number };

export function PrelabelSection({ projectId, scheme, modelJson }: { projectId: number; scheme: Scheme; modelJson: string | null }) {
  const profile = useSession((s) => s.profile);
  const go = useNav((s) => s.go);
  const [phase, setPhase] = useState<Phase>({ kind: 'idle' });
  const cancelled = useRef(false);
  const queue = useLiveQuery(() => modelQueue(appDb(), projectId, 20), [projectId]);
  const who = profile?.id ?? ANNOTATOR_MODEL;

  useEffect(
    () => () => {
      cancelled.current = true;
    },
    [],
  );

  async function prelabel(json: string) {
    cancelled.current = false;
    let written = 0;
    setPhase({ kind: 'running', done: 0, total: 0 });
    let tagger: Awaited<ReturnType<typeof modelTaggerOpen>> | null = null;
    try {
      const todo = await modelUnlabelled(appDb(), projectId);
      setPhase({ kind: 'running', done: 0, total: todo.length });
      tagger = await modelTaggerOpen(json);
      for (let at = 0; at < todo.length && !cancelled.current; at += CHUNK) {
        const chunk = todo.slice(at, at + CHUNK);
        const items = await tagger.tag(chunk.map((u) => u.words));
        if (cancelled.current) break;
        written += await modelLayersWrite(
          appDb(),
          scheme,
          chunk.map((u, i) => ({ utteranceId: u.id, tags: items[i]?.tags ?? [], leastConfidence: items[i]?.leastConfidence ?? 0 })),
          who,
        );
        setPhase({ kind: 'running', done: written, total: todo.length });
      }
      setPhase({ kind: 'finished', written, cancelled: cancelled.current });
    } catch (error) {
      setPhase({ kind: 'failed', message: (error as Error).message, written });
    } finally {
      tagger?.end();
    }
  }

  const running = phase.kind === 'running';
  return (
    <section aria-labelledby="model-prelabel-title" className="model-section">
      <h3 id="model-prelabel-title">Pre-label</h3>
      <p>
        Tags every utterance that nobody has a done or draft layer on, into the separate <code>model</code> layer as drafts: suggestions that never count as anyone&apos;s work
        until a person accepts them. Running it again refreshes the suggestions. The history names <strong>{who}</strong> as the one who ran it
        {profile === null ? ' (no profile is chosen, so the model itself)' : ' (your profile)'}.
      </p>
      <div className="row-form">
        <button type="button" onClick={() => modelJson !== null && void prelabel(modelJson)} disabled={modelJson === null || running}>
          Pre-label unlabelled utterances
        </button>
        {running && (
          <button type="button" onClick={() => (cancelled.current = true)}>
            Cancel pre-labelling
          </button>
        )}
      </div>
      {modelJson === null && <p>Train a model or load a model file first.</p>}
      <div aria-live="polite">
        {running && (
          <p>
            <progress max={phase.total || 1} value={phase.done} aria-label="Pre-labelling progress" /> {phase.done.toLocaleString('en')} of {phase.total.toLocaleString('en')}{' '}
            utterances tagged…
          </p>
        )}
        {phase.kind === 'finished' && (
          <p className="model-ok">
            {phase.cancelled ? 'Cancelled: ' : ''}
            {phase.written.toLocaleString('en')} utterance{phase.written === 1 ? '' : 's'} tagged{phase.cancelled ? ' before the stop; their suggestions are kept' : ''}.
          </p>
        )}
        {phase.kind === 'failed' && (
          <p role="alert" className="error">
            Pre-labelling stopped: {phase.message} ({phase.written} utterances were tagged and kept).
          </p>
        )}
        {queue !== undefined && (
          <p role="status" className="model-count">
            The model layer holds suggestions for {queue.total.toLocaleString('en')} utterance{queue.total === 1 ? '' : 's'}.
          </p>
        )}
      </div>
      {queue !== undefined && queue.top.length > 0 && (
        <>
          <h4 id="model-queue-title">Least sure first</h4>
          <p>
            Ordered by how unsure the model is of its best labelling as a whole (one minus the probability of that tag sequence). Labelling these first teaches the next model
            the most, while the ones it is sure of mostly need a quick check.
          </p>
          <ol className="model-queue" aria-labelledby="model-queue-title">
            {queue.top.map((e) => (
              <li key={e.utteranceId}>
                <span className="model-score">{e.leastConfidence.toFixed(3)}</span>{' '}
                <a
                  href={`#/p/${projectId}/label?order=uncertain&u=${e.utteranceId}`}
                  onClick={(event) => {
                    event.preventDefault();
                    // Opened in the same order, so "next not started" goes on down this list.
                    go('label', projectId, { u: String(e.utteranceId), order: 'uncertain' });
                  }}
                >
                  {e.text}
                </a>
              </li>
            ))}
          </ol>
        </>
      )}
    </section>
  );
}
