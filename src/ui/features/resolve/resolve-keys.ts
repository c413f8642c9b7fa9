/** The resolver's keyboard: one table maps keys to commands and is listed on screen as it is. */

export type ResolveCommand =
  | { kind: 'take'; side: 'a' | 'b' }
  | { kind: 'takeAll'; side: 'a' | 'b' }
  | { kind: 'step'; direction: 1 | -1 }
  | { kind: 'nextOpenUtterance' }
  | { kind: 'reasonFocus' };

export interface ResolveKeyPress {
  key: string;
  shift: boolean;
  ctrl: boolean;
  alt: boolean;
  meta: boolean;
}

interface KeyRow {
  keys: string;
  what: string;
  command: ResolveCommand;
  matches: (p: ResolveKeyPress) => boolean;
}

const letter = (p: ResolveKeyPress, key: string, shift: boolean) => !p.ctrl && !p.alt && !p.meta && p.shift === shift && p.key.toLowerCase() === key;

export const RESOLVE_KEYS: readonly KeyRow[] = [
  { keys: 'A', what: 'Take A for the current disagreement', command: { kind: 'take', side: 'a' }, matches: (p) => letter(p, 'a', false) },
  { keys: 'B', what: 'Take B for the current disagreement', command: { kind: 'take', side: 'b' }, matches: (p) => letter(p, 'b', false) },
  { keys: 'Shift+A', what: 'Take A for the whole utterance', command: { kind: 'takeAll', side: 'a' }, matches: (p) => letter(p, 'a', true) },
  { keys: 'Shift+B', what: 'Take B for the whole utterance', command: { kind: 'takeAll', side: 'b' }, matches: (p) => letter(p, 'b', true) },
  { keys: 'N or ↓', what: 'Next disagreement (on to the next utterance after the last)', command: { kind: 'step', direction: 1 }, matches: (p) => letter(p, 'n', false) || (p.key === 'ArrowDown' && !p.shift && !p.ctrl && !p.alt && !p.meta) },
  { keys: 'P or ↑', what: 'Previous disagreement', command: { kind: 'step', direction: -1 }, matches: (p) => letter(p, 'p', false) || (p.key === 'ArrowUp' && !p.shift && !p.ctrl && !p.alt && !p.meta) },
  { keys: 'U', what: 'Next utterance not yet resolved', command: { kind: 'nextOpenUtterance' }, matches: (p) => letter(p, 'u', false) },
  { keys: 'R', what: 'Write a reason for the next decision', command: { kind: 'reasonFocus' }, matches: (p) => letter(p, 'r', false) },
];

export function resolveCommandOf(p: ResolveKeyPress): ResolveCommand | null {
  return RESOLVE_KEYS.find((row) => row.matches(p))?.command ?? null;
}
