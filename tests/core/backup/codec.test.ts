import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { backupDecode, backupEncode, backupLines, backupReader, BACKUP_FORMAT_VERSION, type BackupData } from '../../../src/core/backup';
import { chunksCut, cutsArbitrary } from '../../generators/formats';
import { backupDataArbitrary } from './arbitraries';

const CREATED = '2025-03-14T09:30:00.000Z';

const small: BackupData = {
  project: { name: 'Boiler jobs', created: 1, updated: 2, tokeniser: { kind: 'words' }, scheme: 'iob2', schema: { slots: [{ name: 'day', key: 'd' }], intents: [{ name: 'book_visit' }] } },
  annotators: [{ id: 'ana', name: 'Ana', role: 'annotator' }],
  batches: [{ fileName: 'visits.iob', format: 'columns', annotator: 'ana', layerStatus: 'done', counts: { utterances: 2, tokens: 5, layers: 2 }, warnings: [], state: 'done', created: 3, finished: 4 }],
  utterances: [
    { seq: 1, text: 'fix tap Friday', tokens: [0, 3, 4, 7, 8, 14], meta: {}, batch: 1, line: 1 },
    // A lone surrogate: JSON.stringify escapes it (ECMAScript 2019 well-formed JSON.stringify), so it survives.
    { seq: 2, text: 'call \ud83d 555-0142', tokens: [0, 4, 7, 15], externalId: 'hr-2', meta: { source: 'phone' }, batch: 1 },
  ],
  layers: [
    { seq: 1, annotator: 'ana', tags: ['O', 'I-problem', 'B-day'], intent: 'book_visit', status: 'done', note: '', revision: 1, updated: 5, batch: 1 },
    { seq: 2, annotator: 'gold', tags: ['O', 'B-contact_phone'], intent: null, status: 'draft', note: 'check number', revision: 3, updated: 6 },
  ],
  history: [{ seq: 2, annotator: 'gold', before: null, after: { tags: ['O', 'O'], intent: null, status: 'draft', note: '', revision: 1, updated: 5 }, who: 'cy', when: 5 }],
};

function lines(data: BackupData): string[] {
  return [...backupLines(data, CREATED)];
}

function decodeOk(text: string): BackupData {
  const result = backupDecode(text);
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return result.data;
}

describe('backup codec', () => {
  it('round-trips random projects (emoji, RTL, illegal tags) to equal data and identical bytes', () => {
    fc.assert(
      fc.property(backupDataArbitrary, (data) => {
        const text = backupEncode(data, CREATED);
        const result = backupDecode(text);
        expect(result).toEqual({ ok: true, data, warnings: [] });
        expect(backupEncode(decodeOk(text), CREATED)).toBe(text);
      }),
      { seed: 42, numRuns: 150 },
    );
  });

  it('reads a backup pushed in pieces of any size exactly as in one piece', () => {
    fc.assert(
      fc.property(
        backupDataArbitrary.chain((data) => {
          const text = backupEncode(data, CREATED);
          return fc.tuple(fc.constant(text), cutsArbitrary(text.length));
        }),
        ([text, cuts]) => {
          const reader = backupReader();
          for (const piece of chunksCut(text, cuts)) reader.push(piece);
          expect(reader.end()).toEqual(backupDecode(text));
        },
      ),
      { seed: 42, numRuns: 60 },
    );
  });

  it('writes a header line with the format, version and record counts, then one record per line', () => {
    const [header, ...records] = lines(small);
    expect(JSON.parse(header ?? '')).toEqual({ format: 'slotsmith-backup', formatVersion: 2, created: CREATED, counts: { annotators: 1, batches: 1, utterances: 2, layers: 2, history: 1 } });
    expect(records.map((r) => (JSON.parse(r) as { type: string }).type)).toEqual(['project', 'annotator', 'batch', 'utterance', 'utterance', 'layer', 'layer', 'history']);
    expect(records[3]).toBe('{"type":"utterance","seq":1,"text":"fix tap Friday","tokens":[0,3,4,7,8,14],"meta":{},"batch":1,"line":1}');
    expect(backupEncode(small, CREATED).endsWith('}\n')).toBe(true);
    expect(decodeOk(backupEncode(small, CREATED)).utterances[1]?.text).toBe('call \ud83d 555-0142');
  });

  it('refuses a backup from a newer Slotsmith with a clear message', () => {
    const [header, ...rest] = lines(small);
    const newer = [JSON.stringify({ ...JSON.parse(header ?? ''), formatVersion: BACKUP_FORMAT_VERSION + 1 }), ...rest, '{"type":"hologram"}'].join('\n');
    expect(backupDecode(newer)).toEqual({ ok: false, errors: [{ line: 1, message: 'made by a newer Slotsmith (format 3); this version reads up to 2' }] });
  });

  it.each([
    ['an empty file', ''],
    ['a JSON Lines corpus', '{"text":"fix the tap","intent":"book_visit"}\n'],
    ['an IOB file', '# text = fix tap\nfix\tO\n'],
    ['a header of another format', '{"format":"other-backup","formatVersion":1}\n'],
  ])('says %s is not a Slotsmith backup', (_what, text) => {
    const result = backupDecode(text);
    expect(result.ok).toBe(false);
    expect(!result.ok && result.errors).toEqual([{ line: 1, message: 'not a Slotsmith backup: the first line must be a "slotsmith-backup" header' }]);
  });

  it('detects a truncated file by the header counts', () => {
    const cut = lines(small).slice(0, -2).join('\n');
    const result = backupDecode(cut);
    expect(!result.ok && result.errors.map((e) => e.message)).toEqual([
      'the backup is incomplete or altered: its header lists 2 layers, the file holds 1',
      'the backup is incomplete or altered: its header lists 1 history, the file holds 0',
    ]);
  });

  it('accepts CRLF line ends, a byte order mark and blank lines', () => {
    const text = `\ufeff${lines(small).join('\r\n')}\r\n\r\n`;
    expect(backupDecode(text)).toEqual({ ok: true, data: small, warnings: [] });
  });

  it('restores leniently: defaults for missing optional fields, warnings for bad optional ones', () => {
    const [header = '', project = '', annotator = '', batch = '', u1 = '', u2 = '', , l2 = '', h1 = ''] = lines(small);
    const edit = (line: string, change: (o: Record<string, unknown>) => void) => {
      const o = JSON.parse(line) as Record<string, unknown>;
      change(o);
      return JSON.stringify(o);
    };
    const text = [
      edit(header, (o) => delete o.counts),
      edit(project, (o) => {
        o.scheme = 'iob9';
        o.extra = 'ignored';
        delete o.schema;
      }),
      edit(annotator, (o) => delete o.name),
      batch,
      edit(u1, (o) => {
        o.meta = { template: 'a', bad: 7 };
        o.line = -3;
      }),
      u2,
      edit(l2, (o) => {
        delete o.note;
        o.status = 'pondering';
      }),
      h1,
    ].join('\n');
    const result = backupDecode(text);
    if (!result.ok) throw new Error(JSON.stringify(result.errors));
    expect(result.data.project).toMatchObject({ scheme: 'iob2', schema: { slots: [], intents: [] } });
    expect(result.data.annotators).toEqual([{ id: 'ana', name: 'ana', role: 'annotator' }]);
    expect(result.data.utterances[0]).toMatchObject({ meta: { template: 'a' } });
    expect(result.data.utterances[0]?.line).toBeUndefined();
    expect(result.data.layers).toHaveLength(1);
    expect(result.data.layers[0]).toMatchObject({ status: 'draft', note: '' });
    // Each warning names its file line; the data itself is kept.
    expect(result.warnings).toEqual([
      { line: 2, message: 'project: "extra" is not known to this version; ignored' },
      { line: 2, message: 'project: "scheme" "iob9" is unknown; using iob2' },
      { line: 5, message: 'utterance: meta "bad" is not a string; dropped' },
      { line: 5, message: 'utterance: "line" is not a whole number of at least 1; dropped' },
      { line: 7, message: 'layer: "status" "pondering" is unknown; using draft' },
    ]);
  });

  it("carries a batch's attached count; a format-1 batch without one still reads, a bad one is dropped with a warning", () => {
    const withAttached: BackupData = { ...small, batches: [{ ...(small.batches[0] as BackupData['batches'][number]), attached: 7 }] };
    const text = lines(withAttached);
    expect(JSON.parse(text[3] ?? '')).toMatchObject({ type: 'batch', attached: 7 });
    expect(decodeOk(text.join('\n')).batches[0]?.attached).toBe(7);
    // The older file: no attached field anywhere, format 1, read as before.
    const older = lines(small);
    older[0] = (older[0] ?? '').replace('"formatVersion":2', '"formatVersion":1');
    expect(older[3]).not.toContain('attached');
    expect(JSON.parse(older[0])).toMatchObject({ formatVersion: 1 });
    expect(decodeOk(older.join('\n')).batches[0]).not.toHaveProperty('attached');
    const bad = [...text];
    bad[3] = (bad[3] ?? '').replace('"attached":7', '"attached":-2');
    const result = backupDecode(bad.join('\n'));
    if (!result.ok) throw new Error(JSON.stringify(result.errors));
    expect(result.data.batches[0]).not.toHaveProperty('attached');
    expect(result.warnings).toEqual([{ line: 4, message: 'batch: "attached" is not a whole number of at least 0; dropped' }]);
  });

  it('reports every broken record with its file line and stores nothing of the model', () => {
    const [header = '', project = '', annotator = '', batch = '', u1 = '', u2 = '', l1 = '', l2 = '', h1 = ''] = lines(small);
    const text = [
      JSON.stringify({ ...JSON.parse(header), counts: undefined }),
      project,
      project,
      annotator,
      batch.replace('"state":"done"', '"state":"importing"'),
      u1,
      u1,
      u2.replace('"tokens":[0,4,7,15]', '"tokens":[0,4,7,99]'),
      '{not json',
      l1.replace('"tags":["O","I-problem","B-day"]', '"tags":["O"]'),
      l2.replace('"seq":2', '"seq":7'),
      h1,
      '{"type":"hologram"}',
      '[1,2]',
    ].join('\n');
    const result = backupDecode(text);
    expect(!result.ok && result.errors).toEqual([
      { line: 5, message: 'batch: a backup never holds a running import (state "importing")' },
      { line: 8, message: 'utterance: token 2 [7, 99) is not inside the text after the previous token' },
      { line: 9, message: 'not valid JSON' },
      { line: 13, message: 'unknown record type "hologram"' },
      { line: 14, message: 'a record must be a JSON object' },
    ]);
    // Cross-record problems come once each record is sound on its own.
    const crossed = [header, project, project, annotator, batch, u1, u1, l1.replace('"tags":["O","I-problem","B-day"]', '"tags":["O"]'), l2.replace('"seq":2', '"seq":7')].join('\n');
    const second = backupDecode(crossed.replace(/"counts":\{[^}]*\}/, '"counts":{"annotators":1,"batches":1,"utterances":2,"layers":2,"history":0}'));
    expect(!second.ok && second.errors).toEqual([
      { line: 3, message: 'the backup has more than one project record' },
      { line: 7, message: 'utterance seq 1 appears twice' },
      { line: 8, message: 'layer has 1 tags for 3 tokens' },
      { line: 9, message: 'layer refers to utterance seq 7, which is not in the backup' },
    ]);
  });
});
