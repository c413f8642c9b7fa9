import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { columnsRead, type FormatName } from '../../src/core/formats';
import { transitionsValidate } from '../../src/core/rules';
import { SCHEMES } from '../../src/core/types';
import { projectCounts, projectCreate, projectGet, type SlotsmithDb } from '../../src/db';
import { PreviewCollector } from '../../src/workers/import-preview';
import { ImportCancelledError } from '../../src/workers/import-read';
import { importCommit, importPreview, ImportRefusedError, schemaWithLabels, type ImportProgress } from '../../src/workers/import-run';
import { dbTest } from '../db/helpers';

const root = new URL('../../', import.meta.url);
const annA = readFileSync(new URL('sample-corpus/ann-a.iob2', root));
const annB = readFileSync(new URL('sample-corpus/ann-b.iob2', root));
const malformed = readFileSync(new URL('tests/fixtures/cli/malformed.iob2', root));

async function projectMake(db: SlotsmithDb, schema = { slots: [{ name: 'service' }], intents: [{ name: 'book_visit' }] }) {
  return (await projectCreate(db, { name: 'Repairs', schema })).id;
}

function request(projectId: number, format: FormatName, fileName: string, extra: { annotator?: string; column?: string } = {}) {
  return { projectId, format, fileName, ...extra };
}

/** A bigger invented column file: enough utterances for several stored chunks and stream chunks. */
function visitsFile(count: number): Blob {
  let out = '';
  for (let i = 0; i < count; i++) out += `# id = v-${i}\n# intent = book_visit\nplumber\tB-service\non\tO\nday${i}\tB-day\n\n`;
  return new Blob([out]);
}

describe('importPreview', () => {
  it('counts the sample corpus as columnsRead does, with its violations under the detected scheme', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    const preview = await importPreview(db, new Blob([annA]), request(projectId, 'columns', 'ann-a.iob2'));
    const doc = columnsRead(annA);
    let violations = 0;
    let tokens = 0;
    for (const u of doc.utterances) {
      violations += transitionsValidate(u.tags, doc.scheme).length;
      tokens += u.tokens.length;
    }
    expect(preview).toMatchObject({ format: 'columns', scheme: doc.scheme, schemeDetected: true, utterances: doc.utterances.length, tokens });
    expect(preview.violations.total).toBe(violations);
    expect(preview.malformed.total).toBe(0);
    const slots = new Set(doc.utterances.flatMap((u) => u.tags.filter((t) => t !== 'O').map((t) => t.slice(2))));
    slots.delete('service');
    expect(preview.unknownSlots.map((s) => s.name).sort()).toEqual([...slots].sort());
    const texts = doc.utterances.map((u) => u.text);
    expect(preview.duplicates.total).toBe(texts.length - new Set(texts).size);
  });

  it('lists malformed lines with their file line numbers', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    const preview = await importPreview(db, new Blob([malformed]), request(projectId, 'columns', 'malformed.iob2'));
    expect(preview.malformed.lines.map((e) => e.line)).toEqual(columnsRead(malformed).errors.map((e) => e.line));
    expect(preview.malformed.lines.map((e) => e.line)).toEqual([8, 12, 16]);
  });

  it('reports progress in bytes and stops when cancelled', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    const file = visitsFile(20_000);
    const seen: ImportProgress[] = [];
    const preview = await importPreview(db, file, request(projectId, 'columns', 'visits.iob2'), { onProgress: (p) => seen.push(p) });
    expect(preview.utterances).toBe(20_000);
    expect(seen.at(-1)).toEqual({ phase: 'reading', done: file.size, total: file.size });
    let calls = 0;
    await expect(importPreview(db, file, request(projectId, 'columns', 'visits.iob2'), { cancelled: () => ++calls > 2 })).rejects.toBeInstanceOf(ImportCancelledError);
  });
});

describe('PreviewCollector', () => {
  it('tallies violations under every scheme when detecting, and keeps the one the reader found', () => {
    const u = { text: 'a b', tokens: [{ start: 0, end: 1 }, { start: 2, end: 3 }], tags: ['I-day', 'E-day'], meta: {}, line: 3, tokenLines: [4, 5] };
    for (const scheme of SCHEMES) {
      const c = new PreviewCollector('f', 'columns', undefined, { slots: [], intents: [] });
      c.add(u);
      const preview = c.finish([], scheme);
      // Each scheme's own validator is the reference: the collector must agree with it exactly.
      expect(preview.violations.total).toBe(transitionsValidate(u.tags, scheme).length);
      expect(preview.scheme).toBe(scheme);
    }
  });

  it('counts duplicates after their first occurrence, with both lines', () => {
    const c = new PreviewCollector('f', 'text', 'iob2', { slots: [], intents: [] });
    for (const line of [1, 2, 3]) c.add({ text: line === 2 ? 'fix the tap' : 'fix the tap ', tokens: [], tags: [], meta: {}, line });
    c.add({ text: 'fix the tap', tokens: [], tags: [], meta: {}, line: 4 });
    const preview = c.finish([], 'iob2');
    expect(preview.duplicates).toEqual({ total: 2, examples: [{ text: 'fix the tap ', line: 3, firstLine: 1 }, { text: 'fix the tap', line: 4, firstLine: 2 }] });
  });
});

describe('importCommit', () => {
  it('stores the file in the named annotator layer, tags as read, and adds chosen labels to the schema', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    const preview = await importPreview(db, new Blob([annA]), request(projectId, 'columns', 'ann-a.iob2'));
    const labelsAdd = { slots: preview.unknownSlots.map((s) => s.name), intents: preview.unknownIntents.map((i) => i.name) };
    const seen: ImportProgress[] = [];
    const summary = await importCommit(
      db,
      new Blob([annA]),
      { ...request(projectId, 'columns', 'ann-a.iob2', { annotator: 'ann-a' }), total: preview.utterances, labelsAdd },
      { onProgress: (p) => seen.push(p) },
    );
    expect(summary).toMatchObject({ utterances: preview.utterances, tokens: preview.tokens, layers: preview.utterances, annotator: 'ann-a' });
    expect(seen.at(-1)).toEqual({ phase: 'storing', done: preview.utterances, total: preview.utterances });
    const counts = await projectCounts(db, projectId);
    expect(counts.utterances).toBe(preview.utterances);
    expect(counts.layers['ann-a']?.done).toBe(preview.utterances);
    const doc = columnsRead(annA);
    const firstLayer = await db.layers.where('[projectId+annotator+status]').equals([projectId, 'ann-a', 'done']).first();
    const firstRow = await db.utterances.get(firstLayer?.utteranceId ?? -1);
    const source = doc.utterances.find((u) => u.text === firstRow?.text);
    expect(firstLayer?.tags).toEqual(source?.tags);
    const schema = (await projectGet(db, projectId))?.schema;
    expect(schema?.slots.map((s) => s.name)).toEqual(['service', ...labelsAdd.slots]);
  });

  it('plain text makes utterances without layers', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    const text = new Blob(['book a plumber for Friday\n\ncancel my visit\n']);
    const summary = await importCommit(db, text, { ...request(projectId, 'text', 'u.txt'), total: 2 });
    expect(summary).toMatchObject({ utterances: 2, layers: 0, annotator: null });
    expect(await projectCounts(db, projectId)).toEqual({ utterances: 2, layers: {} });
  });

  it('refuses a malformed file and stores nothing', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    const commit = importCommit(db, new Blob([malformed]), { ...request(projectId, 'columns', 'malformed.iob2', { annotator: 'ann-a' }), total: 1 });
    await expect(commit).rejects.toBeInstanceOf(ImportRefusedError);
    expect(await db.utterances.count()).toBe(0);
    expect(await db.layers.count()).toBe(0);
    expect((await db.batches.toArray()).map((b) => b.state)).toEqual(['failed']);
  });

  it('cancelled after chunks were stored: rolls everything back, under the batch lock', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    const locks: string[] = [];
    let stored = 0;
    const commit = importCommit(
      db,
      visitsFile(20_000),
      { ...request(projectId, 'columns', 'visits.iob2', { annotator: 'ann-b' }), total: 20_000 },
      {
        onProgress: (p) => (stored = p.done),
        cancelled: () => stored >= 4000,
        lock: (name, work) => {
          locks.push(name);
          return work();
        },
      },
    );
    await expect(commit).rejects.toBeInstanceOf(ImportCancelledError);
    expect(stored).toBeGreaterThanOrEqual(4000);
    expect(await db.utterances.count()).toBe(0);
    expect(await db.layers.count()).toBe(0);
    const batches = await db.batches.toArray();
    expect(batches.map((b) => b.state)).toEqual(['cancelled']);
    // The begin lock first (see batch-cleanup.ts), then the batch's own lock.
    expect(locks).toEqual(['slotsmith-import-begin', `slotsmith-import-${batches[0]?.id}`]);
  });

  it('a second annotator’s file of the same ids adds layers to the stored utterances, not new rows', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    const idsA = new Set(columnsRead(annA).utterances.map((u) => u.id));
    const idsB = columnsRead(annB).utterances.map((u) => u.id);
    const shared = idsB.filter((id) => idsA.has(id)).length;
    expect(shared).toBeGreaterThan(0);
    await importCommit(db, new Blob([annA]), { ...request(projectId, 'columns', 'ann-a.iob2', { annotator: 'ann-a' }), total: idsA.size });
    const summary = await importCommit(db, new Blob([annB]), { ...request(projectId, 'columns', 'ann-b.iob2', { annotator: 'ann-b' }), total: idsB.length });
    expect(summary).toMatchObject({ utterances: idsB.length, layers: idsB.length, attached: shared });
    const counts = await projectCounts(db, projectId);
    expect(counts.utterances).toBe(idsA.size + idsB.length - shared);
    expect(counts.layers['ann-a']?.done).toBe(idsA.size);
    expect(counts.layers['ann-b']?.done).toBe(idsB.length);
    const perUtterance = new Map<number, number>();
    await db.layers.each((l) => perUtterance.set(l.utteranceId, (perUtterance.get(l.utteranceId) ?? 0) + 1));
    expect([...perUtterance.values()].filter((n) => n === 2).length).toBe(shared);
  });

  it('JSON Lines with "id" attach too; a changed text refuses the file and keeps the first import', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    const first = new Blob(['{"id":"j-1","text":"book a plumber","intent":"book_visit"}\n{"id":"j-2","text":"cancel my visit","intent":"cancel"}\n']);
    await importCommit(db, first, { ...request(projectId, 'jsonl', 'a.jsonl', { annotator: 'ann-a' }), total: 2 });
    const same = new Blob(['{"id":"j-2","text":"cancel my visit","intent":"cancel"}\n']);
    expect(await importCommit(db, same, { ...request(projectId, 'jsonl', 'b.jsonl', { annotator: 'ann-b' }), total: 1 })).toMatchObject({ attached: 1 });
    expect(await db.utterances.count()).toBe(2);
    const changed = new Blob(['{"id":"j-1","text":"book an electrician","intent":"book_visit"}\n']);
    const commit = importCommit(db, changed, { ...request(projectId, 'jsonl', 'c.jsonl', { annotator: 'ann-c' }), total: 1 });
    await expect(commit).rejects.toThrow(/"j-1".*"book a plumber".*"book an electrician"/);
    expect(await db.utterances.count()).toBe(2);
    expect(await db.layers.count()).toBe(3);
    expect((await db.batches.toArray()).map((b) => b.state)).toEqual(['done', 'done', 'failed']);
  });

  it('asks for an annotator when the file carries labels', async () => {
    const db = dbTest();
    const projectId = await projectMake(db);
    await expect(importCommit(db, new Blob([annA]), { ...request(projectId, 'columns', 'ann-a.iob2'), total: 1 })).rejects.toBeInstanceOf(ImportRefusedError);
    expect(await db.batches.count()).toBe(0);
  });
});

describe('schemaWithLabels', () => {
  it('appends only new names, keeping existing definitions', () => {
    const schema = { slots: [{ name: 'day', description: 'weekday' }], intents: [] };
    expect(schemaWithLabels(schema, { slots: ['day', 'area'], intents: ['cancel'] })).toEqual({
      slots: [{ name: 'day', description: 'weekday' }, { name: 'area' }],
      intents: [{ name: 'cancel' }],
    });
  });
});
