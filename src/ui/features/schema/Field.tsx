import type { ReactNode } from 'react';

export interface FieldProps {
  id: string;
  label: string;
  /** Shown under the label, tied to the control by aria-describedby. */
  hint?: string;
  error?: string | undefined;
  children: (describedBy: string | undefined, invalid: boolean) => ReactNode;
}

/** Label, control, hint and an inline error next to the control it belongs to. */
export function Field({ id, label, hint, error, children }: FieldProps) {
  const hintId = hint === undefined ? undefined : `${id}-hint`;
  const errorId = error === undefined ? undefined : `${id}-error`;
  const describedBy = [hintId, errorId].filter((x) => x !== undefined).join(' ') || undefined;
  return (
    <div className="schema-field">
      <label htmlFor={id}>{label}</label>
      {hint !== undefined && (
        <p id={hintId} className="schema-hint">
          {hint}
        </p>
      )}
      {children(describedBy, error !== undefined)}
      {error !== undefined && (
        <p id={errorId} className="schema-field-error">
          {error}
        </p>
      )}
    </div>
  );
}

/** A field error for a group of controls (fieldset), announced with the group. */
export function GroupError({ id, error }: { id: string; error?: string | undefined }) {
  if (error === undefined) return null;
  return (
    <p id={id} className="schema-field-error">
      {error}
    </p>
  );
}
