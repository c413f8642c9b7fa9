import { describe, expect, it } from 'vitest';
import type { SlotDef } from '../../../../src/core/backup/model';
import { keyIsReserved, keyProblem } from '../../../../src/core/schema-edit';
import { labelCommandFor, labelKeyHelp, slotKeyIsTaken, type KeyPress } from '../../../../src/ui/features/label/label-keys';

const SLOTS: SlotDef[] = [
  { name: 'day', key: 'd' },
  { name: 'area', key: 'a' },
  { name: 'time_window', key: 'D' },
  { name: 'budget' },
];

const press = (key: string, mods: Partial<KeyPress> = {}): KeyPress => ({ key, shift: false, ctrl: false, alt: false, meta: false, ...mods });

describe('labelCommandFor', () => {
  it('arrows move, shift+arrows extend', () => {
    expect(labelCommandFor(press('ArrowRight'), SLOTS)).toEqual({ kind: 'move', delta: 1, extend: false });
    expect(labelCommandFor(press('ArrowLeft', { shift: true }), SLOTS)).toEqual({ kind: 'move', delta: -1, extend: true });
    expect(labelCommandFor(press('End', { shift: true }), SLOTS)).toEqual({ kind: 'edge', to: 'last', extend: true });
  });

  it('a slot key labels in one press; the same letter with Ctrl or Alt is left to the browser', () => {
    expect(labelCommandFor(press('d'), SLOTS)).toEqual({ kind: 'label', slot: 'day' });
    expect(labelCommandFor(press('a'), SLOTS)).toEqual({ kind: 'label', slot: 'area' });
    expect(labelCommandFor(press('d', { ctrl: true }), SLOTS)).toBeNull();
    expect(labelCommandFor(press('a', { alt: true }), SLOTS)).toBeNull();
    expect(labelCommandFor(press('q'), SLOTS)).toBeNull();
  });

  it('Caps Lock (an upper-case key without Shift) still reaches a lower-case slot key; Shift does not', () => {
    const slots: SlotDef[] = [{ name: 'service', key: 'v' }, { name: 'area', key: 'g' }];
    expect(labelCommandFor(press('V'), slots)).toEqual({ kind: 'label', slot: 'service' });
    expect(labelCommandFor(press('V', { shift: true }), slots)).toBeNull();
    expect(labelCommandFor(press('g'), slots)).toEqual({ kind: 'label', slot: 'area' });
  });

  it('every one-character key the editor keeps for itself is one the slot editor refuses', () => {
    // Printable ASCII, each as typed with and without Shift: the schema and the editor must agree.
    for (let code = 0x21; code < 0x7f; code++) {
      const key = String.fromCharCode(code);
      if (keyProblem(key) !== null) continue;
      if (slotKeyIsTaken(key)) expect(keyIsReserved(key), `key ${key}`).toBe(true);
    }
  });

  it('fixed keys win over a clashing slot key, which the help marks as taken', () => {
    expect(labelCommandFor(press('D', { shift: true }), SLOTS)).toEqual({ kind: 'status', status: 'done' });
    expect(slotKeyIsTaken('D')).toBe(true);
    expect(slotKeyIsTaken('d')).toBe(false);
    expect(slotKeyIsTaken('/')).toBe(true);
    const help = labelKeyHelp(SLOTS);
    expect(help.find((r) => r.keys === 'D')?.what).toMatch(/taken/);
    expect(help.find((r) => r.keys === 'd')?.what).toBe('Label the selection as “day”');
    expect(help.some((r) => r.what.includes('budget'))).toBe(false);
  });

  it('undo, redo (both spellings), help, status and navigation keys', () => {
    expect(labelCommandFor(press('z', { ctrl: true }), SLOTS)).toEqual({ kind: 'undo' });
    expect(labelCommandFor(press('Z', { ctrl: true, shift: true }), SLOTS)).toEqual({ kind: 'redo' });
    expect(labelCommandFor(press('y', { meta: true }), SLOTS)).toEqual({ kind: 'redo' });
    expect(labelCommandFor(press('?', { shift: true }), SLOTS)).toEqual({ kind: 'help' });
    expect(labelCommandFor(press('/'), SLOTS)).toEqual({ kind: 'slotSearch' });
    expect(labelCommandFor(press(']'), SLOTS)).toEqual({ kind: 'utterance', to: 'next' });
    expect(labelCommandFor(press('N', { shift: true }), SLOTS)).toEqual({ kind: 'utterance', to: 'nextUnlabelled' });
    expect(labelCommandFor(press('Backspace'), SLOTS)).toEqual({ kind: 'remove' });
  });

  it('every command of the table is listed in the help, each with words', () => {
    const help = labelKeyHelp([]);
    expect(help.length).toBeGreaterThanOrEqual(17);
    for (const row of help) expect(row.what.length).toBeGreaterThan(5);
  });
});

describe('suggestion keys', () => {
  it('Shift+A / Shift+R act on one suggestion, Shift+Y / Shift+X on all; without Shift they stay slot keys', () => {
    const slots: SlotDef[] = [{ name: 'area', key: 'a' }, { name: 'day', key: 'y' }];
    expect(labelCommandFor(press('A', { shift: true }), slots)).toEqual({ kind: 'suggestion', act: 'accept', all: false });
    expect(labelCommandFor(press('R', { shift: true }), slots)).toEqual({ kind: 'suggestion', act: 'reject', all: false });
    expect(labelCommandFor(press('Y', { shift: true }), slots)).toEqual({ kind: 'suggestion', act: 'accept', all: true });
    expect(labelCommandFor(press('X', { shift: true }), slots)).toEqual({ kind: 'suggestion', act: 'reject', all: true });
    expect(labelCommandFor(press('a'), slots)).toEqual({ kind: 'label', slot: 'area' });
    expect(labelCommandFor(press('y'), slots)).toEqual({ kind: 'label', slot: 'day' });
    // Ctrl+Y stays redo.
    expect(labelCommandFor(press('y', { ctrl: true }), slots)).toEqual({ kind: 'redo' });
  });

  it('the help overlay lists the four suggestion keys, and no two commands share a key', () => {
    const help = labelKeyHelp([]);
    for (const keys of ['Shift+A', 'Shift+R', 'Shift+Y', 'Shift+X']) expect(help.find((r) => r.keys === keys)?.what).toMatch(/suggestion/);
    const letters = 'ABCDEFGHIJKLMNOPQRSTUVWXYZ'.split('');
    for (const letter of letters) {
      const hits = help.filter((r) => r.keys.split(/ \/ | or /).includes(`Shift+${letter}`));
      expect(hits.length).toBeLessThanOrEqual(1);
    }
  });
});
