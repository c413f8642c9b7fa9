import { useState } from 'react';
import type { ProjectSchema } from '../../../core/backup/model';
import { intentNameProblem } from '../../../core/schema-edit';
import { intentDelete, intentRename, intentUsage } from '../../../db/schema-edit-repo';
import { appDb } from '../../app/db';
import { IntentForm } from './IntentForm';
import { NameActions } from './NameActions';
import { intentUsageText } from './schema-text';

export interface IntentRowProps {
  projectId: number;
  schema: ProjectSchema;
  index: number;
  who: string;
  onSave: (schema: ProjectSchema) => Promise<void>;
  onDone: (message: string) => void;
}

export function IntentRow({ projectId, schema, index, who, onSave, onDone }: IntentRowProps) {
  const [editing, setEditing] = useState(false);
  const intent = schema.intents[index];
  if (intent === undefined) return null;
  const others = new Set(schema.intents.map((i) => i.name));
  const slots = schema.slots.filter((s) => s.intents?.includes(intent.name) === true).map((s) => s.name);
  return (
    <li className="schema-item">
      <div className="schema-item-head">
        <span className="intent-name">{intent.name}</span>
        {slots.length > 0 && <span className="schema-meta">limits {slots.join(', ')} to it</span>}
      </div>
      {intent.description !== undefined && <p className="schema-description">{intent.description}</p>}
      {editing ? (
        <IntentForm
          schema={schema}
          index={index}
          onSave={async (next) => {
            await onSave(next);
            setEditing(false);
            onDone(`Saved intent ${intent.name}.`);
          }}
          onCancel={() => setEditing(false)}
        />
      ) : (
        <NameActions
          kind="intent"
          name={intent.name}
          nameProblem={(to) => intentNameProblem(to) ?? (others.has(to) ? `Another intent is already called ${to}.` : null)}
          usage={() => intentUsage(appDb(), projectId, intent.name)}
          usageText={intentUsageText}
          deleteEffect="those utterances are left without an intent, and slots limited to it no longer mention it."
          rename={(to) => intentRename(appDb(), projectId, intent.name, to, { who })}
          remove={() => intentDelete(appDb(), projectId, intent.name, { who })}
          onDone={onDone}
          onEdit={() => setEditing(true)}
        />
      )}
    </li>
  );
}
