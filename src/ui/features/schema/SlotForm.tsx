import { useEffect, useId, useRef, useState, type FormEvent } from 'react';
import type { ProjectSchema } from '../../../core/backup/model';
import {
  EDITOR_RESERVED_KEYS,
  keyLabel,
  keyPropose,
  schemaProblems,
  schemaProblemsOf,
  slotDraftFrom,
  slotDraftToDef,
  slotPropose,
  type SchemaField,
  type SlotDraft,
} from '../../../core/schema-edit';
import { ColourPicker } from './ColourPicker';
import { Field, GroupError } from './Field';

export interface SlotFormProps {
  schema: ProjectSchema;
  /** The slot being edited; null adds a new one. */
  index: number | null;
  onSave: (schema: ProjectSchema) => Promise<void>;
  onCancel?: () => void;
}

const RESERVED_TEXT = EDITOR_RESERVED_KEYS.filter((k) => [...k].length === 1 && !/\d/.test(k))
  .map(keyLabel)
  .join(' ');

function draftEmpty(schema: ProjectSchema): SlotDraft {
  const { colour, key } = slotPropose(schema);
  return { name: '', key: key ?? '', colour, description: '', examples: '', intents: null };
}

function schemaWith(schema: ProjectSchema, index: number | null, draft: SlotDraft): ProjectSchema {
  const def = slotDraftToDef(draft);
  const slots = index === null ? [...schema.slots, def] : schema.slots.map((s, i) => (i === index ? def : s));
  return { ...schema, slots };
}

/** Add a slot, or edit everything of one but its name (renaming rewrites the labels: see SlotRow). */
export function SlotForm({ schema, index, onSave, onCancel }: SlotFormProps) {
  const id = useId();
  const existing = index === null ? undefined : schema.slots[index];
  const [draft, setDraft] = useState<SlotDraft>(() => (existing === undefined ? draftEmpty(schema) : slotDraftFrom(existing)));
  const [keyTouched, setKeyTouched] = useState(existing !== undefined);
  const [checked, setChecked] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [attempt, setAttempt] = useState(0);
  const form = useRef<HTMLFormElement>(null);

  // After a refused save, take keyboard users to the first field that needs fixing.
  useEffect(() => {
    if (attempt === 0) return;
    form.current?.querySelector<HTMLElement>('[aria-invalid="true"], .schema-group-invalid input')?.focus();
  }, [attempt]);

  const candidate = schemaWith(schema, index, draft);
  const all = schemaProblems(candidate);
  const position = index ?? candidate.slots.length - 1;
  const mine = schemaProblemsOf(all, 'slot', position);
  const shown: Partial<Record<SchemaField, string>> = checked ? mine : {};
  const elsewhere = all.filter((p) => !(p.kind === 'slot' && p.index === position));

  function update(patch: Partial<SlotDraft>) {
    setDraft((d) => {
      const next = { ...d, ...patch };
      // Until the key is chosen by hand it follows the name, so "day" offers d.
      if (patch.name !== undefined && !keyTouched) next.key = keyPropose(schema, patch.name) ?? '';
      return next;
    });
  }

  async function submit(event: FormEvent) {
    event.preventDefault();
    setChecked(true);
    setFailure(null);
    if (Object.keys(mine).length > 0) {
      if (existing !== undefined && mine.name !== undefined) setFailure(`${mine.name} Rename the slot first.`);
      setAttempt((n) => n + 1);
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
        setDraft(draftEmpty(candidate));
        setKeyTouched(false);
        setChecked(false);
        form.current?.querySelector<HTMLElement>('input')?.focus();
      }
    } catch (error) {
      setFailure((error as Error).message);
    } finally {
      setBusy(false);
    }
  }

  const title = existing === undefined ? 'Add a slot' : `Edit slot ${existing.name}`;
  return (
    <form ref={form} className="schema-form" aria-label={title} onSubmit={(e) => void submit(e)} noValidate>
      <h4>{title}</h4>
      {existing === undefined && (
        <Field id={`${id}-name`} label="Slot name" hint="No spaces; dotted names such as area.from are fine." error={shown.name}>
          {(describedBy, invalid) => (
            <input
              id={`${id}-name`}
              value={draft.name}
              onChange={(e) => update({ name: e.target.value })}
              aria-describedby={describedBy}
              aria-invalid={invalid}
              autoComplete="off"
              spellCheck={false}
            />
          )}
        </Field>
      )}
      <Field id={`${id}-key`} label="Shortcut key" hint={`One character, pressed on the labelling screen to give the selected words this slot. Kept for the screen itself: ${RESERVED_TEXT}, digits and the arrow keys.`} error={shown.key}>
        {(describedBy, invalid) => (
          <input
            id={`${id}-key`}
            className="schema-key-input"
            value={draft.key}
            onChange={(e) => {
              setKeyTouched(true);
              update({ key: e.target.value });
            }}
            aria-describedby={describedBy}
            aria-invalid={invalid}
            autoComplete="off"
            spellCheck={false}
          />
        )}
      </Field>
      <ColourPicker id={`${id}-colour`} value={draft.colour} onChange={(colour) => update({ colour })} error={shown.colour} />
      <Field id={`${id}-description`} label="Description and guideline" hint="Shown to labellers: what belongs in this slot and what does not.">
        {(describedBy) => <textarea id={`${id}-description`} rows={3} value={draft.description} onChange={(e) => update({ description: e.target.value })} aria-describedby={describedBy} />}
      </Field>
      <Field id={`${id}-examples`} label="Examples" hint="One per line, for instance: fix the boiler in Northgate.">
        {(describedBy) => <textarea id={`${id}-examples`} rows={3} value={draft.examples} onChange={(e) => update({ examples: e.target.value })} aria-describedby={describedBy} />}
      </Field>
      <fieldset className={`schema-intents${shown.intents === undefined ? '' : ' schema-group-invalid'}`} aria-describedby={`${id}-intents-hint${shown.intents === undefined ? '' : ` ${id}-intents-error`}`}>
        <legend>Allowed with intents</legend>
        <p id={`${id}-intents-hint`} className="schema-hint">
          {schema.intents.length === 0 ? 'No intents defined yet: the slot is allowed with any intent.' : 'None ticked: allowed with any intent.'}
        </p>
        {schema.intents.map((intent) => (
          <label key={intent.name} className="schema-check">
            <input
              type="checkbox"
              checked={draft.intents?.includes(intent.name) === true}
              onChange={(e) => {
                const current = draft.intents ?? [];
                update({ intents: e.target.checked ? [...current, intent.name] : current.filter((n) => n !== intent.name) });
              }}
            />
            {intent.name}
          </label>
        ))}
        <GroupError id={`${id}-intents-error`} error={shown.intents} />
      </fieldset>
      <div className="schema-actions">
        <button type="submit" disabled={busy}>
          {existing === undefined ? 'Add slot' : 'Save slot'}
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
