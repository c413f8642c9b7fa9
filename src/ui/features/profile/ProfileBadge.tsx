import { useEffect, useId, useRef, useState } from 'react';
import { useSession } from '../../../state/session';
import { BlindToggle } from './BlindToggle';
import { ProfileChooser } from './ProfileChooser';
import './profile.css';

/**
 * Who is labelling, in the header of every screen. Choosing opens an inline panel, not a modal:
 * no screen waits for a profile except the label screen, which shows the chooser itself.
 */
export function ProfileBadge() {
  const id = useId();
  const profile = useSession((s) => s.profile);
  const blind = useSession((s) => s.blind);
  const [open, setOpen] = useState(false);
  const toggle = useRef<HTMLButtonElement>(null);
  const panel = useRef<HTMLDivElement>(null);
  const wasOpen = useRef(false);

  // Opening moves focus into the panel; closing returns it to the button that opened it.
  useEffect(() => {
    if (open) panel.current?.querySelector<HTMLElement>('input')?.focus();
    else if (wasOpen.current) toggle.current?.focus();
    wasOpen.current = open;
  }, [open]);

  const summary =
    profile === null ? 'No labeller chosen' : `Labelling as ${profile.name} (${profile.id}, ${profile.role})${blind ? ', blind mode on' : ''}`;
  return (
    <div className="profile-badge">
      <p className="profile-summary">
        {summary}
      </p>
      <button ref={toggle} type="button" aria-expanded={open} aria-controls={`${id}-panel`} onClick={() => setOpen(!open)}>
        {profile === null ? 'Choose who is labelling' : 'Change who is labelling'}
      </button>
      {open && (
        <div
          id={`${id}-panel`}
          ref={panel}
          role="region"
          aria-label="Who is labelling"
          className="profile-panel"
          onKeyDown={(e) => {
            if (e.key === 'Escape') setOpen(false);
          }}
        >
          <ProfileChooser onChosen={() => setOpen(false)} />
          {profile !== null && <BlindToggle />}
          <button type="button" onClick={() => setOpen(false)}>
            Close
          </button>
        </div>
      )}
    </div>
  );
}
