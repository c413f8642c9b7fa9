import { useState } from 'react';
import type { AnnotatorRole } from '../../../core/backup/model';
import { useSession } from '../../../state/session';

/**
 * Stand-in until the profile feature's chooser lands in the registry (`profileChooser`); it only sets
 * the session profile, the same way.
 */
export function TemporaryProfileChooser({ onChosen }: { onChosen?: () => void }) {
  const profileSet = useSession((s) => s.profileSet);
  const [id, setId] = useState('');
  const [role, setRole] = useState<AnnotatorRole>('annotator');
  const trimmed = id.trim();
  return (
    <form
      className="row-form"
      onSubmit={(e) => {
        e.preventDefault();
        if (trimmed === '') return;
        profileSet({ id: trimmed, name: trimmed, role });
        onChosen?.();
      }}
    >
      <label>
        Your annotator id <input value={id} onChange={(e) => setId(e.target.value)} />
      </label>
      <label>
        Role{' '}
        <select value={role} onChange={(e) => setRole(e.target.value as AnnotatorRole)}>
          <option value="annotator">Annotator</option>
          <option value="adjudicator">Adjudicator</option>
        </select>
      </label>
      <button type="submit" disabled={trimmed === ''}>
        Start labelling
      </button>
    </form>
  );
}
