import { OKABE_ITO } from '../../../core/schema-edit';
import { GroupError } from './Field';

export interface ColourPickerProps {
  id: string;
  value: string;
  onChange: (hex: string) => void;
  error?: string | undefined;
}

/** The eight colour-blind-safe colours as radio buttons: arrow keys move between them, each named in words. */
export function ColourPicker({ id, value, onChange, error }: ColourPickerProps) {
  const errorId = `${id}-error`;
  return (
    <fieldset className={`swatches${error === undefined ? '' : ' schema-group-invalid'}`} aria-describedby={error === undefined ? undefined : errorId}>
      <legend>Colour</legend>
      {OKABE_ITO.map((c) => (
        <label key={c.hex} className="swatch">
          <input type="radio" name={id} value={c.hex} checked={value.toUpperCase() === c.hex} onChange={() => onChange(c.hex)} />
          <span className="swatch-chip" style={{ background: c.hex }} aria-hidden="true" />
          {c.name}
        </label>
      ))}
      <GroupError id={errorId} error={error} />
    </fieldset>
  );
}
