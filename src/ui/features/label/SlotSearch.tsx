import { useState, type KeyboardEvent } from 'react';
import type { SlotDef } from '../../../core/backup/model';
import { LabelDialog } from './LabelDialog';
import { slotsMatching } from './label-text';

interface SlotSearchProps {
  open: boolean;
  slots: readonly SlotDef[];
  onPick: (slot: string) => void;
  onClose: () => void;
}

/** The searchable slot list: type part of a name, arrows choose, Enter labels the selection. */
export function SlotSearch({ open, slots, onPick, onClose }: SlotSearchProps) {
  return (
    <LabelDialog open={open} titleId="label-slot-search-title" onClose={onClose} className="label-slot-search">
      <SlotSearchBody slots={slots} onPick={onPick} />
    </LabelDialog>
  );
}

function SlotSearchBody({ slots, onPick }: { slots: readonly SlotDef[]; onPick: (slot: string) => void }) {
  const [typed, setTyped] = useState('');
  const [active, setActive] = useState(0);
  const found = slotsMatching(slots, typed);
  const at = Math.min(active, Math.max(0, found.length - 1));

  function keys(event: KeyboardEvent<HTMLInputElement>) {
    if (event.key === 'ArrowDown' || event.key === 'ArrowUp') {
      event.preventDefault();
      const step = event.key === 'ArrowDown' ? 1 : -1;
      setActive(Math.min(found.length - 1, Math.max(0, at + step)));
    } else if (event.key === 'Enter') {
      event.preventDefault();
      const slot = found[at];
      if (slot !== undefined) onPick(slot.name);
    }
  }

  return (
    <>
      <h3 id="label-slot-search-title">Label the selection as…</h3>
      <input
        data-autofocus
        type="text"
        role="combobox"
        aria-label="Slot name"
        aria-expanded="true"
        aria-controls="label-slot-options"
        aria-activedescendant={found[at] === undefined ? undefined : `label-slot-option-${at}`}
        aria-autocomplete="list"
        value={typed}
        onChange={(e) => {
          setTyped(e.target.value);
          setActive(0);
        }}
        onKeyDown={keys}
      />
      <ul id="label-slot-options" role="listbox" aria-label="Matching slots" className="label-slot-options">
        {found.map((slot, i) => (
          <li
            key={slot.name}
            id={`label-slot-option-${i}`}
            role="option"
            aria-selected={i === at}
            className={i === at ? 'active' : undefined}
            onMouseDown={(e) => {
              e.preventDefault();
              onPick(slot.name);
            }}
          >
            {slot.name}
            {slot.key !== undefined && slot.key !== '' && <span className="muted"> (key {slot.key})</span>}
          </li>
        ))}
      </ul>
      {found.length === 0 && <p role="status">No slot matches “{typed}”.</p>}
      <p className="muted">Enter labels the selection; Escape closes.</p>
    </>
  );
}
