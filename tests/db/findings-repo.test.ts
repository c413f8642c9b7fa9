import { describe, expect, it } from 'vitest';
import { InvalidInputError, RecordMissingError } from '../../src/db/errors';
import { findingsDismiss, findingsDismissed, findingsRestore } from '../../src/db/findings-repo';
import { projectModel, projectModelSave } from '../../src/db/model-repo';
import { projectCreate, projectRename } from '../../src/db/project-repo';
import { CLOCK_START, dbTest } from './helpers';

// Keys as the core builds them (src/core/error-detect/key.ts): JSON text of the kind and content.
const KEY_A = JSON.stringify(['variation', ['on', 'friday']]);
const KEY_B = JSON.stringify(['slot-outlier', 'monday', 'time_window']);

describe('findings-repo', () => {
  it('remembers dismissals per project, keeps the first time and author, and restores them', async () => {
    const db = dbTest();
    const one = await projectCreate(db, { name: 'Boiler jobs' });
    const two = await projectCreate(db, { name: 'Gutter jobs' });
    expect(await findingsDismissed(db, one.id)).toEqual({});

    const first = await findingsDismiss(db, one.id, [KEY_A], 'lead');
    expect(Object.keys(first)).toEqual([KEY_A]);
    expect(first[KEY_A]?.who).toBe('lead');
    const when = first[KEY_A]?.when ?? 0;
    expect(when).toBeGreaterThanOrEqual(CLOCK_START);

    // A second dismissal of the same key changes nothing about it; a new key joins it.
    const second = await findingsDismiss(db, one.id, [KEY_A, KEY_B], null);
    expect(second[KEY_A]).toEqual({ when, who: 'lead' });
    expect(second[KEY_B]?.who).toBeNull();
    expect(await findingsDismissed(db, one.id)).toEqual(second);
    expect(await findingsDismissed(db, two.id)).toEqual({});

    const restored = await findingsRestore(db, one.id, [KEY_A, 'never dismissed']);
    expect(Object.keys(restored)).toEqual([KEY_B]);
    expect(Object.keys(await findingsDismissed(db, one.id))).toEqual([KEY_B]);
  });

  it('touches no other field of the project row, and leaves no field behind when all are restored', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Boiler jobs' });
    await projectModelSave(db, project.id, { json: '{"x":1}', origin: 'file', crossValidation: null });
    const before = await db.projects.get(project.id);
    await findingsDismiss(db, project.id, [KEY_A], 'lead');
    const during = await db.projects.get(project.id);
    expect({ ...during, dismissed: undefined }).toEqual({ ...before, dismissed: undefined });
    // Other writers of the row (rename, the model) keep the dismissals.
    await projectRename(db, project.id, 'Boiler and tap jobs');
    await projectModelSave(db, project.id, null);
    expect(Object.keys(await findingsDismissed(db, project.id))).toEqual([KEY_A]);
    expect(await projectModel(db, project.id)).toBeNull();
    await findingsRestore(db, project.id, [KEY_A]);
    const after = await db.projects.get(project.id);
    expect(after !== undefined && 'dismissed' in after).toBe(false);
  });

  it('refuses a missing project and an empty key', async () => {
    const db = dbTest();
    const project = await projectCreate(db, { name: 'Boiler jobs' });
    await expect(findingsDismissed(db, 999)).rejects.toBeInstanceOf(RecordMissingError);
    await expect(findingsDismiss(db, 999, [KEY_A], null)).rejects.toBeInstanceOf(RecordMissingError);
    await expect(findingsRestore(db, 999, [KEY_A])).rejects.toBeInstanceOf(RecordMissingError);
    await expect(findingsDismiss(db, project.id, [''], null)).rejects.toBeInstanceOf(InvalidInputError);
    expect(await findingsDismissed(db, project.id)).toEqual({});
  });
});
