import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { backupDecode, backupEncode, backupLines, dismissalKeyUtterance, type BackupData, type BackupProject } from '../../../src/core/backup';
import { CRF_FEATURE_SET, crfModelToJson } from '../../../src/core/crf';
import { findingKey } from '../../../src/core/error-detect';
import { crfModelArbitrary } from './arbitraries';

const CREATED = '2025-03-14T09:30:00.000Z';
const FIXTURE_FORMAT_1 = new URL('../../fixtures/backup-format1.slotsmith-backup.jsonl', import.meta.url);

const modelJson = crfModelToJson(fc.sample(crfModelArbitrary, { seed: 42, numRuns: 1 })[0] as Parameters<typeof crfModelToJson>[0]);
const figures = { truePositives: 3, falsePositives: 1, falseNegatives: 0, precision: 0.75, recall: 1, f1: 6 / 7 };
const evaluation = { slots: { day: figures }, overall: figures, utterances: 4, exactUtterances: 3 };
const disagreementKey = (seq: number) =>
  findingKey({ kind: 'model-disagreement', location: { id: String(seq), layer: 'ana', start: 0, end: 1 }, tokens: ['plumber'], annotatorTags: ['O'], modelTags: ['B-service'], confidence: 0.9 });
const variationKey = findingKey({ kind: 'variation', tokens: ['friday'], nucleus: { start: 0, end: 1 }, fringe: true, readings: [], occurrences: 3 });

const project: BackupProject = {
  name: 'Leaks east',
  created: 1,
  updated: 2,
  tokeniser: { kind: 'words' },
  scheme: 'iob2',
  schema: { slots: [{ name: 'service' }], intents: [{ name: 'book_visit' }] },
  exchange: { uid: '0123456789abcdef0123456789abcdef', role: 'master', packs: [{ id: 'ab'.repeat(32), annotator: 'ana', created: 3, seqs: [1, 2] }] },
  model: { json: modelJson, saved: 4, origin: 'trained', crossValidation: { folds: 2, pooled: evaluation, perFold: [evaluation, evaluation] } },
  dismissed: { [variationKey]: { when: 5, who: 'ana' }, [disagreementKey(2)]: { when: 6, who: null } },
};

const data: BackupData = {
  project,
  annotators: [{ id: 'ana', name: 'Ana', role: 'annotator' }],
  batches: [],
  utterances: [
    { seq: 1, text: 'plumber on Friday', tokens: [0, 7, 8, 10, 11, 17], meta: {} },
    { seq: 2, text: 'plumber please', tokens: [0, 7, 8, 14], meta: {} },
  ],
  layers: [],
  history: [],
};

/** The backup with the project record moved to line 3 (after the annotator), edited by `change`. */
function withProject(change: (p: Record<string, unknown>) => void, base: BackupData = data): string {
  const [header = '', record = '', annotator = '', ...rest] = [...backupLines(base, CREATED)];
  const p = JSON.parse(record) as Record<string, unknown>;
  change(p);
  return [header, annotator, JSON.stringify(p), ...rest].join('\n');
}

type Edit = (p: Record<string, unknown>) => void;
const exchangeEdit = (change: (e: Record<string, unknown>) => void): Edit => (p) => change(p.exchange as Record<string, unknown>);
const packEdit = (change: (e: Record<string, unknown>) => void): Edit => exchangeEdit((e) => change((e.packs as Record<string, unknown>[])[0] as Record<string, unknown>));
const modelEdit = (change: (m: Record<string, unknown>) => void): Edit => (p) => change(p.model as Record<string, unknown>);
const cvEdit = (change: (cv: Record<string, unknown>) => void): Edit => modelEdit((m) => change(m.crossValidation as Record<string, unknown>));
const modelFileEdit = (change: (f: Record<string, unknown>) => void): Edit =>
  modelEdit((m) => {
    const file = JSON.parse(m.json as string) as Record<string, unknown>;
    change(file);
    m.json = JSON.stringify(file);
  });
const dismissalEdit = (change: (d: Record<string, unknown>) => void): Edit => (p) => change((p.dismissed as Record<string, Record<string, unknown>>)[variationKey] as Record<string, unknown>);

describe('backup project extras: exchange, model, dismissed findings', () => {
  it('writes them last in the project record, in a fixed key order, dismissals sorted by key', () => {
    const record = [...backupLines(data, CREATED)][1] ?? '';
    expect(Object.keys(JSON.parse(record) as object)).toEqual(['type', 'name', 'created', 'updated', 'tokeniser', 'scheme', 'schema', 'exchange', 'dismissed', 'model']);
    // The same dismissals inserted in the other order, and the exchange's keys shuffled, give the same bytes.
    const { uid, role, packs } = project.exchange ?? { uid: '', role: 'master' as const, packs: [] };
    const reordered: BackupData = {
      ...data,
      project: { ...project, exchange: { packs, role, uid }, dismissed: Object.fromEntries(Object.entries(project.dismissed ?? {}).reverse()) },
    };
    expect(backupEncode(reordered, CREATED)).toBe(backupEncode(data, CREATED));
    const dismissed = (JSON.parse(record) as { dismissed: object }).dismissed;
    expect(Object.keys(dismissed)).toEqual([disagreementKey(2), variationKey].sort());
    expect(JSON.parse(record)).toMatchObject({ model: { json: modelJson } });
  });

  it('decodes them to the same values and re-encodes to the same bytes', () => {
    const text = backupEncode(data, CREATED);
    expect(backupDecode(text)).toEqual({ ok: true, data, warnings: [] });
  });

  it('leaves out an empty dismissal list: none and empty are the same', () => {
    const text = withProject((p) => {
      p.dismissed = {};
    });
    const result = backupDecode(text);
    expect(result.ok && result.data.project).not.toHaveProperty('dismissed');
    const none: BackupData = { ...data, project: { ...project, dismissed: {} } };
    expect([...backupLines(none, CREATED)][1]).not.toContain('"dismissed"');
  });

  it('names the utterance of a model-disagreement key by seq; a key naming a seq not in the backup is dropped with a warning', () => {
    expect(dismissalKeyUtterance(disagreementKey(2))).toBe('2');
    expect(dismissalKeyUtterance(variationKey)).toBeNull();
    const text = withProject((p) => {
      (p.dismissed as Record<string, unknown>)[disagreementKey(9)] = { when: 7, who: 'bo' };
    });
    const result = backupDecode(text);
    if (!result.ok) throw new Error(JSON.stringify(result.errors));
    expect(Object.keys(result.data.project.dismissed ?? {}).sort()).toEqual([disagreementKey(2), variationKey].sort());
    expect(result.warnings).toEqual([{ line: 3, message: `dismissed finding ${JSON.stringify(disagreementKey(9))} names an utterance seq that is not in the backup; dropped` }]);
    // All of them dropped: no dismissals at all.
    const gone = withProject((p) => {
      p.dismissed = { [disagreementKey(9)]: { when: 7, who: null } };
    });
    const second = backupDecode(gone);
    expect(second.ok && second.data.project).not.toHaveProperty('dismissed');
  });

  it('warns about keys this version does not know, in the project record and inside the extras, and keeps the rest', () => {
    const text = withProject((p) => {
      p.colourTheme = 'dark';
      (p.exchange as Record<string, unknown>).mood = 'calm';
      ((p.exchange as { packs: Record<string, unknown>[] }).packs[0] as Record<string, unknown>).note = 'x';
      (p.model as Record<string, unknown>).size = 3;
      ((p.model as { crossValidation: Record<string, unknown> }).crossValidation as Record<string, unknown>).seed = 1;
      ((p.dismissed as Record<string, Record<string, unknown>>)[variationKey] as Record<string, unknown>).why = 'fine';
    });
    const result = backupDecode(text);
    if (!result.ok) throw new Error(JSON.stringify(result.errors));
    expect(result.data).toEqual(data);
    expect(result.warnings).toEqual([
      { line: 3, message: 'project: "colourTheme" is not known to this version; ignored' },
      { line: 3, message: 'project, exchange: "mood" is not known to this version; ignored' },
      { line: 3, message: 'project, exchange, pack 1: "note" is not known to this version; ignored' },
      { line: 3, message: 'project, model: "size" is not known to this version; ignored' },
      { line: 3, message: 'project, model, crossValidation: "seed" is not known to this version; ignored' },
      { line: 3, message: `project, dismissed, finding ${JSON.stringify(variationKey)}: "why" is not known to this version; ignored` },
    ]);
  });

  it('keeps a model file of another feature set or model version with a warning (the Model screen says it cannot be read)', () => {
    for (const [edit, said] of [
      [(f: Record<string, unknown>) => void (f.featureSet = 'slotsmith-window9/1'), `model uses feature set "slotsmith-window9/1"; this build computes "${CRF_FEATURE_SET}"`],
      [(f: Record<string, unknown>) => void (f.version = 2), 'model file version 2 is not supported (this build reads 1)'],
    ] as const) {
      const text = withProject(modelFileEdit(edit));
      const result = backupDecode(text);
      if (!result.ok) throw new Error(JSON.stringify(result.errors));
      expect(result.data.project.model?.json).toBe(JSON.parse(text.split('\n')[2] ?? '').model.json);
      expect(result.warnings).toEqual([{ line: 3, message: `project, model: kept, but this version cannot tag with it (${said})` }]);
      // Kept byte for byte, so it backs up again as it came.
      expect(backupEncode(result.data, CREATED).split('\n')[1]).toBe(text.split('\n')[2]);
    }
  });

  const P = 'project';
  it.each<[string, Edit, string]>([
    ['exchange not an object', (p) => void (p.exchange = 'team'), `${P}: "exchange" must be an object`],
    ['exchange uid not hex', exchangeEdit((e) => void (e.uid = 'ABC')), `${P}, exchange: "uid" must be 32 hex digits`],
    ['exchange uid missing', exchangeEdit((e) => delete e.uid), `${P}, exchange: "uid" must be a string`],
    ['exchange role unknown', exchangeEdit((e) => void (e.role = 'boss')), `${P}, exchange: "role" must be one of master, copy`],
    ['exchange name not a string', exchangeEdit((e) => void (e.name = 5)), `${P}, exchange: "name" must be a string`],
    ['exchange packs not a list', exchangeEdit((e) => void (e.packs = {})), `${P}, exchange: "packs" must be a list`],
    ['a pack not an object', exchangeEdit((e) => void (e.packs = [7])), `${P}, exchange: pack 1 must be an object`],
    ['a pack id not a digest', packEdit((k) => void (k.id = 'abc')), `${P}, exchange, pack 1: "id" must be 64 hex digits`],
    ['a pack annotator empty', packEdit((k) => void (k.annotator = '')), `${P}, exchange, pack 1: "annotator" is empty`],
    ['a pack time negative', packEdit((k) => void (k.created = -1)), `${P}, exchange, pack 1: "created" must be a whole number of at least 0`],
    ['a pack seq of 0', packEdit((k) => void (k.seqs = [1, 0])), `${P}, exchange, pack 1: "seqs" must be a list of whole numbers of at least 1`],
    ['model not an object', (p) => void (p.model = [1]), `${P}: "model" must be an object`],
    ['model json not a string', modelEdit((m) => void (m.json = { format: 'x' })), `${P}, model: "json" must be a string`],
    ['model json not JSON', modelEdit((m) => void (m.json = '{"format":')), `${P}, model: "json" is not a usable model file (model file is not JSON: `],
    ['model json of another format', modelFileEdit((f) => void (f.format = 'other-model')), `${P}, model: "json" is not a usable model file (not a slotsmith-crf-model file)`],
    ['model tables that do not fit', modelFileEdit((f) => void (f.labels = [])), `${P}, model: "json" is not a usable model file (model file: feature tables and weights do not fit together)`],
    ['model weights not base64', modelFileEdit((f) => void (f.weights = '!!')), `${P}, model: "json" is not a usable model file (model file: bad base64 data`],
    ['model saved missing', modelEdit((m) => delete m.saved), `${P}, model: "saved" must be a whole number of at least 0`],
    ['model origin unknown', modelEdit((m) => void (m.origin = 'guessed')), `${P}, model: "origin" must be one of trained, file`],
    ['cross-validation missing', modelEdit((m) => delete m.crossValidation), `${P}, model: "crossValidation" must be an object or null`],
    ['one fold', cvEdit((cv) => void (cv.folds = 1)), `${P}, model, crossValidation: "folds" must be a whole number of at least 2`],
    ['fold count off', cvEdit((cv) => void (cv.folds = 3)), `${P}, model, crossValidation: "perFold" has 2 evaluations for 3 folds`],
    ['pooled missing', cvEdit((cv) => delete cv.pooled), `${P}, model, crossValidation: "pooled" must be an object`],
    ['a fold not an object', cvEdit((cv) => void (cv.perFold = [evaluation, null])), `${P}, model, crossValidation: fold 2 must be an object`],
    ['precision above 1', cvEdit((cv) => void ((cv.pooled as { overall: Record<string, unknown> }).overall.precision = 1.5)), `${P}, model, crossValidation, pooled, overall: "precision" must be a number from 0 to 1`],
    ['slot figures not an object', cvEdit((cv) => void ((cv.pooled as { slots: Record<string, unknown> }).slots.day = 3)), `${P}, model, crossValidation, pooled, slots: slot "day" must be an object`],
    ['a slot count not whole', cvEdit((cv) => void (((cv.pooled as { slots: Record<string, Record<string, unknown>> }).slots.day as Record<string, unknown>).truePositives = 1.5)), `${P}, model, crossValidation, pooled, slots, slot "day": "truePositives" must be a whole number of at least 0`],
    ['dismissed a list', (p) => void (p.dismissed = [variationKey]), `${P}: "dismissed" must be an object`],
    ['a dismissal not an object', (p) => void ((p.dismissed as Record<string, unknown>)[variationKey] = 5), `${P}, dismissed: finding ${JSON.stringify(variationKey)} must be an object`],
    ['a dismissal time missing', dismissalEdit((d) => delete d.when), `${P}, dismissed, finding ${JSON.stringify(variationKey)}: "when" must be a whole number of at least 0`],
    ['a dismissal author missing', dismissalEdit((d) => delete d.who), `${P}, dismissed, finding ${JSON.stringify(variationKey)}: "who" must be a string or null`],
    ['an empty finding key', (p) => void ((p.dismissed as Record<string, unknown>)[''] = { when: 1, who: null }), `${P}, dismissed: a finding key is empty`],
  ])('refuses %s, naming the line', (_what, edit, message) => {
    const result = backupDecode(withProject(edit));
    if (result.ok) throw new Error('accepted');
    expect(result.errors).toHaveLength(1);
    expect(result.errors[0]?.line).toBe(3);
    expect(result.errors[0]?.message.startsWith(message)).toBe(true);
  });

  it('restores a backup written before these fields existed (format 1), and writes its records back unchanged', () => {
    const fixture = readFileSync(FIXTURE_FORMAT_1, 'utf8');
    expect(JSON.parse(fixture.split('\n')[0] ?? '')).toMatchObject({ formatVersion: 1 });
    const result = backupDecode(fixture);
    if (!result.ok) throw new Error(JSON.stringify(result.errors));
    expect(result.warnings).toEqual([]);
    expect(result.data.project).not.toHaveProperty('model');
    expect([result.data.annotators.length, result.data.utterances.length, result.data.layers.length, result.data.history.length]).toEqual([2, 3, 4, 2]);
    const [header = '', ...records] = backupEncode(result.data, JSON.parse(fixture.split('\n')[0] ?? '').created).split('\n');
    expect(JSON.parse(header)).toMatchObject({ formatVersion: 2 });
    expect(records).toEqual(fixture.split('\n').slice(1));
  });
});
