/**
 * The span editor's keyboard: one table turns key presses into commands, and the help overlay lists
 * the same table, so the two never disagree. Slot shortcut keys come from the project schema.
 * Commands use keys no one-key slot shortcut is likely to take (arrows, punctuation, shift+letter).
 */
import type { LayerStatus, SlotDef } from '../../../core/backup/model';
import { keyNormalise } from '../../../core/schema-edit/keys';

export type LabelCommand =
  | { kind: 'move'; delta: number; extend: boolean }
  | { kind: 'edge'; to: 'first' | 'last'; extend: boolean }
  | { kind: 'label'; slot: string }
  | { kind: 'slotSearch' }
  | { kind: 'remove' }
  | { kind: 'collapse' }
  | { kind: 'utterance'; to: 'next' | 'previous' | 'nextUnlabelled' }
  | { kind: 'status'; status: LayerStatus }
  | { kind: 'intentFocus' }
  | { kind: 'noteFocus' }
  | { kind: 'suggestion'; act: 'accept' | 'reject'; all: boolean }
  | { kind: 'undo' }
  | { kind: 'redo' }
  | { kind: 'help' };

export interface KeyPress {
  key: string;
  shift: boolean;
  ctrl: boolean;
  alt: boolean;
  meta: boolean;
}

interface FixedKey {
  keys: string;
  what: string;
  matches: (p: KeyPress) => boolean;
  command: (p: KeyPress) => LabelCommand;
}

const plain = (p: KeyPress) => !p.ctrl && !p.alt && !p.meta;
// Ctrl on Linux and Windows, Cmd on macOS.
const mod = (p: KeyPress) => (p.ctrl || p.meta) && !p.alt;

const FIXED: readonly FixedKey[] = [
  { keys: '← / →', what: 'Move to the previous / next token', matches: (p) => plain(p) && !p.shift && (p.key === 'ArrowLeft' || p.key === 'ArrowRight'), command: (p) => ({ kind: 'move', delta: p.key === 'ArrowLeft' ? -1 : 1, extend: false }) },
  { keys: 'Shift+← / Shift+→', what: 'Extend the selection by one token', matches: (p) => plain(p) && p.shift && (p.key === 'ArrowLeft' || p.key === 'ArrowRight'), command: (p) => ({ kind: 'move', delta: p.key === 'ArrowLeft' ? -1 : 1, extend: true }) },
  { keys: 'Home / End', what: 'Go to the first / last token (with Shift: select up to it)', matches: (p) => plain(p) && (p.key === 'Home' || p.key === 'End'), command: (p) => ({ kind: 'edge', to: p.key === 'Home' ? 'first' : 'last', extend: p.shift }) },
  { keys: 'Delete / Backspace', what: 'Remove the labels under the selection', matches: (p) => plain(p) && (p.key === 'Delete' || p.key === 'Backspace'), command: () => ({ kind: 'remove' }) },
  { keys: '/', what: 'Open the slot list: type to search, Enter labels the selection', matches: (p) => plain(p) && p.key === '/', command: () => ({ kind: 'slotSearch' }) },
  { keys: 'Escape', what: 'Shrink the selection to one token (or close an open panel)', matches: (p) => plain(p) && p.key === 'Escape', command: () => ({ kind: 'collapse' }) },
  { keys: ']', what: 'Next utterance', matches: (p) => plain(p) && p.key === ']', command: () => ({ kind: 'utterance', to: 'next' }) },
  { keys: '[', what: 'Previous utterance', matches: (p) => plain(p) && p.key === '[', command: () => ({ kind: 'utterance', to: 'previous' }) },
  { keys: 'Shift+N', what: 'Next utterance you have not started', matches: (p) => plain(p) && p.shift && p.key.toUpperCase() === 'N', command: () => ({ kind: 'utterance', to: 'nextUnlabelled' }) },
  { keys: 'Shift+D', what: 'Mark as done', matches: (p) => plain(p) && p.shift && p.key.toUpperCase() === 'D', command: () => ({ kind: 'status', status: 'done' }) },
  { keys: 'Shift+S', what: 'Mark as skipped', matches: (p) => plain(p) && p.shift && p.key.toUpperCase() === 'S', command: () => ({ kind: 'status', status: 'skipped' }) },
  { keys: 'Shift+F', what: 'Mark as flagged (needs a second look)', matches: (p) => plain(p) && p.shift && p.key.toUpperCase() === 'F', command: () => ({ kind: 'status', status: 'flagged' }) },
  { keys: 'Shift+I', what: 'Go to the intent choice', matches: (p) => plain(p) && p.shift && p.key.toUpperCase() === 'I', command: () => ({ kind: 'intentFocus' }) },
  { keys: 'Shift+T', what: 'Go to the note', matches: (p) => plain(p) && p.shift && p.key.toUpperCase() === 'T', command: () => ({ kind: 'noteFocus' }) },
  { keys: 'Shift+A', what: 'Accept the model suggestion at the selection (or the next one after it)', matches: (p) => plain(p) && p.shift && p.key.toUpperCase() === 'A', command: () => ({ kind: 'suggestion', act: 'accept', all: false }) },
  { keys: 'Shift+R', what: 'Reject the model suggestion at the selection (or the next one after it)', matches: (p) => plain(p) && p.shift && p.key.toUpperCase() === 'R', command: () => ({ kind: 'suggestion', act: 'reject', all: false }) },
  { keys: 'Shift+Y', what: 'Accept every model suggestion of this utterance (“yes to all”)', matches: (p) => plain(p) && p.shift && p.key.toUpperCase() === 'Y', command: () => ({ kind: 'suggestion', act: 'accept', all: true }) },
  { keys: 'Shift+X', what: 'Reject every model suggestion of this utterance', matches: (p) => plain(p) && p.shift && p.key.toUpperCase() === 'X', command: () => ({ kind: 'suggestion', act: 'reject', all: true }) },
  { keys: 'Ctrl+Z', what: 'Undo the last edit (in any utterance)', matches: (p) => mod(p) && !p.shift && p.key.toLowerCase() === 'z', command: () => ({ kind: 'undo' }) },
  { keys: 'Ctrl+Shift+Z or Ctrl+Y', what: 'Redo the last undone edit', matches: (p) => mod(p) && ((p.shift && p.key.toLowerCase() === 'z') || (!p.shift && p.key.toLowerCase() === 'y')), command: () => ({ kind: 'redo' }) },
  { keys: '?', what: 'Show this list of keys', matches: (p) => !p.ctrl && !p.alt && !p.meta && p.key === '?', command: () => ({ kind: 'help' }) },
];

/** The command for a key press, or null (the browser keeps its default). Fixed keys win over slot keys. */
export function labelCommandFor(press: KeyPress, slots: readonly SlotDef[]): LabelCommand | null {
  const fixed = FIXED.find((f) => f.matches(press));
  if (fixed !== undefined) return fixed.command(press);
  if (!plain(press)) return null;
  const usable = slots.filter((s) => s.key !== undefined && s.key !== '');
  // Keys are unique regardless of case (see keyNormalise), so Caps Lock (an upper-case key without
  // Shift) still reaches a lower-case slot key; an exact match wins.
  const slot = usable.find((s) => s.key === press.key) ?? (press.shift ? undefined : usable.find((s) => keyNormalise(s.key ?? '') === keyNormalise(press.key)));
  return slot === undefined ? null : { kind: 'label', slot: slot.name };
}

/** A slot key the editor cannot use because a fixed key takes it (the help overlay says so). */
export function slotKeyIsTaken(key: string): boolean {
  const press = { key, shift: key !== key.toLowerCase(), ctrl: false, alt: false, meta: false };
  return FIXED.some((f) => f.matches(press));
}

export interface KeyHelpRow {
  keys: string;
  what: string;
}

/** Every key, for the help overlay: the fixed ones, then each slot with a shortcut. */
export function labelKeyHelp(slots: readonly SlotDef[]): KeyHelpRow[] {
  const rows: KeyHelpRow[] = FIXED.map(({ keys, what }) => ({ keys, what }));
  for (const slot of slots) {
    if (slot.key === undefined || slot.key === '') continue;
    const taken = slotKeyIsTaken(slot.key);
    rows.push({ keys: slot.key, what: taken ? `Slot “${slot.name}”: this key is taken by a command above; use the slot list (/)` : `Label the selection as “${slot.name}”` });
  }
  return rows;
}
