import { useLiveQuery } from 'dexie-react-hooks';
import { useId, useRef, useState, type FormEvent } from 'react';
import { ANNOTATOR_ROLES, type AnnotatorRole } from '../../../core/backup/model';
import { annotatorList } from '../../../db';
import { useNav } from '../../../state/nav';
import { useSession, type Profile } from '../../../state/session';
import { appDb } from '../../app/db';
import { profileIdFromName, profileIdProblem, profileNameProblem } from './profile-id';
import './profile.css';

export interface ProfileChooserProps {
  /** Called once a profile is chosen (the label screen then shows the editor). */
  onChosen?: (profile: Profile) => void;
}

const ROLE_TEXT: Record<AnnotatorRole, string> = {
  annotator: 'Annotator: labels utterances in my own layer',
  adjudicator: 'Adjudicator: compares layers and settles the agreed labels',
};

/** Who is labelling at this browser: pick someone who already labels in this project, or enter a name. */
export function ProfileChooser({ onChosen }: ProfileChooserProps) {
  const id = useId();
  const current = useSession((s) => s.profile);
  const profileSet = useSession((s) => s.profileSet);
  const projectId = useNav((s) => s.projectId);
  const known = useLiveQuery(() => (projectId === null ? [] : annotatorList(appDb(), projectId)), [projectId]);
  const [name, setName] = useState(current?.name ?? '');
  const [profileId, setProfileId] = useState(current?.id ?? '');
  // The id follows the name until it is edited by hand.
  const [idTouched, setIdTouched] = useState(current !== null && current.id !== profileIdFromName(current.name));
  const [role, setRole] = useState<AnnotatorRole>(current?.role ?? 'annotator');
  const [checked, setChecked] = useState(false);
  const nameInput = useRef<HTMLInputElement>(null);
  const idInput = useRef<HTMLInputElement>(null);

  const nameProblem = checked ? profileNameProblem(name) : null;
  const idProblem = checked ? profileIdProblem(profileId) : null;

  function choose(profile: Profile) {
    profileSet(profile);
    onChosen?.(profile);
  }

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setChecked(true);
    // Keyboard users land on the field to fix.
    if (profileNameProblem(name) !== null) return nameInput.current?.focus();
    if (profileIdProblem(profileId) !== null) return idInput.current?.focus();
    choose({ id: profileId, name: name.trim(), role });
  }

  const people = (known ?? []).filter((a) => a.id !== current?.id);
  return (
    <div className="profile-chooser">
      {people.length > 0 && (
        <div className="profile-known">
          <p id={`${id}-known`}>People who already label in this project:</p>
          <ul aria-labelledby={`${id}-known`}>
            {people.map((a) => (
              <li key={a.id}>
                <button type="button" onClick={() => choose({ id: a.id, name: a.name, role: a.role })}>
                  Continue as {a.name === a.id ? a.id : `${a.name} (${a.id})`}
                </button>
              </li>
            ))}
          </ul>
        </div>
      )}
      <form onSubmit={submit} aria-label="Who is labelling" noValidate>
        <div className="profile-field">
          <label htmlFor={`${id}-name`}>Your name</label>
          <input
            ref={nameInput}
            id={`${id}-name`}
            value={name}
            onChange={(e) => {
              setName(e.target.value);
              if (!idTouched) setProfileId(profileIdFromName(e.target.value));
            }}
            aria-invalid={nameProblem !== null}
            aria-describedby={nameProblem === null ? undefined : `${id}-name-error`}
            autoComplete="name"
          />
          {nameProblem !== null && (
            <p id={`${id}-name-error`} className="profile-error">
              {nameProblem}
            </p>
          )}
        </div>
        <div className="profile-field">
          <label htmlFor={`${id}-id`}>Id written into your labels</label>
          <p id={`${id}-id-hint`} className="profile-hint">
            Made from your name; change it if someone else already uses it.
          </p>
          <input
            ref={idInput}
            id={`${id}-id`}
            value={profileId}
            onChange={(e) => {
              setIdTouched(true);
              setProfileId(e.target.value);
            }}
            aria-invalid={idProblem !== null}
            aria-describedby={`${id}-id-hint${idProblem === null ? '' : ` ${id}-id-error`}`}
            autoComplete="off"
            spellCheck={false}
          />
          {idProblem !== null && (
            <p id={`${id}-id-error`} className="profile-error">
              {idProblem}
            </p>
          )}
        </div>
        <fieldset className="profile-roles">
          <legend>Role</legend>
          {ANNOTATOR_ROLES.map((r) => (
            <label key={r} className="profile-role">
              <input type="radio" name={`${id}-role`} value={r} checked={role === r} onChange={() => setRole(r)} />
              {ROLE_TEXT[r]}
            </label>
          ))}
        </fieldset>
        <button type="submit">{current === null ? 'Start labelling' : 'Save who is labelling'}</button>
      </form>
    </div>
  );
}
