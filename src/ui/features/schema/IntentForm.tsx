import { useId, useState, type FormEvent } from 'react';
import type { ProjectSchema } from '../../../core/backup/model';
import { intentDraftFrom, intentDraftToDef, schemaProblems, schemaProblemsOf, type IntentDraft } from '../../../core/schema-edit';
import { Field } from './Field';

export interface IntentFormProps {
  schema: ProjectSchema;
  /** The intent being edited; null adds a new one. */
  index: number | null;
  onSave: (schema: ProjectSchema) => Promise<void>;
  onCancel?: () => void;
}

/** Add an intent, or edit its description (renaming rewrites the labels: see IntentRow). */
export function IntentForm({ schema, index, onSave, onCancel }: IntentFormProps) {
  const id = useId();
  const existing = index === null ? undefined : schema.intents[index];
  const [draft, setDraft] = useState<IntentDraft>(() => (existing === undefined ? { name: '', description: '' } : intentDraftFrom(existing)));
  const [checked, setChecked] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const def = intentDraftToDef(draft);
  const candidate: ProjectSchema = { ...schema, intents: index === null ? [...schema.intents, def] : schema.intents.map((d, i) => (i === index ? def : d)) };
  const position = index ?? candidate.intents.length - 1;
  const all = schemaProblems(candidate);
  const mine = schemaProblemsOf(all, 'intent', position);
  const elsewhere = all.filter((p) => !(p.kind === 'intent' && p.index === position));

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    setChecked(true);
    setFailure(null);
    if (mine.name !== undefined) {
      // An existing name is changed by renaming; say so instead of pointing at a field that is not here.
      if (existing !== undefined) setFailure(`${mine.name} Rename the intent first.`);
      form.querySelector<HTMLElement>('input')?.focus();
      return;
    }
    if (elsewhere[0] !== undefined) {
      setFailure(`Another entry needs fixing first: ${elsewhere[0].message}`);
      return;
    }
    setBusy(true);
    try {
      await onSave(candidate);
      if (index === null) {
        setDraft({ name: '', description: '' });
        setChecked(false);
        form.querySelector<HTMLElement>('input')?.focus();
      }
    } catch (error) {
      setFailure((error as Error).message);
    } finally {
      setBusy(false);
    }
  }

  const title = existing === undefined ? 'Add an intent' : `Edit intent ${existing.name}`;
  return (
    <form className="schema-form" aria-label={title} onSubmit={(e) => void submit(e)} noValidate>
      <h4>{title}</h4>
      {existing === undefined && (
        <Field id={`${id}-name`} label="Intent name" hint="What the person wants, for example book_visit." error={checked ? mine.name : undefined}>
          {(describedBy, invalid) => (
            <input id={`${id}-name`} value={draft.name} onChange={(e) => setDraft({ ...draft, name: e.target.value })} aria-describedby={describedBy} aria-invalid={invalid} autoComplete="off" spellCheck={false} />
          )}
        </Field>
      )}
      <Field id={`${id}-description`} label="Description and guideline" hint="Shown to labellers: when to choose this intent.">
        {(describedBy) => <textarea id={`${id}-description`} rows={2} value={draft.description} onChange={(e) => setDraft({ ...draft, description: e.target.value })} aria-describedby={describedBy} />}
      </Field>
      <div className="schema-actions">
        <button type="submit" disabled={busy}>
          {existing === undefined ? 'Add intent' : 'Save intent'}
        </button>
        {onCancel !== undefined && (
          <button type="button" onClick={onCancel}>
            Cancel
          </button>
        )}
      </div>
      {failure !== null && (
        <p role="alert" className="error">
          {failure}
        </p>
      )}
    </form>
  );
}
