import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LAYER_STATUSES, type LayerContent } from '../../../src/core/backup/model';
import { layersRead } from '../../../src/core/exchange/layers';
import { mergePlan, type MergeUtterance } from '../../../src/core/exchange/merge';
import type { LayerRecord, LayersFile } from '../../../src/core/exchange/model';
import { layer, layersText, lineEdit, PROJECT, UID, UTTERANCES } from './fixtures';

const MASTER = new Map<number, MergeUtterance>(UTTERANCES.map((u) => [u.seq, { seq: u.seq, ...(u.externalId !== undefined && { externalId: u.externalId }), tokenCount: u.tokens.length / 2 }]));

async function fileOf(layers: LayerRecord[], annotator = 'ana'): Promise<LayersFile> {
  const read = await layersRead(await layersText(layers, annotator));
  if (!read.ok) throw new Error(JSON.stringify(read.errors));
  return read.file;
}

/** In-memory master: annotator → seq → layer; applies a plan the way the repository does. */
type Store = Map<string, Map<number, LayerContent>>;
function merge(store: Store, file: LayersFile): { changed: number } {
  const own = store.get(file.header.annotator) ?? new Map<number, LayerContent>();
  const plan = mergePlan(file, UID, MASTER, own);
  if (!plan.ok) throw new Error(JSON.stringify(plan.errors));
  let changed = 0;
  for (const d of plan.decisions) {
    if (d.action === 'add' || d.action === 'replace') {
      own.set(d.seq, d.incoming);
      changed++;
    }
  }
  store.set(file.header.annotator, own);
  return { changed };
}

describe('layer files', () => {
  it('round-trip', async () => {
    const layers = [layer(1, { tags: ['O', 'O', 'B-service', 'O', 'B-day'], intent: 'book_visit', note: 'clear' }), layer(4, { status: 'skipped', revision: 3 })];
    const text = await layersText(layers);
    const read = await layersRead(text);
    expect(read.ok && read.file.layers).toEqual(layers);
    expect(read.ok && read.file.header).toMatchObject({ format: 'slotsmith-layers', version: 1, project: PROJECT, annotator: 'ana', pack: 'ab'.repeat(32), count: 2 });
  });

  it('refuses an edited layer line, tags that do not fit the token count and a record of another annotator', async () => {
    const text = await layersText([layer(1), layer(9)]);
    const edited = lineEdit(text, 3, (l) => l.replace('"status":"done"', '"status":"skipped"'));
    const read = await layersRead(edited);
    expect(read.ok ? null : read.errors).toEqual([{ line: 3, message: 'this line was changed after the file was written (its check does not match)' }]);
    const wrong = await layersRead(await layersText([layer(1, { tags: ['O'] }), layer(9, { annotator: 'ben' })]));
    expect(wrong.ok ? null : wrong.errors.map((e) => [e.line, e.message])).toEqual([
      [2, 'layer: 1 tags for 5 tokens'],
      [3, 'layer: belongs to "ben", but the file is "ana"\'s'],
    ]);
  });
});

describe('mergePlan', () => {
  it('adds, replaces newer, ignores older and finds identical layers the same', async () => {
    const stored = new Map<number, LayerContent>([
      [1, { ...layer(1), revision: 2 }],
      [4, { ...layer(4), revision: 5 }],
      [9, { ...layer(9), revision: 1 }],
    ]);
    const file = await fileOf([layer(1, { revision: 3, status: 'skipped' }), layer(4, { revision: 2 }), layer(9)]);
    const plan = mergePlan(file, UID, MASTER, stored);
    expect(plan.ok && plan.decisions.map((d) => [d.seq, d.action, d.conflict])).toEqual([
      [1, 'replace', false],
      [4, 'older', false],
      [9, 'same', false],
    ]);
    const fresh = mergePlan(file, UID, MASTER, new Map());
    expect(fresh.ok && fresh.decisions.map((d) => d.action)).toEqual(['add', 'add', 'add']);
  });

  it('reports one revision edited on two machines as a conflict, decided the same way from either side', async () => {
    const a = layer(1, { revision: 2, updated: 10, intent: 'book_visit' });
    const b = layer(1, { revision: 2, updated: 20, intent: 'cancel' });
    const planA = mergePlan(await fileOf([b]), UID, MASTER, new Map([[1, a]]));
    const planB = mergePlan(await fileOf([a]), UID, MASTER, new Map([[1, b]]));
    expect(planA.ok && planA.decisions[0]).toMatchObject({ action: 'replace', conflict: true });
    expect(planB.ok && planB.decisions[0]).toMatchObject({ action: 'older', conflict: true });
  });

  it('refuses the whole file: another project, an unknown utterance, another external id, another token count', async () => {
    const other = await layersRead(await layersText([layer(1)], 'ana', { uid: 'f'.repeat(32), name: 'Garden jobs' }));
    if (!other.ok) throw new Error('unreadable');
    const refusedOther = mergePlan(other.file, UID, MASTER, new Map());
    expect(refusedOther.ok ? null : refusedOther.errors).toEqual([{ line: 1, message: 'this layer file belongs to another project ("Garden jobs", fingerprint ffffffff…), not this one' }]);
    const file = await fileOf([layer(1), layer(2, { tokenCount: 1, tags: ['O'] }), layer(4, { externalId: 'hr-004' }), layer(9, { tokenCount: 2, tags: ['O', 'O'] })]);
    const refused = mergePlan(file, UID, MASTER, new Map());
    expect(refused.ok ? null : refused.errors).toEqual([
      { line: 3, message: 'utterance 2 is not in this project' },
      { line: 4, message: 'utterance 4 (hr-004): the project has id null at this place; the file is for other utterances' },
      { line: 5, message: 'utterance 9 (hr-009) has 3 tokens here but 2 in the file: it was tokenised differently' },
    ]);
  });

  const layerArb = (seq: number) =>
    fc.record({
      revision: fc.integer({ min: 1, max: 4 }),
      updated: fc.integer({ min: 0, max: 3 }),
      status: fc.constantFrom(...LAYER_STATUSES),
      intent: fc.constantFrom(null, 'book_visit', 'cancel'),
      tag: fc.constantFrom('O', 'B-day', 'I-day', 'B-service'),
    }).map((r) => layer(seq, { revision: r.revision, updated: r.updated, status: r.status, intent: r.intent, tags: layer(seq).tags.map((t, i) => (i === 0 ? r.tag : t)) }));
  const fileArb = fc.record({
    annotator: fc.constantFrom('ana', 'ben'),
    layers: fc.subarray([1, 4, 9]).chain((seqs) => fc.tuple(...seqs.map(layerArb))),
  });

  it('merging the same file twice changes nothing the second time (property)', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(fileArb, { maxLength: 4 }), fileArb, async (before, last) => {
        const store: Store = new Map();
        for (const f of before) merge(store, await fileOf(f.layers.map((l) => ({ ...l, annotator: f.annotator })), f.annotator));
        const file = await fileOf(last.layers.map((l) => ({ ...l, annotator: last.annotator })), last.annotator);
        merge(store, file);
        const snapshot = structuredClone([...store].map(([a, m]) => [a, [...m]]));
        expect(merge(store, file).changed).toBe(0);
        expect([...store].map(([a, m]) => [a, [...m]])).toEqual(snapshot);
      }),
      { seed: 42, numRuns: 150 },
    );
  });

  it('merging distinct files in any order gives the same layers (property)', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(fileArb, { minLength: 2, maxLength: 4 }), fc.integer({ min: 0, max: 1000 }), async (specs, rotation) => {
        const files = await Promise.all(specs.map((f) => fileOf(f.layers.map((l) => ({ ...l, annotator: f.annotator })), f.annotator)));
        const forward: Store = new Map();
        for (const f of files) merge(forward, f);
        const reordered: Store = new Map();
        const shift = rotation % files.length;
        for (const f of [...files.slice(shift), ...files.slice(0, shift)].reverse()) merge(reordered, f);
        const canonical = (s: Store) => [...s].map(([a, m]) => [a, [...m].sort(([x], [y]) => x - y)] as const).sort(([a], [b]) => (a < b ? -1 : 1));
        expect(canonical(reordered)).toEqual(canonical(forward));
      }),
      { seed: 42, numRuns: 150 },
    );
  });
});
