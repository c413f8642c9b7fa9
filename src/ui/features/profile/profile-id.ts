/** Labeller ids: derived from the name as typed, checked before they are written into layers. */
import { ANNOTATORS_RESERVED } from '../../../core/backup/model';

const ID_LENGTH_MAX = 64;

/** "Ana López" → "ana-lópez": lower case, spaces to hyphens, only letters, digits, `-`, `_` and `.` kept. */
export function profileIdFromName(name: string): string {
  return name
    .normalize('NFC')
    .toLowerCase()
    .trim()
    .replace(/\s+/gu, '-')
    .replace(/[^\p{L}\p{N}._-]/gu, '')
    .replace(/-{2,}/g, '-')
    .replace(/^[-.]+|[-.]+$/g, '')
    .slice(0, ID_LENGTH_MAX);
}

/**
 * Null when `id` can own layers. Stricter than the database's annotatorIdCheck (no inner spaces
 * either): the id appears in file names and column headers of exports.
 */
export function profileIdProblem(id: string): string | null {
  if (id === '') return 'An id is needed; it is derived from the name unless you change it.';
  if (/[\s\p{Cc}]/u.test(id)) return 'An id cannot contain spaces; use - or _ instead.';
  if (ANNOTATORS_RESERVED.includes(id)) return `“${id}” is kept for the ${id === 'gold' ? 'agreed labels' : 'model suggestions'}; choose another id.`;
  if (id.length > ID_LENGTH_MAX) return `An id can have at most ${ID_LENGTH_MAX} characters.`;
  return null;
}

export function profileNameProblem(name: string): string | null {
  return name.trim() === '' ? 'Please give a name.' : null;
}
