import * as Comlink from 'comlink';
import { useLiveQuery } from 'dexie-react-hooks';
import { useRef, useState } from 'react';
import type { FormatName } from '../../../core/formats';
import { SCHEMES, type Scheme } from '../../../core/types';
import { projectGet, utteranceCount } from '../../../db';
import type { ImportPreview } from '../../../workers/import-preview';
import { formatHasLabels } from '../../../workers/import-read';
import type { ImportProgress, ImportSummary } from '../../../workers/import-run';
import { appDb } from '../../app/db';
import { fileHeadRead, headerColumns, importJobId, importWorker } from './import-client';
import { PreviewReport } from './PreviewReport';
import './import.css';

const FORMAT_CHOICES: { value: FormatName; label: string }[] = [
  { value: 'columns', label: 'Token and tag columns (IOB)' },
  { value: 'jsonl', label: 'JSON Lines' },
  { value: 'text', label: 'Plain text, one utterance a line' },
  { value: 'csv', label: 'CSV' },
  { value: 'tsv', label: 'TSV' },
];

type Phase = 'idle' | 'previewing' | 'ready' | 'importing' | 'done';

function errorText(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

/** Bring a file into the project: choose how to read it, look at what it holds, then store it. */
export function ImportView({ projectId }: { projectId: number }) {
  const project = useLiveQuery(() => projectGet(appDb(), projectId), [projectId]);
  const stored = useLiveQuery(() => utteranceCount(appDb(), projectId), [projectId]);
  const [file, setFile] = useState<File | null>(null);
  const [detected, setDetected] = useState<FormatName | null>(null);
  const [head, setHead] = useState('');
  const [format, setFormat] = useState<FormatName | 'auto'>('auto');
  const [scheme, setScheme] = useState<Scheme | 'auto'>('auto');
  const [column, setColumn] = useState('');
  const [annotator, setAnnotator] = useState('');
  const [labelsAdd, setLabelsAdd] = useState(true);
  const [phase, setPhase] = useState<Phase>('idle');
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [progress, setProgress] = useState<ImportProgress | null>(null);
  const [summary, setSummary] = useState<ImportSummary | null>(null);
  const [error, setError] = useState<string | null>(null);
  const job = useRef<string | null>(null);

  const formatUsed: FormatName | null = format === 'auto' ? detected : format;
  const columns = formatUsed === null ? [] : headerColumns(head, formatUsed);
  const needsColumn = formatUsed === 'csv' || formatUsed === 'tsv';
  const needsAnnotator = formatUsed !== null && formatHasLabels(formatUsed);
  const busy = phase === 'previewing' || phase === 'importing';

  function reset() {
    setPreview(null);
    setSummary(null);
    setError(null);
    setPhase('idle');
  }

  async function pick(next: File | null) {
    reset();
    setFile(next);
    setDetected(null);
    setHead('');
    setColumn('');
    if (next === null) return;
    const read = await fileHeadRead(next);
    setHead(read.head);
    setDetected(read.detected);
    if (annotator === '') setAnnotator(next.name.replace(/\.[^.]*$/, ''));
  }

  function request() {
    if (file === null || formatUsed === null) throw new Error('Pick a file first.');
    const r: { projectId: number; fileName: string; format: FormatName; scheme?: Scheme; column?: string; annotator?: string } = {
      projectId,
      fileName: file.name,
      format: formatUsed,
    };
    if (scheme !== 'auto') r.scheme = scheme;
    if (needsColumn) r.column = column || (columns[0] ?? '');
    if (needsAnnotator) r.annotator = annotator.trim();
    return r;
  }

  async function run<T>(next: Phase, work: (jobId: string, onProgress: (p: ImportProgress) => void) => Promise<T>): Promise<T | null> {
    const jobId = importJobId();
    job.current = jobId;
    setPhase(next);
    setError(null);
    setProgress(null);
    try {
      return await work(jobId, Comlink.proxy((p: ImportProgress) => setProgress(p)));
    } catch (caught) {
      setError(errorText(caught));
      return null;
    } finally {
      job.current = null;
    }
  }

  async function previewRun() {
    setSummary(null);
    const result = await run('previewing', (jobId, onProgress) => importWorker().preview(file as File, request(), jobId, onProgress));
    setPreview(result);
    setPhase(result === null ? 'idle' : 'ready');
  }

  async function commitRun() {
    if (preview === null || file === null) return;
    const labels = labelsAdd ? { slots: preview.unknownSlots.map((s) => s.name), intents: preview.unknownIntents.map((i) => i.name) } : undefined;
    const commit = { ...request(), total: preview.utterances, ...(labels === undefined ? {} : { labelsAdd: labels }) };
    const result = await run('importing', (jobId, onProgress) => importWorker().commit(file, commit, jobId, onProgress));
    setSummary(result);
    setPhase(result === null ? 'ready' : 'done');
  }

  function cancel() {
    if (job.current !== null) void importWorker().cancel(job.current);
  }

  const importBlocked = preview === null || preview.malformed.total > 0 || (needsAnnotator && annotator.trim() === '') || phase !== 'ready';

  return (
    <section aria-labelledby="import-title" className="import-view">
      <h2 id="import-title">Bring in data{project === undefined ? '' : ` to ${project.name}`}</h2>
      <p className="import-note">
        {stored === undefined ? '' : `This project holds ${stored.toLocaleString('en')} utterance${stored === 1 ? '' : 's'}. `}
        The file is read on this machine; nothing is stored until you choose Import.
      </p>

      <div className="import-form">
        <label htmlFor="import-file">File to bring in</label>
        <input id="import-file" type="file" disabled={busy} onChange={(e) => void pick(e.target.files?.[0] ?? null)} />

        <label htmlFor="import-format">Format</label>
        <select
          id="import-format"
          value={format}
          disabled={busy}
          onChange={(e) => {
            setFormat(e.target.value as FormatName | 'auto');
            reset();
          }}
        >
          <option value="auto">{detected === null ? 'Detect from the file' : `Detected: ${FORMAT_CHOICES.find((f) => f.value === detected)?.label ?? detected}`}</option>
          {FORMAT_CHOICES.map((f) => (
            <option key={f.value} value={f.value}>
              {f.label}
            </option>
          ))}
        </select>

        {formatUsed === 'columns' && (
          <>
            <label htmlFor="import-scheme">Tag scheme</label>
            <select
              id="import-scheme"
              value={scheme}
              disabled={busy}
              onChange={(e) => {
                setScheme(e.target.value as Scheme | 'auto');
                reset();
              }}
            >
              <option value="auto">Detect from the tags</option>
              {SCHEMES.map((s) => (
                <option key={s} value={s}>
                  {s.toUpperCase()}
                </option>
              ))}
            </select>
          </>
        )}

        {needsColumn && (
          <>
            <label htmlFor="import-column">Column with the text</label>
            <select
              id="import-column"
              value={column || (columns[0] ?? '')}
              disabled={busy}
              onChange={(e) => {
                setColumn(e.target.value);
                reset();
              }}
            >
              {columns.map((c) => (
                <option key={c} value={c}>
                  {c}
                </option>
              ))}
            </select>
          </>
        )}

        {needsAnnotator && (
          <>
            <label htmlFor="import-annotator">Whose labels are these?</label>
            <input id="import-annotator" value={annotator} disabled={busy} onChange={(e) => setAnnotator(e.target.value)} aria-describedby="import-annotator-hint" />
            <span id="import-annotator-hint" className="import-note import-wide">
              The labels go into this person&apos;s layer; the same name later adds to the same layer.
            </span>
          </>
        )}
        {formatUsed !== null && !needsAnnotator && <p className="import-note import-wide">This format has no labels: only the utterances are stored.</p>}
      </div>

      <div className="import-actions">
        <button type="button" disabled={file === null || busy || formatUsed === null} onClick={() => void previewRun()}>
          Preview
        </button>
        <button type="button" disabled={importBlocked} onClick={() => void commitRun()}>
          Import
        </button>
        {busy && (
          <button type="button" onClick={cancel}>
            Cancel
          </button>
        )}
      </div>

      {busy && (
        <div className="import-progress">
          {phase === 'importing' ? (
            <>
              <progress aria-label="Import progress" max={progress?.total ?? preview?.utterances ?? 1} value={progress?.done ?? 0} />
              <span role="status">
                {(progress?.done ?? 0).toLocaleString('en')} of {(progress?.total ?? preview?.utterances ?? 0).toLocaleString('en')} utterances
              </span>
            </>
          ) : (
            <>
              <progress aria-label="Reading progress" max={progress?.total ?? 1} value={progress?.done ?? 0} />
              <span role="status">Reading the file…</span>
            </>
          )}
        </div>
      )}

      {error !== null && (
        <p role="alert" className="error">
          {error}
        </p>
      )}

      {summary !== null && (
        <p role="status" className="import-summary">
          Stored {summary.utterances.toLocaleString('en')} utterances ({summary.tokens.toLocaleString('en')} tokens)
          {summary.annotator === null ? ' without labels' : ` with ${summary.annotator}'s labels`}.
          {summary.attached > 0 && (
            <span data-testid="import-attached">
              {' '}
              {summary.attached.toLocaleString('en')} of them were already in the project (same id, text and tokens): {summary.attached === 1 ? 'it' : 'they'} only got a layer by{' '}
              {summary.annotator}; {(summary.utterances - summary.attached).toLocaleString('en')} are new.
            </span>
          )}
          {summary.labelsAdded.slots.length + summary.labelsAdded.intents.length > 0 &&
            ` Added to the project's labels: ${[...summary.labelsAdded.slots, ...summary.labelsAdded.intents].join(', ')}.`}
        </p>
      )}

      {preview !== null && <PreviewReport preview={preview} labelsAdd={labelsAdd} onLabelsAdd={setLabelsAdd} />}
    </section>
  );
}
