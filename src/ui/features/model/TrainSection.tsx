import { useEffect, useRef, useState } from 'react';
import { CRF_DEFAULTS } from '../../../core/crf';
import { projectModelSave } from '../../../db/model-repo';
import type { CrfProjectTrainOutcome, CrfRunProgress, TrainingSetInfo } from '../../../workers/crf-run';
import { JobCancelledError, type WorkerJob } from '../../../workers/worker-job';
import { appDb } from '../../app/db';
import { modelTrainProjectStart } from './model-client';
import { trainProgressShare, trainProgressText } from './model-reading';

type Phase = { kind: 'idle' } | { kind: 'reading' } | { kind: 'running'; used: string; progress: CrfRunProgress | null } | { kind: 'done'; used: string } | { kind: 'failed'; message: string };

const count = (n: number, word: string) => `${n.toLocaleString('en')} ${word}${n === 1 ? '' : 's'}`;

const usedText = (info: TrainingSetInfo) =>
  `${count(info.utterances, 'utterance')} used: ${info.fromGold.toLocaleString('en')} from the gold layer, ${info.fromDone.toLocaleString('en')} from an annotator's done layer (where several annotators finished one, the first by name).`;

/** Training from the finished layers, in a worker, with cross-validation first. */
export function TrainSection({ projectId }: { projectId: number }) {
  const [iterations, setIterations] = useState<number>(CRF_DEFAULTS.maxIterations);
  const [folds, setFolds] = useState(5);
  const [phase, setPhase] = useState<Phase>({ kind: 'idle' });
  const job = useRef<WorkerJob<CrfProjectTrainOutcome> | null>(null);

  useEffect(
    () => () => {
      job.current?.cancel();
      job.current = null;
    },
    [],
  );

  async function train() {
    setPhase({ kind: 'reading' });
    try {
      // The worker reads the finished layers itself: at 100k utterances, reading them here would hold up the page.
      let used = '';
      const current = modelTrainProjectStart(
        { projectId, maxIterations: iterations, folds },
        (info) => {
          used = usedText(info);
          if (job.current === current && info.utterances >= 2) setPhase({ kind: 'running', used, progress: null });
        },
        (progress) => {
          if (job.current === current) setPhase({ kind: 'running', used, progress });
        },
      );
      job.current = current;
      const result = await current.result;
      if (job.current !== current) return;
      job.current = null;
      if (!result.ok) {
        setPhase({ kind: 'failed', message: 'Training needs at least two utterances with a gold layer or a done layer.' });
        return;
      }
      const { outcome } = result;
      await projectModelSave(appDb(), projectId, { json: outcome.modelJson, origin: 'trained', crossValidation: outcome.crossValidation });
      setPhase({ kind: 'done', used: usedText(result.info) });
    } catch (error) {
      job.current = null;
      setPhase(error instanceof JobCancelledError ? { kind: 'idle' } : { kind: 'failed', message: (error as Error).message });
    }
  }

  const busy = phase.kind === 'reading' || phase.kind === 'running';
  const share = phase.kind === 'running' && phase.progress !== null ? trainProgressShare(phase.progress) : null;
  return (
    <section aria-labelledby="model-train-title" className="model-section">
      <h3 id="model-train-title">Train</h3>
      <p>
        The model learns from every utterance with a gold layer (preferred) or a layer an annotator marked done. Before the final training it is trained and tested once per fold
        on the rest, so the figures below come from utterances it had not seen.
      </p>
      <div className="row-form">
        <label>
          Iterations{' '}
          <input type="number" min={1} max={1000} value={iterations} onChange={(e) => setIterations(Math.max(1, Math.min(1000, Number(e.target.value) || 1)))} disabled={busy} />
        </label>
        <label>
          Folds for cross-validation{' '}
          <input type="number" min={2} max={10} value={folds} onChange={(e) => setFolds(Math.max(2, Math.min(10, Number(e.target.value) || 2)))} disabled={busy} />
        </label>
        <button type="button" onClick={() => void train()} disabled={busy}>
          Train the model
        </button>
        {phase.kind === 'running' && (
          <button type="button" onClick={() => job.current?.cancel()}>
            Cancel training
          </button>
        )}
      </div>
      <div aria-live="polite">
        {phase.kind === 'reading' && <p>Reading the finished layers…</p>}
        {(phase.kind === 'running' || phase.kind === 'done') && <p className="model-used">{phase.used}</p>}
        {phase.kind === 'running' && (
          <p>
            <progress max={share?.max ?? 1} value={share?.value ?? 0} aria-label="Training progress" /> {phase.progress === null ? 'Starting…' : trainProgressText(phase.progress)}
          </p>
        )}
        {phase.kind === 'done' && <p className="model-ok">Trained and saved in the project.</p>}
        {phase.kind === 'failed' && (
          <p role="alert" className="error">
            Training failed: {phase.message}
          </p>
        )}
      </div>
    </section>
  );
}
