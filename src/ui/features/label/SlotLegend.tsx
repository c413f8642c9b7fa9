import { memo } from 'react';
import type { SlotDef } from '../../../core/backup/model';
import { colourTint, slotColour } from './label-text';

interface SlotLegendProps {
  slots: readonly SlotDef[];
  onPick: (slot: string) => void;
  disabled: boolean;
}

/**
 * The project's slots as buttons (a click labels the selection), each with its shortcut and, on hover
 * or keyboard focus, its guideline: description and examples from the schema.
 */
export const SlotLegend = memo(function SlotLegend({ slots, onPick, disabled }: SlotLegendProps) {
  if (slots.length === 0) return <p className="muted">This project has no slots yet: add them under “Slots and intents”.</p>;
  return (
    <ul className="label-legend" aria-label="Slots">
      {slots.map((slot, i) => {
        const colour = slotColour(slots, slot.name);
        const guide = `label-guide-${i}`;
        const hasGuide = (slot.description ?? '') !== '' || (slot.examples?.length ?? 0) > 0;
        return (
          <li key={slot.name} className="label-legend-item">
            <button
              type="button"
              disabled={disabled}
              aria-describedby={hasGuide ? guide : undefined}
              style={{ background: colourTint(colour), borderBottomColor: colour }}
              onMouseDown={(e) => e.preventDefault()}
              onClick={() => onPick(slot.name)}
            >
              {slot.name}
              {slot.key !== undefined && slot.key !== '' && <kbd aria-label={`key ${slot.key}`}>{slot.key}</kbd>}
            </button>
            {hasGuide && (
              <div id={guide} role="tooltip" className="label-guide">
                {slot.description !== undefined && slot.description !== '' && <p>{slot.description}</p>}
                {(slot.examples?.length ?? 0) > 0 && <p>Examples: {slot.examples?.map((e) => `“${e}”`).join(', ')}</p>}
              </div>
            )}
          </li>
        );
      })}
    </ul>
  );
});
