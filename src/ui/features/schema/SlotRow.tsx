import { useState } from 'react';
import type { ProjectSchema, SlotDef } from '../../../core/backup/model';
import { keyLabel, paletteColourOf, paletteTextOn, slotNameProblem } from '../../../core/schema-edit';
import { slotDelete, slotRename, slotUsage } from '../../../db/schema-edit-repo';
import { appDb } from '../../app/db';
import { NameActions } from './NameActions';
import { slotUsageText } from './schema-text';
import { SlotForm } from './SlotForm';

export interface SlotRowProps {
  projectId: number;
  schema: ProjectSchema;
  index: number;
  who: string;
  onSave: (schema: ProjectSchema) => Promise<void>;
  onDone: (message: string) => void;
}

/** The slot's name on its colour: the name is always written out, so colour is never the only cue. */
export function SlotChip({ slot }: { slot: SlotDef }) {
  const colour = slot.colour === undefined ? undefined : paletteColourOf(slot.colour);
  const style = colour === undefined ? undefined : { background: colour.hex, color: paletteTextOn(colour.hex) };
  return (
    <span className={`slot-chip${colour === undefined ? ' slot-chip-plain' : ''}`} style={style}>
      {slot.name}
    </span>
  );
}

/** One slot: what annotators see of it, and edit, rename and delete. */
export function SlotRow({ projectId, schema, index, who, onSave, onDone }: SlotRowProps) {
  const [editing, setEditing] = useState(false);
  const slot = schema.slots[index];
  if (slot === undefined) return null;
  const colour = slot.colour === undefined ? undefined : paletteColourOf(slot.colour);
  const others = new Set(schema.slots.map((s) => s.name));
  return (
    <li className="schema-item">
      <div className="schema-item-head">
        <SlotChip slot={slot} />
        <span className="schema-meta">
          {slot.key === undefined ? 'no key' : <>key <kbd>{keyLabel(slot.key)}</kbd></>}
          {colour === undefined ? '' : ` · ${colour.name}`}
          {` · ${slot.intents === undefined ? 'any intent' : `only with ${slot.intents.join(', ')}`}`}
        </span>
      </div>
      {slot.description !== undefined && <p className="schema-description">{slot.description}</p>}
      {slot.examples !== undefined && (
        <ul className="schema-examples" aria-label={`Examples for ${slot.name}`}>
          {slot.examples.map((e, i) => (
            <li key={i}>{e}</li>
          ))}
        </ul>
      )}
      {editing ? (
        <SlotForm
          schema={schema}
          index={index}
          onSave={async (next) => {
            await onSave(next);
            setEditing(false);
            onDone(`Saved slot ${slot.name}.`);
          }}
          onCancel={() => setEditing(false)}
        />
      ) : (
        <NameActions
          kind="slot"
          name={slot.name}
          nameProblem={(to) => slotNameProblem(to) ?? (others.has(to) ? `Another slot is already called ${to}.` : null)}
          usage={() => slotUsage(appDb(), projectId, slot.name)}
          usageText={slotUsageText}
          deleteEffect="those words become unlabelled (O) in every layer."
          rename={(to) => slotRename(appDb(), projectId, slot.name, to, { who })}
          remove={() => slotDelete(appDb(), projectId, slot.name, { who })}
          onDone={onDone}
          onEdit={() => setEditing(true)}
        />
      )}
    </li>
  );
}
