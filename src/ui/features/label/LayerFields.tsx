import { forwardRef, memo, useEffect, useRef, useState, type RefObject } from 'react';
import type { IntentDef, LayerStatus } from '../../../core/backup/model';
import type { EditOp, LayerEdit } from '../../../core/editing';

const STATUS_CHOICES: { value: LayerStatus; label: string }[] = [
  { value: 'draft', label: 'In progress' },
  { value: 'done', label: 'Done' },
  { value: 'skipped', label: 'Skipped' },
  { value: 'flagged', label: 'Flagged for a second look' },
];

// A pause this long in typing saves the note; leaving the field saves at once.
const NOTE_PAUSE_MS = 600;

interface LayerFieldsProps {
  edit: LayerEdit;
  /** Changes when another utterance or layer is shown, so the note field starts over. */
  layerId: string;
  intents: readonly IntentDef[];
  onEdit: (op: EditOp) => void;
  noteRef: RefObject<HTMLTextAreaElement | null>;
}

/** Intent, status and note of the layer being labelled. */
export const LayerFields = memo(
  forwardRef<HTMLSelectElement, LayerFieldsProps>(function LayerFields({ edit, layerId, intents, onEdit, noteRef }, intentRef) {
  const [note, setNote] = useState(edit.note);
  const typing = useRef<number | null>(null);
  const shown = useRef({ layerId, note: edit.note });

  // Take the stored note when another layer is shown, or when it changed (undo) while not being typed in.
  useEffect(() => {
    const focused = document.activeElement === noteRef.current;
    if (shown.current.layerId !== layerId || (!focused && typing.current === null)) setNote(edit.note);
    shown.current = { layerId, note: edit.note };
  }, [layerId, edit.note, noteRef]);

  function noteSave(value: string) {
    if (typing.current !== null) window.clearTimeout(typing.current);
    typing.current = null;
    if (value !== shown.current.note) onEdit({ kind: 'note', note: value });
  }

  const known = intents.some((i) => i.name === edit.intent);
  return (
    <div className="label-fields">
      <label>
        Intent{' '}
        <select ref={intentRef} value={edit.intent ?? ''} onChange={(e) => onEdit({ kind: 'intent', intent: e.target.value === '' ? null : e.target.value })}>
          <option value="">(none chosen)</option>
          {!known && edit.intent !== null && <option value={edit.intent}>{edit.intent} (not in the schema)</option>}
          {intents.map((intent) => (
            <option key={intent.name} value={intent.name} title={intent.description}>
              {intent.name}
            </option>
          ))}
        </select>
      </label>
      <fieldset className="label-status">
        <legend>Status</legend>
        {edit.status === 'unlabelled' && <p className="muted">Not started yet.</p>}
        {STATUS_CHOICES.map((choice) => (
          <label key={choice.value}>
            <input type="radio" name={`label-status-${layerId}`} value={choice.value} checked={edit.status === choice.value} onChange={() => onEdit({ kind: 'status', status: choice.value })} />
            {choice.label}
          </label>
        ))}
      </fieldset>
      <label className="label-note">
        Note
        <textarea
          ref={noteRef}
          rows={2}
          value={note}
          onChange={(e) => {
            const value = e.target.value;
            setNote(value);
            if (typing.current !== null) window.clearTimeout(typing.current);
            typing.current = window.setTimeout(() => noteSave(value), NOTE_PAUSE_MS);
          }}
          onBlur={(e) => noteSave(e.target.value)}
          onKeyDown={(e) => {
            // Escape leaves the note for the tokens; the note is saved on the way out.
            if (e.key === 'Escape') (e.target as HTMLTextAreaElement).blur();
          }}
        />
      </label>
    </div>
  );
}),
);
