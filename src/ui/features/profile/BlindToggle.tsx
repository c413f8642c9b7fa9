import { useId } from 'react';
import { useSession } from '../../../state/session';

/** Blind mode on or off, with one line saying what it hides. */
export function BlindToggle() {
  const id = useId();
  const blind = useSession((s) => s.blind);
  const blindSet = useSession((s) => s.blindSet);
  return (
    <div className="blind-toggle">
      <input id={id} type="checkbox" checked={blind} onChange={(e) => blindSet(e.target.checked)} aria-describedby={`${id}-what`} />
      <label htmlFor={id}>Blind mode</label>
      <p id={`${id}-what`} className="profile-hint">
        Hides other people’s labels, gold and model suggestions while you label, so they do not sway you.
      </p>
    </div>
  );
}
