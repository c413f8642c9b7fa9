import { describe, expect, it } from 'vitest';
import { tokeniseWhitespace } from '../../src/core/tokenise';
import { BACKUP_FORMAT_VERSION } from '../../src/core/backup';
import type { Utterance } from '../../src/core/types';
import { backupMake } from '../../src/db/backup-repo';
import { projectCreate } from '../../src/db/project-repo';
import { restoreRun, type RestoreProgress } from '../../src/workers/restore-run';
import { backupSeed } from '../../e2e/backup-seed';
import { dbDump } from '../db/dump';
import { dbTest } from '../db/helpers';

const TIME = Date.UTC(2025, 4, 6, 10);

/** Invented utterances with multi-byte text (Hebrew, emoji), enough to span many stream chunks. */
function corpus(size: number): Utterance[] {
  return Array.from({ length: size }, (_, i) => {
    const text = `תקנו boiler 🔧 on day${i} call 555-01${String(i % 100).padStart(2, '0')}`;
    const tokens = tokeniseWhitespace(text);
    return { id: `hr-${i + 1}`, text, tokens, tags: ['O', 'B-service', 'O', 'O', 'B-day', 'O', 'B-contact_phone'], intent: 'book_visit', meta: {} };
  });
}

const seed = (size: number, projectName = 'Boilers') => backupSeed(corpus(size), { projectName, annotator: 'ana', time: TIME });
const body = (text: string) => text.split('\n').slice(1).join('\n');

describe('restoreRun', () => {
  it('streams a multi-chunk file and stores a project that backs up to the same lines, with byte then store progress', async () => {
    const db = dbTest({ clock: () => TIME });
    const text = seed(800);
    // One part per line: Node's Blob streams part by part, so the reader sees many chunks.
    const file = new Blob(text.split(/(?<=\n)/));
    const progress: RestoreProgress[] = [];
    const outcome = await restoreRun(db, file, (p) => progress.push(p));
    if (!outcome.ok) throw new Error(JSON.stringify(outcome.errors));
    expect(outcome).toMatchObject({ name: 'Boilers', utterances: 800, warnings: [] });
    expect(body((await backupMake(db, outcome.projectId)).parts.join(''))).toBe(body(text));
    const reading = progress.filter((p) => p.phase === 'reading');
    expect(reading.length).toBeGreaterThan(2);
    expect(reading.map((p) => p.done)).toEqual([...reading.map((p) => p.done)].sort((a, b) => a - b));
    expect(reading.every((p) => p.total === file.size)).toBe(true);
    expect(progress.slice(-2)).toEqual([
      { phase: 'storing', done: 0, total: 1 },
      { phase: 'storing', done: 1, total: 1 },
    ]);
  });

  it('gives a second copy a free name', async () => {
    const db = dbTest();
    await projectCreate(db, { name: 'Boilers (restored)' });
    const first = await restoreRun(db, new Blob([seed(3)]));
    const second = await restoreRun(db, new Blob([seed(3)]));
    expect([first, second].map((o) => (o.ok ? o.name : null))).toEqual(['Boilers', 'Boilers (restored 2)']);
  });

  it('a broken or newer file: each problem with its file line, and nothing stored', async () => {
    const db = dbTest();
    await projectCreate(db, { name: 'Already here' });
    const before = await dbDump(db);
    const lines = seed(5).split('\n');
    const broken = [...lines.slice(0, 3), '{"type":"utterance","seq":"x"', ...lines.slice(3, 6), '{"type":"layer","seq":2,"annotator":"ana","tags":"O"}', ...lines.slice(6)].join('\n');
    const refused = await restoreRun(db, new Blob([broken]));
    expect(refused.ok).toBe(false);
    if (refused.ok) return;
    expect(refused.errors[0]).toEqual({ line: 4, message: 'not valid JSON' });
    expect(refused.errors.map((e) => e.line)).toContain(8);
    const newer = [lines[0]?.replace(/"formatVersion":\d+/, '"formatVersion":99'), ...lines.slice(1)].join('\n');
    expect(newer).toContain('"formatVersion":99');
    expect(await restoreRun(db, new Blob([newer]))).toEqual({ ok: false, errors: [{ line: 1, message: `made by a newer Slotsmith (format 99); this version reads up to ${BACKUP_FORMAT_VERSION}` }] });
    expect(await restoreRun(db, new Blob(['not a backup at all\n']))).toMatchObject({ ok: false, errors: [{ line: 1 }] });
    expect(await dbDump(db)).toEqual(before);
  });

  it('a character split across two stream chunks is decoded whole', async () => {
    const db = dbTest();
    const bytes = new TextEncoder().encode(seed(2));
    // Cut inside the first emoji (a 4-byte UTF-8 sequence), as a stream chunk boundary may.
    const cut = bytes.indexOf(0xf0) + 2;
    const outcome = await restoreRun(db, new Blob([bytes.slice(0, cut), bytes.slice(cut)]));
    if (!outcome.ok) throw new Error(JSON.stringify(outcome.errors));
    expect((await db.utterances.toArray()).map((u) => u.text)).toEqual(corpus(2).map((u) => u.text));
  });
});
