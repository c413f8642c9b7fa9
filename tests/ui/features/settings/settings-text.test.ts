import { describe, expect, it } from 'vitest';
import { backupProjectName, bytesText, readErrorText, restoreNameFree, storagePersistText, storageUsageText } from '../../../../src/ui/features/settings/settings-text';

describe('settings texts', () => {
  it('shows sizes in binary units', () => {
    expect(bytesText(512)).toBe('512 bytes');
    expect(bytesText(1536)).toBe('1.5 KiB');
    expect(bytesText(3 * 1024 ** 3)).toBe('3.0 GiB');
  });

  it('states usage, quota and persistence plainly, and admits when unknown', () => {
    expect(storageUsageText({ persisted: null, usage: 1024 * 1024, quota: 4 * 1024 * 1024 })).toBe('1.0 MiB used of 4.0 MiB this browser allows (25.0 %).');
    expect(storageUsageText({ persisted: null, usage: null, quota: null })).toBe('This browser does not say how much space is used.');
    expect(storagePersistText(true)).toMatch(/^Kept/);
    expect(storagePersistText(false)).toMatch(/may clear this data/);
    expect(storagePersistText(null)).toMatch(/does not say/);
  });

  it('gives a restored copy a free name', () => {
    expect(restoreNameFree('Boiler jobs', new Set(['Other']))).toBe('Boiler jobs');
    expect(restoreNameFree('Boiler jobs', new Set(['Boiler jobs']))).toBe('Boiler jobs (restored)');
    expect(restoreNameFree('Boiler jobs', new Set(['Boiler jobs', 'Boiler jobs (restored)']))).toBe('Boiler jobs (restored 2)');
  });

  it('numbers file problems by line', () => {
    expect(readErrorText({ line: 3, message: '"seq" is missing' })).toBe('Line 3: "seq" is missing');
  });
});

describe('backupProjectName', () => {
  it('reads the name from the project record on the second line, else gives up quietly', () => {
    const header = '{"format":"slotsmith-backup","formatVersion":1}';
    expect(backupProjectName(`${header}\n{"type":"project","name":"Boiler jobs"}\n{"type":"utterance"}\n`)).toBe('Boiler jobs');
    expect(backupProjectName(`${header}\n{"type":"project","name":"Last line"}`)).toBe('Last line');
    expect(backupProjectName(`${header}\n{"type":"utterance","name":"x"}\n`)).toBeUndefined();
    expect(backupProjectName(`${header}\nnot json\n`)).toBeUndefined();
    expect(backupProjectName(header)).toBeUndefined();
  });
});
