import { useId, useState, type ChangeEvent } from 'react';
import type { ExchangeProblem } from '../../../core/exchange';
import { layersMerge, type MergeSummary } from '../../../db/exchange-repo';
import { appDb } from '../../app/db';
import { mergeSummaryText } from './team-form';

const PROBLEMS_SHOWN = 20;

type Result = { file: string } & ({ ok: true; summary: MergeSummary } | { ok: false; errors: ExchangeProblem[] } | { ok: 'failed'; message: string });

/** The lead's part: bring layer files back; each file is merged whole or not at all. */
export function MergeSection({ projectId }: { projectId: number }) {
  const id = useId();
  const [results, setResults] = useState<Result[]>([]);
  const [busy, setBusy] = useState(false);
  const [current, setCurrent] = useState<{ at: number; of: number; file: string } | null>(null);

  async function merge(event: ChangeEvent<HTMLInputElement>) {
    const input = event.target;
    const files = [...(input.files ?? [])];
    // Choosing the same files again must fire another change.
    input.value = '';
    if (files.length === 0) return;
    setBusy(true);
    const out: Result[] = [];
    setResults([]);
    for (const [at, file] of files.entries()) {
      setCurrent({ at: at + 1, of: files.length, file: file.name });
      try {
        out.push({ file: file.name, ...(await layersMerge(appDb(), projectId, await file.text())) });
      } catch (error) {
        out.push({ file: file.name, ok: 'failed', message: (error as Error).message });
      }
      // Shown file by file: each is merged whole on its own, so what is listed is in, whatever happens next.
      setResults([...out]);
    }
    setCurrent(null);
    setBusy(false);
  }

  const merged = results.filter((r): r is Result & { ok: true; summary: MergeSummary } => r.ok === true);

  return (
    <section aria-labelledby={`${id}-title`}>
      <h3 id={`${id}-title`}>Bring layers back</h3>
      <p>
        <label htmlFor={`${id}-files`}>Layer files to merge</label>{' '}
        <input id={`${id}-files`} type="file" multiple accept=".jsonl,application/x-ndjson" onChange={(e) => void merge(e)} disabled={busy} />
      </p>
      <p className="muted">
        Each file is checked first (project, checksums, utterances, token counts); a file with any problem changes nothing. Files are merged one at a time, each whole or not
        at all: if the page closes part-way, the files listed below as merged are in, and choosing the others again is safe (a file merged twice changes nothing more).
      </p>
      <div aria-live="polite">
        {busy && <p>{current === null ? 'Checking and merging…' : `Checking and merging ${current.file} (file ${current.at} of ${current.of})…`}</p>}
        {results.map((r, i) =>
          r.ok === true ? (
            <p key={i} role="status">
              {r.file}: {mergeSummaryText(r.summary)}
            </p>
          ) : null,
        )}
      </div>
      {results.map((r, i) =>
        r.ok === false ? (
          <div key={i} role="alert" className="error">
            <p>{r.file} was not merged; nothing changed:</p>
            <ul aria-label={`Problems in ${r.file}`}>
              {r.errors.slice(0, PROBLEMS_SHOWN).map((e, j) => (
                <li key={j}>
                  Line {e.line}: {e.message}
                </li>
              ))}
            </ul>
            {r.errors.length > PROBLEMS_SHOWN && <p>… and {r.errors.length - PROBLEMS_SHOWN} more.</p>}
          </div>
        ) : r.ok === 'failed' ? (
          <p key={i} role="alert" className="error">
            {r.file} could not be merged and nothing changed: {r.message}
          </p>
        ) : null,
      )}
      {merged.length > 0 && (
        <table aria-label="Merge summary">
          <thead>
            <tr>
              <th scope="col">Annotator</th>
              <th scope="col">Received</th>
              <th scope="col">Done</th>
              <th scope="col">Skipped</th>
              <th scope="col">New or newer</th>
              <th scope="col">Unchanged</th>
              <th scope="col">Older, ignored</th>
              <th scope="col">New disagreements</th>
            </tr>
          </thead>
          <tbody>
            {merged.map((r, i) => (
              <tr key={i}>
                <th scope="row">{r.summary.annotator}</th>
                <td>{r.summary.received}</td>
                <td>{r.summary.done}</td>
                <td>{r.summary.skipped}</td>
                <td>{r.summary.added + r.summary.replaced}</td>
                <td>{r.summary.unchanged}</td>
                <td>{r.summary.older.length}</td>
                <td>{r.summary.newDisagreements}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
