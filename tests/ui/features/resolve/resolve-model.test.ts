import { describe, expect, it } from 'vitest';
import { transitionsValidate } from '../../../../src/core/rules';
import { resolveCommandOf, RESOLVE_KEYS } from '../../../../src/ui/features/resolve/resolve-keys';
import {
  decisionEdit,
  decisionIntent,
  decisionTake,
  decisionTakeAll,
  itemNextOpen,
  regionText,
  resolveModel,
  tokenRegions,
  type GoldChange,
  type ResolveInput,
} from '../../../../src/ui/features/resolve/resolve-model';

// "book plumber friday morning in Eastbrook": A and B differ on the time and on the area, and on the intent.
const WORDS = ['book', 'plumber', 'friday', 'morning', 'in', 'Eastbrook'];
const INPUT: ResolveInput = {
  length: 6,
  scheme: 'iob2',
  a: { tags: ['O', 'B-service', 'B-day', 'B-time_window', 'O', 'B-area'], intent: 'book_visit' },
  b: { tags: ['O', 'B-service', 'B-day', 'I-day', 'O', 'O'], intent: 'reschedule' },
  gold: undefined,
  names: { a: 'ann-a', b: 'ann-b' },
};

/** The stored gold after a change, as layerSave would keep it. */
function stored(change: GoldChange, revision: number): ResolveInput['gold'] {
  return { ...change, revision };
}

describe('resolveModel and decisions', () => {
  it('lists each disputed region then the intent, all open, with the agreed spans as the draft', () => {
    const model = resolveModel(INPUT);
    expect(model.items.map((i) => [i.key, i.decided])).toEqual([
      ['tokens 3-4', false],
      ['tokens 6-6', false],
      ['intent', false],
    ]);
    expect(model.spans).toEqual([{ start: 1, end: 2, slot: 'service' }]);
    expect(model.intent).toBeNull();
    expect(model.revision).toBe(0);
    expect(tokenRegions(model.diff)).toEqual([0, 0, 1, 1, 0, 2]);
    expect(regionText(model.items[0]?.region?.a ?? [], WORDS)).toBe('day “friday”, time_window “morning”');
    expect(regionText(model.items[1]?.region?.b ?? [], WORDS)).toBe('no label');
  });

  it('settles one disagreement per decision, keeps the reason in the note, and is done once all are settled', () => {
    let input = INPUT;
    const first = decisionTake(resolveModel(input), resolveModel(input).items[0] as never, 'b', 'one phrase for the time');
    expect(first).toEqual({
      tags: ['O', 'B-service', 'B-day', 'I-day', 'O', 'O'],
      intent: null,
      note: 'tokens 3-4: took ann-b (one phrase for the time)',
      status: 'draft',
    });
    input = { ...input, gold: stored(first, 1) };
    let model = resolveModel(input);
    expect(model.items.map((i) => i.decided)).toEqual([true, false, false]);
    expect(itemNextOpen(model.items, 0)).toBe(1);
    const second = decisionTake(model, model.items[1] as never, 'a');
    input = { ...input, gold: stored(second, 2) };
    model = resolveModel(input);
    const third = decisionTake(model, model.items[2] as never, 'b');
    expect(third).toMatchObject({ tags: ['O', 'B-service', 'B-day', 'I-day', 'O', 'B-area'], intent: 'reschedule', status: 'done' });
    expect(third.note.split('\n')).toEqual(['tokens 3-4: took ann-b (one phrase for the time)', 'tokens 6-6: took ann-a', 'intent: took ann-b']);
    expect(itemNextOpen(resolveModel({ ...input, gold: stored(third, 3) }).items, 2)).toBe(-1);
  });

  it('takes one side for the whole utterance: exactly that layer, re-encoded, and its intent', () => {
    const all = decisionTakeAll(resolveModel(INPUT), 'a');
    expect(all).toMatchObject({ tags: INPUT.a.tags, intent: 'book_visit', status: 'done' });
    // A stray I-X in B comes out as legal IOB2.
    const stray = { ...INPUT, b: { tags: ['O', 'I-service', 'O', 'I-day', 'O', 'O'], intent: 'reschedule' } };
    const fromB = decisionTakeAll(resolveModel(stray), 'b');
    expect(fromB.tags).toEqual(['O', 'B-service', 'O', 'B-day', 'O', 'O']);
    expect(transitionsValidate(fromB.tags, 'iob2')).toEqual([]);
  });

  it('an edit settles the regions it touches; a hand-set intent settles the intent', () => {
    const model = resolveModel(INPUT);
    const edit = decisionEdit(model, 2, 4, 'time_window', 'whole phrase is a time');
    expect(edit.tags).toEqual(['O', 'B-service', 'B-time_window', 'I-time_window', 'O', 'O']);
    expect(edit.note).toBe('tokens 3-4: labelled tokens 3-4 as time_window (whole phrase is a time)');
    const cleared = decisionEdit(resolveModel({ ...INPUT, gold: stored(edit, 1) }), 5, 6, null);
    expect(cleared.note.split('\n')[1]).toBe('tokens 6-6: cleared tokens 6-6');
    const intent = decisionIntent(resolveModel({ ...INPUT, gold: stored(cleared, 2) }), 'cancel');
    expect(intent).toMatchObject({ intent: 'cancel', status: 'done' });
  });

  it('counts every disagreement settled once the gold layer is done, however it was made', () => {
    const gold = { tags: ['O', 'O', 'O', 'O', 'O', 'O'], intent: null, note: '', status: 'done' as const, revision: 4 };
    const model = resolveModel({ ...INPUT, gold });
    expect(model.decided).toBe(3);
    expect(model.spans).toEqual([]);
  });
});

describe('resolver keys', () => {
  const press = (key: string, shift = false) => resolveCommandOf({ key, shift, ctrl: false, alt: false, meta: false });
  it('maps the listed keys to their commands and leaves modified keys alone', () => {
    expect(press('a')).toEqual({ kind: 'take', side: 'a' });
    expect(press('B', true)).toEqual({ kind: 'takeAll', side: 'b' });
    expect(press('n')).toEqual({ kind: 'step', direction: 1 });
    expect(press('ArrowUp')).toEqual({ kind: 'step', direction: -1 });
    expect(resolveCommandOf({ key: 'a', shift: false, ctrl: true, alt: false, meta: false })).toBeNull();
    expect(new Set(RESOLVE_KEYS.map((k) => k.keys)).size).toBe(RESOLVE_KEYS.length);
  });
});
