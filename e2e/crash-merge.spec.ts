/**
 * Crash safety of a merge: layer files of two annotators are merged on the Team work screen and the
 * browser process is killed with SIGKILL at a random moment of the merge, then relaunched on the same
 * profile. Each layer file is merged in one IndexedDB transaction (src/db/exchange-repo.ts
 * `layersMerge`, strict durability), so after every kill each annotator's layers must be all of the
 * new revision (merged) or all of the previous one (not merged), with one history row per merged
 * layer; merging the file again then completes it. Nothing half-merged, nothing for a next start to undo.
 *
 * `npm test` merges 2 × 600 layers with 4 kills; the full run is e.g.
 *   SLOTSMITH_CRASH_MERGE_SIZE=20000 SLOTSMITH_CRASH_MERGES=10 SLOTSMITH_E2E_PORT=4188 npx playwright test e2e/crash-merge.spec.ts
 */
import { expect, test, type Page } from '@playwright/test';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { layersWrite, packRead, type LayerRecord, type PackFile } from '../src/core/exchange';
import { browserPid, launch, random } from './crash-helpers';

const SLOW = 60_000;
const SIZE = Number(process.env.SLOTSMITH_CRASH_MERGE_SIZE ?? 1200);
const MERGES = Number(process.env.SLOTSMITH_CRASH_MERGES ?? 4);
const SEED = Number(process.env.SLOTSMITH_CRASH_SEED ?? 20_261_202);
const WHO = ['ana', 'ben'] as const;

interface Stored {
  /** Revisions of the annotator's layers: revision → count. */
  revisions: Record<number, number>;
  history: number;
}

/** Per annotator: their layers' revisions and their history rows, read straight from IndexedDB. */
function storedOf(page: Page, projectId: number): Promise<Record<string, Stored>> {
  return page.evaluate(
    ([project, who]) =>
      new Promise<Record<string, Stored>>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const tx = open.result.transaction(['layers', 'history']);
          const out: Record<string, Stored> = Object.fromEntries(who.map((w) => [w, { revisions: {}, history: 0 }]));
          const layers = tx.objectStore('layers').getAll();
          layers.onsuccess = () => {
            for (const l of layers.result as { projectId: number; annotator: string; revision: number }[]) {
              const s = out[l.annotator];
              if (l.projectId !== project || s === undefined) continue;
              s.revisions[l.revision] = (s.revisions[l.revision] ?? 0) + 1;
            }
          };
          const history = tx.objectStore('history').getAll();
          history.onsuccess = () => {
            for (const h of history.result as { projectId: number; annotator: string }[]) {
              const s = out[h.annotator];
              if (h.projectId === project && s !== undefined) s.history++;
            }
          };
          tx.oncomplete = () => {
            open.result.close();
            resolve(out);
          };
        };
      }),
    [projectId, WHO] as const,
  );
}

/** A layer file for `pack`: every utterance labelled, all at `revision`. */
async function layerFileWrite(pack: PackFile, revision: number, path: string): Promise<void> {
  const annotator = pack.header.annotator.id;
  const layers = pack.utterances.map((u, i): LayerRecord => {
    const count = u.tokens.length / 2;
    const tags = Array.from({ length: count }, (_, t) => (t === 0 && (i + revision) % 3 === 0 ? 'B-service' : 'O'));
    const record: LayerRecord = { seq: u.seq, tokenCount: count, annotator, tags, intent: revision % 2 === 0 ? 'reschedule' : 'book_visit', status: 'done', note: `round ${revision}`, revision, updated: Date.UTC(2026, 0, 1) + revision * 60_000 };
    if (u.externalId !== undefined) record.externalId = u.externalId;
    return record;
  });
  writeFileSync(path, await layersWrite({ created: new Date(Date.UTC(2026, 0, 1)).toISOString(), project: pack.header.project, annotator, pack: pack.header.bodySha256, layers }));
}

async function teamOpen(page: Page, baseURL: string, projectId: number): Promise<void> {
  await page.goto(`${baseURL}/#/p/${projectId}/team`);
  await expect(page.getByLabel('Layer files to merge')).toBeEnabled({ timeout: SLOW });
}

test('a kill in the middle of a merge leaves each layer file merged whole or not at all', async ({ baseURL }) => {
  test.setTimeout(Math.max(300_000, MERGES * 90_000 + SIZE * 30));
  const base = baseURL ?? '';
  const dir = mkdtempSync(join(tmpdir(), 'slotsmith-crash-merge-'));
  const files = mkdtempSync(join(tmpdir(), 'slotsmith-crash-merge-files-'));
  const next = random(SEED);
  let text = '';
  for (let i = 0; i < SIZE; i++) text += `# id = m-${i}\n# intent = book_visit\nelectrician\tB-service\nfor\tO\nflat\tO\n${i}\tB-area\n\n`;
  const corpus = join(files, 'visits.iob2');
  writeFileSync(corpus, text);

  let context = await launch(dir, true);
  let page = context.pages()[0] ?? (await context.newPage());
  await page.goto(base);
  await page.getByLabel('New project name').fill('Killed merge');
  await page.getByRole('button', { name: 'Create project' }).click();
  await page.waitForURL(/#\/p\/\d+\//, { timeout: SLOW });
  const projectId = Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Bring in data' }).click();
  await page.getByLabel('File to bring in').setInputFiles(corpus);
  await page.getByRole('button', { name: 'Preview' }).click();
  await page.getByRole('button', { name: 'Import' }).and(page.locator(':enabled')).click();
  await expect(page.getByText(`Stored ${SIZE.toLocaleString('en')} utterances`)).toBeVisible({ timeout: SLOW });

  // Packs: all utterances, half each, no overlap.
  await teamOpen(page, base, projectId);
  await page.getByLabel('Annotators (ids, separated by commas)').fill(WHO.join(', '));
  await page.getByLabel('Overlap (% of utterances given to two annotators)').fill('0');
  await page.getByRole('button', { name: 'Show who gets what' }).click();
  await page.getByRole('button', { name: 'Make the packs' }).click();
  const links = page.getByRole('list', { name: 'Packs to save' }).getByRole('link');
  await expect(links).toHaveCount(2, { timeout: SLOW });
  const packs: PackFile[] = [];
  for (const who of WHO) {
    const [download] = await Promise.all([page.waitForEvent('download'), links.filter({ hasText: `pack-${who}` }).click()]);
    const read = await packRead(readFileSync(await download.path(), 'utf8'));
    if (!read.ok) throw new Error(JSON.stringify(read.errors));
    packs.push(read.file);
  }
  const sizes = packs.map((p) => p.utterances.length);
  expect(sizes.reduce((a, b) => a + b, 0)).toBe(SIZE);

  const merge = async (revision: number): Promise<string[]> => {
    const paths = WHO.map((who) => join(files, `layers-${who}-r${revision}.jsonl`));
    for (const [i, pack] of packs.entries()) await layerFileWrite(pack, revision, paths[i] as string);
    await page.getByLabel('Layer files to merge').setInputFiles(paths);
    return paths;
  };
  const mergedAll = (revision: number) =>
    Promise.all(WHO.map((who) => expect(page.getByRole('status').filter({ hasText: new RegExp(`^layers-${who}-r${revision}\\.jsonl: Merged ${who}’s layers`) })).toBeVisible({ timeout: SLOW })));

  // Revision 1 merged without a kill: how long a merge of both files takes here sets the kill window.
  let started = Date.now();
  await merge(1);
  await mergedAll(1);
  const window = Date.now() - started;
  const history: Record<string, number> = Object.fromEntries(WHO.map((w, i) => [w, sizes[i] as number]));
  expect(await storedOf(page, projectId)).toEqual(Object.fromEntries(WHO.map((w, i) => [w, { revisions: { 1: sizes[i] }, history: sizes[i] }])));

  let kills = 0;
  let whole = 0;
  let none = 0;
  let partial = 0;
  for (let round = 0; round < MERGES; round++) {
    const revision = round + 2;
    started = Date.now();
    await merge(revision);
    await expect(page.getByText(/^Checking and merging .*…$/)).toBeVisible({ timeout: SLOW });
    // Anywhere from the file reading to the last commit (the window includes the screen's own updates).
    const delay = Math.floor(next() * window);
    await new Promise((r) => setTimeout(r, Math.max(0, delay - (Date.now() - started))));
    process.kill(browserPid(dir), 'SIGKILL');
    kills++;
    await context.close().catch(() => undefined);

    context = await launch(dir, true);
    page = context.pages()[0] ?? (await context.newPage());
    // The database opens cleanly: the Team work screen reads it.
    await teamOpen(page, base, projectId);
    const stored = await storedOf(page, projectId);
    for (const [i, who] of WHO.entries()) {
      const size = sizes[i] as number;
      const s = stored[who] as Stored;
      const merged = s.revisions[revision] === size;
      const untouched = s.revisions[revision - 1] === size;
      if (merged) whole++;
      else if (untouched) none++;
      else partial++;
      expect(merged || untouched, `${who} after kill ${kills} (${delay} ms into the merge): ${JSON.stringify(s.revisions)}`).toBe(true);
      expect(s.history, `${who}'s history rows after kill ${kills}`).toBe((history[who] as number) + (merged ? size : 0));
    }
    // Merging the same files again completes what the kill stopped, and changes nothing merged already.
    await merge(revision);
    await mergedAll(revision);
    const after = await storedOf(page, projectId);
    for (const [i, who] of WHO.entries()) {
      const size = sizes[i] as number;
      expect(after[who]?.revisions).toEqual({ [revision]: size });
      history[who] = (history[who] as number) + size;
      expect(after[who]?.history).toBe(history[who]);
    }
  }
  console.log(
    `crash-merge: ${MERGES} merges of ${SIZE} layers (${sizes.join(' + ')}) in ${WHO.length} files, ${kills} kills within ${window} ms; ` +
      `files found merged whole ${whole}, untouched ${none}, half-merged ${partial}`,
  );
  expect(partial).toBe(0);
  await context.close();
  rmSync(dir, { recursive: true, force: true });
  rmSync(files, { recursive: true, force: true });
});
