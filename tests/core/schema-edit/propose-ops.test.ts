import { describe, expect, it } from 'vitest';
import type { ProjectSchema } from '../../../src/core/backup/model';
import {
  colourPropose,
  intentDraftToDef,
  keyPropose,
  OKABE_ITO,
  schemaIntentDelete,
  schemaIntentRename,
  schemaNamesDropped,
  schemaProblems,
  schemaSlotDelete,
  schemaSlotRename,
  slotDraftFrom,
  slotDraftToDef,
  slotPropose,
} from '../../../src/core/schema-edit';

const intents = [{ name: 'book_visit' }, { name: 'reschedule' }, { name: 'cancel' }];

describe('proposals for a new slot', () => {
  it('gives each of the first eight slots its own colour, then the least used one', () => {
    let schema: ProjectSchema = { slots: [], intents };
    const colours: string[] = [];
    for (let i = 0; i < 9; i++) {
      const colour = colourPropose(schema);
      colours.push(colour);
      schema = { ...schema, slots: [...schema.slots, { name: `slot${i}`, colour }] };
    }
    expect(new Set(colours.slice(0, 8)).size).toBe(8);
    expect(colours[8]).toBe(OKABE_ITO[0]?.hex);
    // A colour freed in the middle is proposed before any repeat.
    const freed = { ...schema, slots: schema.slots.filter((s) => s.colour !== OKABE_ITO[3]?.hex || s.name !== 'slot3') };
    expect(colourPropose(freed)).toBe(OKABE_ITO[3]?.hex);
  });

  it('proposes a key from the name when free, skipping reserved and taken keys', () => {
    const schema: ProjectSchema = { slots: [{ name: 'day', key: 'd' }, { name: 'area', key: 'A' }], intents };
    // d is taken, a is taken (any case), y is reserved: next letter of the name... none left, so the alphabet.
    expect(keyPropose(schema, 'day')).toBe('b');
    expect(keyPropose(schema, 'service')).toBe('s');
    expect(keyPropose(schema, 'budget')).toBe('b');
    expect(keyPropose(schema, 'Phone')).toBe('h');
    expect(slotPropose(schema, 'time_window')).toEqual({ colour: OKABE_ITO[0]?.hex, key: 't' });
  });

  it('returns null once every letter is used, and proposals never clash', () => {
    let schema: ProjectSchema = { slots: [], intents };
    for (let i = 0; i < 30; i++) {
      const { key, colour } = slotPropose(schema, `slot${i}`);
      schema = { ...schema, slots: [...schema.slots, { name: `slot${i}`, colour, ...(key !== null && { key }) }] };
      expect(schemaProblems(schema)).toEqual([]);
    }
    // 26 letters less the five reserved ones (z, y, n, p, u).
    expect(schema.slots.filter((s) => s.key !== undefined)).toHaveLength(21);
    expect(keyPropose(schema, 'zzz')).toBeNull();
  });
});

describe('schema renames and deletes', () => {
  const schema: ProjectSchema = {
    slots: [
      { name: 'area', key: 'a', intents: ['book_visit'] },
      { name: 'day', intents: ['book_visit', 'reschedule'] },
      { name: 'service' },
    ],
    intents,
  };

  it('renames a slot in place and deletes one', () => {
    expect(schemaSlotRename(schema, 'area', 'area.from').slots.map((s) => s.name)).toEqual(['area.from', 'day', 'service']);
    expect(schemaSlotRename(schema, 'area', 'area.from').slots[0]).toEqual({ name: 'area.from', key: 'a', intents: ['book_visit'] });
    expect(schemaSlotDelete(schema, 'day').slots.map((s) => s.name)).toEqual(['area', 'service']);
    expect(schemaNamesDropped(schema, schemaSlotDelete(schema, 'day'))).toEqual({ slots: ['day'], intents: [] });
  });

  it('renames an intent in the slots’ allowed lists too', () => {
    const renamed = schemaIntentRename(schema, 'book_visit', 'book');
    expect(renamed.intents.map((i) => i.name)).toEqual(['book', 'reschedule', 'cancel']);
    expect(renamed.slots.map((s) => s.intents)).toEqual([['book'], ['book', 'reschedule'], undefined]);
    expect(schemaProblems(renamed)).toEqual([]);
  });

  it('deletes an intent from the allowed lists, dropping a list it empties (any intent)', () => {
    const deleted = schemaIntentDelete(schema, 'book_visit');
    expect(deleted.intents.map((i) => i.name)).toEqual(['reschedule', 'cancel']);
    expect(deleted.slots).toEqual([{ name: 'area', key: 'a' }, { name: 'day', intents: ['reschedule'] }, { name: 'service' }]);
    expect(schemaProblems(deleted)).toEqual([]);
  });
});

describe('drafts', () => {
  it('round-trip a full slot and leave empty fields out', () => {
    const slot = { name: 'area', key: 'a', colour: '#56B4E9', description: 'Where the visit is.', examples: ['fix the boiler in Northgate', 'a plumber near Eastfield'], intents: ['book_visit'] };
    expect(slotDraftToDef(slotDraftFrom(slot))).toEqual(slot);
    const draft = { name: ' day ', key: '', colour: '#56b4e9', description: '  ', examples: '\n on Friday \r\n\n', intents: [] };
    expect(slotDraftToDef(draft)).toEqual({ name: 'day', colour: '#56B4E9', examples: ['on Friday'] });
    expect(intentDraftToDef({ name: 'cancel', description: '' })).toEqual({ name: 'cancel' });
  });
});
