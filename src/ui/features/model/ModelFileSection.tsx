import { useEffect, useMemo, useState } from 'react';
import { projectModelSave, type StoredModel } from '../../../db/model-repo';
import type { CrfModelSummary } from '../../../workers/crf-run';
import { appDb } from '../../app/db';
import { modelSummaryRead } from './model-client';

/** The stored model in short, with download, load from a file, and forget. */
export function ModelFileSection({ projectId, projectName, stored }: { projectId: number; projectName: string; stored: StoredModel | null }) {
  const [message, setMessage] = useState<{ text: string; error: boolean } | null>(null);
  const json = stored?.json ?? null;
  // Read in a worker: decoding a big model here would hold up the page for a long task.
  const [summary, setSummary] = useState<{ json: string; value: CrfModelSummary } | null>(null);
  useEffect(() => {
    if (json === null) return;
    let live = true;
    void modelSummaryRead(json).then(
      (value) => live && setSummary({ json, value }),
      (error: unknown) => live && setSummary({ json, value: { ok: false, message: (error as Error).message } }),
    );
    return () => {
      live = false;
    };
  }, [json]);
  const read = json !== null && summary?.json === json ? summary.value : null;
  const info = read === null ? null : read.ok ? { labels: read.labels, training: read.training } : { error: read.message };
  const url = useMemo(() => (json === null ? null : URL.createObjectURL(new Blob([json], { type: 'application/json' }))), [json]);
  useEffect(() => () => void (url !== null && URL.revokeObjectURL(url)), [url]);

  async function load(file: File) {
    try {
      const text = await file.text();
      const checked = await modelSummaryRead(text);
      if (!checked.ok) throw new Error(checked.message);
      await projectModelSave(appDb(), projectId, { json: text, origin: 'file', crossValidation: null });
      setMessage({ text: `Loaded ${file.name} and saved it in the project.`, error: false });
    } catch (error) {
      setMessage({ text: `${file.name} was not loaded: ${(error as Error).message}`, error: true });
    }
  }

  const fileName = `${projectName.replace(/[^\p{L}\p{N}_-]+/gu, '-')}-model.json`;
  return (
    <section aria-labelledby="model-file-title" className="model-section">
      <h3 id="model-file-title">Model file</h3>
      {stored === null ? (
        <p>No model is saved in this project yet.</p>
      ) : info === null ? (
        <p className="model-info">Reading the saved model…</p>
      ) : 'error' in info ? (
        <p className="error">The saved model cannot be read by this version: {info.error}</p>
      ) : (
        <p className="model-info">
          {stored.origin === 'trained' ? 'Trained here' : 'Loaded from a file'} on {new Date(stored.saved).toLocaleString('en')}: {info.training.utterances.toLocaleString('en')} utterances,{' '}
          {info.labels} tags, {info.training.iterations} iterations ({info.training.stopped}).
        </p>
      )}
      <div className="row-form">
        {url !== null && (
          <a href={url} download={fileName}>
            Download the model file
          </a>
        )}
        <label>
          Load a model file{' '}
          <input
            type="file"
            accept=".json,application/json"
            onChange={(e) => {
              const file = e.target.files?.[0];
              if (file !== undefined) void load(file);
              e.target.value = '';
            }}
          />
        </label>
        {stored !== null && (
          <button type="button" onClick={() => void projectModelSave(appDb(), projectId, null).then(() => setMessage({ text: 'The model was removed from the project; its suggestions stay in the model layer.', error: false }))}>
            Forget the model
          </button>
        )}
      </div>
      {message !== null && (
        <p role={message.error ? 'alert' : 'status'} className={message.error ? 'error' : 'model-ok'}>
          {message.text}
        </p>
      )}
    </section>
  );
}
