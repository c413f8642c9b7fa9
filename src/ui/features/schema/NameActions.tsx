import { useEffect, useId, useRef, useState, type FormEvent } from 'react';
import type { SchemaEditReport, SchemaUsage } from '../../../db/schema-edit-repo';

export interface NameActionsProps {
  /** "slot" or "intent", in the wording. */
  kind: string;
  name: string;
  /** Null when `to` may be used, else why not. */
  nameProblem: (to: string) => string | null;
  usage: () => Promise<SchemaUsage>;
  usageText: (usage: SchemaUsage) => string;
  /** What deleting does to the labels, after "Delete slot day?". */
  deleteEffect: string;
  rename: (to: string) => Promise<SchemaEditReport>;
  remove: () => Promise<SchemaEditReport>;
  onDone: (message: string) => void;
  onEdit?: () => void;
}

type Step =
  | { kind: 'idle' }
  | { kind: 'rename-form' }
  | { kind: 'counting' }
  | { kind: 'confirm-rename'; to: string; usage: SchemaUsage }
  | { kind: 'confirm-delete'; usage: SchemaUsage }
  | { kind: 'working' };

/** Rename and delete, each asking first with the number of labels it changes. */
export function NameActions({ kind, name, nameProblem, usage, usageText, deleteEffect, rename, remove, onDone, onEdit }: NameActionsProps) {
  const id = useId();
  const [step, setStep] = useState<Step>({ kind: 'idle' });
  const [to, setTo] = useState(name);
  const [problem, setProblem] = useState<string | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const renameButton = useRef<HTMLButtonElement>(null);
  const deleteButton = useRef<HTMLButtonElement>(null);
  // The button to return focus to once a rename or delete is cancelled or refused.
  const focusBack = useRef<'rename' | 'delete' | null>(null);
  const setFocusBack = (which: 'rename' | 'delete') => {
    focusBack.current = which;
  };

  useEffect(() => {
    if (step.kind !== 'idle' || focusBack.current === null) return;
    (focusBack.current === 'rename' ? renameButton : deleteButton).current?.focus();
    focusBack.current = null;
  }, [step.kind]);

  async function count(next: (u: SchemaUsage) => Step) {
    setStep({ kind: 'counting' });
    try {
      setStep(next(await usage()));
    } catch (error) {
      setFailure((error as Error).message);
      setStep({ kind: 'idle' });
      setFocusBack('delete');
    }
  }

  function renameCheck(event: FormEvent) {
    event.preventDefault();
    const trimmed = to.trim();
    const issue = trimmed === name ? `That is already the ${kind}'s name.` : nameProblem(trimmed);
    setProblem(issue);
    if (issue === null) void count((u) => ({ kind: 'confirm-rename', to: trimmed, usage: u }));
  }

  async function run(action: () => Promise<SchemaEditReport>, done: (r: SchemaEditReport) => string) {
    setStep({ kind: 'working' });
    setFailure(null);
    try {
      const report = await action();
      setStep({ kind: 'idle' });
      onDone(done(report));
    } catch (error) {
      setFailure((error as Error).message);
      setStep({ kind: 'idle' });
      setFocusBack(step.kind === 'confirm-delete' ? 'delete' : 'rename');
    }
  }

  const cancel = () => {
    setFocusBack(step.kind === 'confirm-delete' ? 'delete' : 'rename');
    setStep({ kind: 'idle' });
    setProblem(null);
  };

  return (
    <div className="name-actions">
      {(step.kind === 'idle' || step.kind === 'counting') && (
        <div className="schema-actions">
          {onEdit !== undefined && (
            <button type="button" onClick={onEdit} aria-label={`Edit ${kind} ${name}`}>
              Edit
            </button>
          )}
          <button
            ref={renameButton}
            type="button"
            aria-label={`Rename ${kind} ${name}`}
            onClick={() => {
              setTo(name);
              setFailure(null);
              setStep({ kind: 'rename-form' });
            }}
          >
            Rename
          </button>
          <button
            ref={deleteButton}
            type="button"
            aria-label={`Delete ${kind} ${name}`}
            disabled={step.kind === 'counting'}
            onClick={() => {
              setFailure(null);
              void count((u) => ({ kind: 'confirm-delete', usage: u }));
            }}
          >
            Delete
          </button>
          {step.kind === 'counting' && <span role="status">Counting the labels…</span>}
        </div>
      )}
      {step.kind === 'rename-form' && (
        <form className="row-form" onSubmit={renameCheck} noValidate>
          <label htmlFor={`${id}-to`}>New name for {kind} {name}</label>
          <input
            id={`${id}-to`}
            value={to}
            onChange={(e) => setTo(e.target.value)}
            aria-invalid={problem !== null}
            aria-describedby={problem === null ? undefined : `${id}-to-error`}
            autoComplete="off"
            spellCheck={false}
            autoFocus
          />
          <button type="submit">Continue</button>
          <button type="button" onClick={cancel}>
            Cancel
          </button>
          {problem !== null && (
            <p id={`${id}-to-error`} className="schema-field-error">
              {problem}
            </p>
          )}
        </form>
      )}
      {step.kind === 'confirm-rename' && (
        <div role="alertdialog" aria-labelledby={`${id}-confirm`} className="confirm">
          <p id={`${id}-confirm`}>
            Rename {kind} {name} to {step.to}? This changes {usageText(step.usage)}, in one step; each changed layer keeps the old version in its edit history.
          </p>
          <button type="button" onClick={() => void run(() => rename(step.to), (r) => `Renamed ${kind} ${name} to ${step.to}: ${usageText(r)} changed.`)}>
            Rename everywhere
          </button>
          <button type="button" onClick={cancel} autoFocus>
            Keep the old name
          </button>
        </div>
      )}
      {step.kind === 'confirm-delete' && (
        <div role="alertdialog" aria-labelledby={`${id}-confirm`} className="confirm">
          <p id={`${id}-confirm`}>
            Delete {kind} {name}? {step.usage.layers === 0 ? `No labels use it.` : `This affects ${usageText(step.usage)}: ${deleteEffect}`}
          </p>
          <button type="button" onClick={() => void run(remove, (r) => `Deleted ${kind} ${name}${r.layers === 0 ? '' : `: ${usageText(r)} changed`}.`)}>
            Delete {kind}
          </button>
          <button type="button" onClick={cancel} autoFocus>
            Keep it
          </button>
        </div>
      )}
      {step.kind === 'working' && <p role="status">Rewriting the labels…</p>}
      {failure !== null && (
        <p role="alert" className="error">
          {failure}
        </p>
      )}
    </div>
  );
}
