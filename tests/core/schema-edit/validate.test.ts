import { describe, expect, it } from 'vitest';
import type { ProjectSchema } from '../../../src/core/backup/model';
import { intentNameProblem, schemaProblems, schemaProblemsOf, slotNameProblem } from '../../../src/core/schema-edit';

const intents = [{ name: 'book_visit' }, { name: 'reschedule' }, { name: 'ask_price' }];

describe('slot names', () => {
  it('accepts plain and dotted names', () => {
    for (const name of ['area', 'area.from', 'time_window', 'contact_phone', 'área', 'day-part']) expect(slotNameProblem(name)).toBeNull();
  });

  it('refuses empty names, whitespace, control characters and empty dotted parts', () => {
    expect(slotNameProblem('')).toMatch(/needs a name/);
    expect(slotNameProblem('time window')).toMatch(/spaces/);
    expect(slotNameProblem('area\tfrom')).toMatch(/spaces/);
    // U+00A0 no-break space is whitespace to \s too (ECMAScript WhiteSpace includes USP, Zs).
    expect(slotNameProblem('area\u00a0from')).toMatch(/spaces/);
    expect(slotNameProblem('area\u0007')).toMatch(/control/);
    for (const name of ['area.', '.area', 'area..from']) expect(slotNameProblem(name)).toMatch(/dotted/);
    expect(slotNameProblem('a'.repeat(65))).toMatch(/at most 64/);
  });

  it('intent names may hold inner spaces but not surrounding ones', () => {
    expect(intentNameProblem('book visit')).toBeNull();
    expect(intentNameProblem(' book_visit')).toMatch(/start or end/);
    expect(intentNameProblem('  ')).toMatch(/needs a name/);
  });
});

describe('whole schema', () => {
  it('finds nothing wrong in a sound schema, including slots without key or colour', () => {
    const schema: ProjectSchema = {
      slots: [
        { name: 'area.from', key: 'a', colour: '#E69F00', intents: ['book_visit'] },
        { name: 'area.to', key: 'W', colour: '#e69f00' },
        { name: 'service' },
      ],
      intents,
    };
    expect(schemaProblems(schema)).toEqual([]);
  });

  it('ties each problem to the slot and field it belongs to', () => {
    const schema: ProjectSchema = {
      slots: [
        { name: 'day', key: 'k', colour: '#123456' },
        { name: 'day', key: 'K' },
        { name: 'area', key: 'z', intents: ['book_visit', 'book_visit', 'haggle'] },
        { name: 'budget', key: 'bb' },
      ],
      intents: [...intents, { name: 'reschedule' }],
    };
    const problems = schemaProblems(schema);
    expect(problems.map((p) => [p.kind, p.index, p.field])).toEqual([
      ['slot', 0, 'colour'],
      ['slot', 1, 'name'],
      ['slot', 1, 'key'],
      ['slot', 2, 'key'],
      ['slot', 2, 'intents'],
      ['slot', 2, 'intents'],
      ['slot', 3, 'key'],
      ['intent', 3, 'name'],
    ]);
    // Keys compare without case: K clashes with k.
    expect(schemaProblemsOf(problems, 'slot', 1)).toEqual({ name: 'Another slot is already called day.', key: 'The key “K” already labels day.' });
    expect(schemaProblemsOf(problems, 'slot', 2).key).toMatch(/kept for the labelling screen/);
    expect(schemaProblemsOf(problems, 'slot', 2).intents).toMatch(/listed twice/);
    expect(schemaProblemsOf(problems, 'slot', 3).key).toMatch(/one visible character/);
    expect(schemaProblemsOf(problems, 'intent', 3).name).toMatch(/already called reschedule/);
  });
});
