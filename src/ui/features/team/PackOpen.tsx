import { useId, useState, type ChangeEvent } from 'react';
import type { ExchangeProblem } from '../../../core/exchange';
import { packOpen, type PackOpenOutcome } from '../../../db/exchange-repo';
import { appDb } from '../../app/db';

type State = { kind: 'idle' } | { kind: 'busy' } | { kind: 'opened'; outcome: Extract<PackOpenOutcome, { ok: true }> } | { kind: 'refused'; file: string; errors: ExchangeProblem[] } | { kind: 'failed'; message: string };

/** On the project list: open a pack file from the lead, as a new project or into the matching one. */
export function PackOpen({ onOpen }: { onOpen: (projectId: number) => void }) {
  const id = useId();
  const [state, setState] = useState<State>({ kind: 'idle' });

  async function open(event: ChangeEvent<HTMLInputElement>) {
    const input = event.target;
    const file = input.files?.[0];
    input.value = '';
    if (file === undefined) return;
    setState({ kind: 'busy' });
    try {
      const outcome = await packOpen(appDb(), await file.text());
      setState(outcome.ok ? { kind: 'opened', outcome } : { kind: 'refused', file: file.name, errors: outcome.errors });
    } catch (error) {
      setState({ kind: 'failed', message: (error as Error).message });
    }
  }

  return (
    <div className="pack-open">
      <label htmlFor={id}>Open a pack file</label> <input id={id} type="file" accept=".jsonl,application/x-ndjson" onChange={(e) => void open(e)} disabled={state.kind === 'busy'} />
      <div aria-live="polite">
        {state.kind === 'opened' && (
          <p role="status">
            {state.outcome.created ? 'Opened the pack as the project' : 'Added the pack to the project'} “{state.outcome.name}”: {state.outcome.count} utterances for {state.outcome.annotator}
            {state.outcome.created ? '' : ` (${state.outcome.added} new)`}.{' '}
            <button type="button" onClick={() => onOpen(state.outcome.projectId)}>
              Open “{state.outcome.name}”
            </button>
          </p>
        )}
      </div>
      {state.kind === 'refused' && (
        <div role="alert" className="error">
          <p>{state.file} was not opened; nothing was stored:</p>
          <ul aria-label="Problems in the pack file">
            {state.errors.slice(0, 20).map((e, i) => (
              <li key={i}>
                Line {e.line}: {e.message}
              </li>
            ))}
          </ul>
        </div>
      )}
      {state.kind === 'failed' && (
        <p role="alert" className="error">
          The pack could not be opened and nothing was stored: {state.message}
        </p>
      )}
    </div>
  );
}
