/** Syntax of slot and intent names; uniqueness is the schema's concern (`schemaProblems`). */
import { slotNameIsValid } from '../schemes/tag';

export const NAME_LENGTH_MAX = 64;

// Control characters would be invisible in lists and break line-based files.
const CONTROL = /\p{Cc}/u;

/**
 * Null when `name` can name a slot. Slot names sit in tags (`B-area.from`), which column files split
 * on whitespace, so none is allowed; dotted names are fine, but not an empty part (`area..from`, `.area`).
 */
export function slotNameProblem(name: string): string | null {
  if (name === '') return 'A slot needs a name.';
  if (!slotNameIsValid(name)) return 'A slot name cannot contain spaces; use _ or . instead (for example area.from).';
  if (CONTROL.test(name)) return 'A slot name cannot contain control characters.';
  if (name.split('.').some((part) => part === '')) return 'Each part of a dotted name needs at least one character (area.from, not area. or .from).';
  if (name.length > NAME_LENGTH_MAX) return `A slot name can have at most ${NAME_LENGTH_MAX} characters.`;
  return null;
}

/**
 * Null when `name` can name an intent. Intents come from files (`# intent = …`), so inner spaces are
 * tolerated; surrounding ones are not, as they would make two names look the same.
 */
export function intentNameProblem(name: string): string | null {
  if (name.trim() === '') return 'An intent needs a name.';
  if (name.trim() !== name) return 'An intent name cannot start or end with a space.';
  if (CONTROL.test(name)) return 'An intent name cannot contain control characters.';
  if (name.length > NAME_LENGTH_MAX) return `An intent name can have at most ${NAME_LENGTH_MAX} characters.`;
  return null;
}
