import { useState } from 'react';
import type { ProjectSchema } from '../../../core/backup/model';

interface Props {
  schema: ProjectSchema;
  range: { from: number; to: number } | null;
  intent: string | null;
  disabled: boolean;
  onLabel: (slot: string | null) => void;
  onIntent: (intent: string | null) => void;
}

/** Edit the gold draft by hand: label or clear the selected tokens, or set the intent. */
export function EditPanel({ schema, range, intent, disabled, onLabel, onIntent }: Props) {
  const [slot, setSlot] = useState(schema.slots[0]?.name ?? '');
  const [intentChoice, setIntentChoice] = useState<string>(intent ?? '');
  const where = range === null ? 'no tokens selected (click a token in the table; Shift+click extends)' : `tokens ${range.from + 1}-${range.to + 1} selected`;
  return (
    <fieldset className="resolve-edit">
      <legend>Edit the gold layer yourself</legend>
      <p>{where}</p>
      <div className="row-form">
        <label>
          Slot{' '}
          <select value={slot} onChange={(e) => setSlot(e.target.value)}>
            {schema.slots.map((s) => (
              <option key={s.name} value={s.name}>
                {s.name}
              </option>
            ))}
          </select>
        </label>
        <button type="button" disabled={disabled || range === null || slot === ''} onClick={() => onLabel(slot)}>
          Label the selected tokens
        </button>
        <button type="button" disabled={disabled || range === null} onClick={() => onLabel(null)}>
          Clear the selected tokens
        </button>
      </div>
      <div className="row-form">
        <label>
          Gold intent{' '}
          <select value={intentChoice} onChange={(e) => setIntentChoice(e.target.value)}>
            <option value="">none</option>
            {schema.intents.map((i) => (
              <option key={i.name} value={i.name}>
                {i.name}
              </option>
            ))}
          </select>
        </label>
        <button type="button" disabled={disabled} onClick={() => onIntent(intentChoice === '' ? null : intentChoice)}>
          Set the gold intent
        </button>
      </div>
    </fieldset>
  );
}
