import { useLiveQuery } from 'dexie-react-hooks';
import { useEffect, useRef, useState } from 'react';
import type { ProjectSchema } from '../../../core/backup/model';
import { projectGet } from '../../../db';
import { schemaSave } from '../../../db/schema-edit-repo';
import { useSession } from '../../../state/session';
import { appDb } from '../../app/db';
import type { ProjectViewProps } from '../../app/project-views';
import { IntentForm } from './IntentForm';
import { IntentRow } from './IntentRow';
import { SlotForm } from './SlotForm';
import { SlotRow } from './SlotRow';
import './schema.css';

// Renames made before anyone chose a profile still need a name in the edit history.
const WHO_UNKNOWN = 'unknown';

/** "Slots and intents": the project's labels, their keys, colours and guidelines. */
export function SchemaView({ projectId }: ProjectViewProps) {
  const project = useLiveQuery(() => projectGet(appDb(), projectId), [projectId]);
  const who = useSession((s) => s.profile?.id ?? WHO_UNKNOWN);
  const [message, setMessage] = useState<{ text: string; focus: boolean } | null>(null);
  const status = useRef<HTMLParagraphElement>(null);

  // A finished rename or delete removes the controls that had focus; the result takes it instead.
  useEffect(() => {
    if (message?.focus === true) status.current?.focus();
  }, [message]);

  if (project === undefined) return <p>Loading…</p>;
  const schema = project.schema;
  const save = async (next: ProjectSchema) => {
    await schemaSave(appDb(), projectId, next);
  };
  const done = (text: string) => setMessage({ text, focus: true });
  // Adding keeps focus in the add form, ready for the next one.
  const added = (text: string) => setMessage({ text, focus: false });

  return (
    <section aria-labelledby="schema-title" className="schema">
      <h2 id="schema-title">Slots and intents: {project.name}</h2>
      <p className="muted">
        Labellers see these names, keys, colours and guidelines while they work. Renaming or deleting one that is in use changes every layer of the project at
        once, and tells you how many labels first.
      </p>
      {message !== null && (
        <p role="status" className="schema-status" tabIndex={-1} ref={status}>
          {message.text}
        </p>
      )}
      <section aria-labelledby="slots-title">
        <h3 id="slots-title">Slots ({schema.slots.length})</h3>
        {schema.slots.length === 0 ? (
          <p className="muted">No slots yet. Add the first one below.</p>
        ) : (
          <ul className="schema-list" aria-label="Slots">
            {schema.slots.map((slot, i) => (
              <SlotRow key={slot.name} projectId={projectId} schema={schema} index={i} who={who} onSave={save} onDone={done} />
            ))}
          </ul>
        )}
        <SlotForm
          schema={schema}
          index={null}
          onSave={async (next) => {
            await save(next);
            added(`Added slot ${next.slots[next.slots.length - 1]?.name ?? ''}.`);
          }}
        />
      </section>
      <section aria-labelledby="intents-title">
        <h3 id="intents-title">Intents ({schema.intents.length})</h3>
        {schema.intents.length === 0 ? (
          <p className="muted">No intents yet. Add the first one below.</p>
        ) : (
          <ul className="schema-list" aria-label="Intents">
            {schema.intents.map((intent, i) => (
              <IntentRow key={intent.name} projectId={projectId} schema={schema} index={i} who={who} onSave={save} onDone={done} />
            ))}
          </ul>
        )}
        <IntentForm
          schema={schema}
          index={null}
          onSave={async (next) => {
            await save(next);
            added(`Added intent ${next.intents[next.intents.length - 1]?.name ?? ''}.`);
          }}
        />
      </section>
    </section>
  );
}
