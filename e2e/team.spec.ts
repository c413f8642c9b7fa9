import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Browser, type Locator, type Page } from '@playwright/test';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { assignmentPlan, layersRead, packRead, type PackFile } from '../src/core/exchange';
import { columnsRead } from '../src/core/formats';
import { watchOrigins } from './helpers';

// The demo import runs in a worker on a shared 2-core machine.
const SLOW = 60_000;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];
const work = mkdtempSync(join(tmpdir(), 'slotsmith-team-'));

interface Labels {
  tags: string[];
  intent: string | null;
  status: string;
}

/** The demo's imported layers (status done), by utterance id: what the merge compares new layers with. */
const demoLayers = new Map<string, Labels[]>();
for (const file of ['sample-corpus/ann-a.iob2', 'sample-corpus/ann-b.iob2']) {
  for (const u of columnsRead(readFileSync(file)).utterances) {
    const list = demoLayers.get(u.id ?? '') ?? [];
    list.push({ tags: u.tags, intent: u.intent ?? null, status: 'done' });
    demoLayers.set(u.id ?? '', list);
  }
}

/** The repository's rule: both layers hold labels (draft, done, flagged) and tags or intent differ. */
function differ(a: Labels, b: Labels): boolean {
  const labelled = (s: string) => s === 'draft' || s === 'done' || s === 'flagged';
  return labelled(a.status) && labelled(b.status) && (a.intent !== b.intent || a.tags.join(' ') !== b.tags.join(' '));
}

/** Every row of `store` in `page`'s IndexedDB, as a check independent of the screen (no eval: the app's CSP forbids it). */
function rowsOf<T>(page: Page, store: string): Promise<T[]> {
  return page.evaluate(
    (name) =>
      new Promise<T[]>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const db = open.result;
          const request = db.transaction(name).objectStore(name).getAll();
          request.onerror = () => reject(request.error);
          request.onsuccess = () => {
            db.close();
            resolve(request.result as T[]);
          };
        };
      }),
    store,
  );
}

const countOf = async (page: Page, store: string) => (await rowsOf(page, store)).length;
const layersAll = (page: Page) => rowsOf<unknown>(page, 'layers');
const utteranceIds = async (page: Page) => (await rowsOf<{ seq: number; id: number }>(page, 'utterances')).map((u): [number, number] => [u.seq, u.id]);

async function fileDownloaded(page: Page, link: Locator, name: string): Promise<string> {
  const [download] = await Promise.all([page.waitForEvent('download'), link.click()]);
  const path = join(work, name);
  writeFileSync(path, readFileSync(await download.path()));
  return path;
}

async function axeClean(page: Page) {
  const results = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(results.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => v.id)).toEqual([]);
}

function projectIdOf(page: Page): number {
  return Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
}

interface Label {
  seq: number;
  /** Slot for the first token, through the slot list ("/"), or none. */
  slot?: string;
  intent?: string;
  status: 'Done' | 'Skipped';
}

/** One annotator on their own machine: open the pack, label through the label screen, hand back. */
async function annotatorWork(browser: Browser, baseURL: string, packPath: string, who: string, labels: Label[]): Promise<{ path: string; foreign: string[] }> {
  const context = await browser.newContext({ baseURL });
  const page = await context.newPage();
  const foreign = watchOrigins(page, baseURL);
  await page.goto('/');
  await page.getByLabel('Open a pack file').setInputFiles(packPath);
  const name = `Home-repair demo (pack for ${who})`;
  await expect(page.getByRole('status').filter({ hasText: 'Opened the pack as the project' })).toContainText(name);
  await page.getByRole('button', { name: `Open “${name}”` }).click();
  await expect(page.getByRole('heading', { name: `Team work: ${name}` })).toBeVisible();
  await page.getByRole('button', { name: `Label as ${who}` }).click();
  const projectId = projectIdOf(page);
  const ids = new Map(await utteranceIds(page));
  for (const l of labels) {
    await page.goto(`/#/p/${projectId}/label?u=${ids.get(l.seq)}`);
    const tokens = page.getByRole('listbox', { name: /^Tokens of the utterance/ });
    await expect(tokens).toBeVisible();
    if (l.slot !== undefined) {
      await tokens.focus();
      await page.keyboard.press('/');
      await expect(page.getByRole('dialog', { name: 'Label the selection as…' })).toBeVisible();
      await page.keyboard.type(l.slot);
      await page.keyboard.press('Enter');
      await expect(page.getByRole('dialog')).toHaveCount(0);
    }
    if (l.intent !== undefined) await page.getByLabel('Intent').selectOption(l.intent);
    await page.getByRole('radio', { name: l.status }).check();
    await expect(page.getByText(/^Saved \(revision \d+\)\.$/)).toBeVisible();
  }
  await page.goto(`/#/p/${projectId}/team`);
  await page.getByRole('button', { name: 'Hand back my layer' }).click();
  await expect(page.getByRole('status').filter({ hasText: `${labels.length} layers of ${who} ready` })).toBeVisible();
  const path = await fileDownloaded(page, page.getByRole('list', { name: 'Layer file to save' }).getByRole('link'), `layers-${who}.jsonl`);
  await context.close();
  return { path, foreign };
}

test('team work across machines: packs out, labels in the label screen, layer files merged, tampering refused, agreement as the CLI’s', async ({ browser, baseURL }) => {
  test.setTimeout(300_000);
  const base = baseURL ?? '';
  const lead = await (await browser.newContext({ baseURL: base })).newPage();
  const foreign = watchOrigins(lead, base);
  await lead.goto('/');
  await lead.getByRole('button', { name: /Try the demo project/ }).click();
  await lead.waitForURL(/#\/p\/\d+\//, { timeout: SLOW });
  await lead.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Team work' }).click();
  await expect(lead.getByRole('heading', { name: 'Team work: Home-repair demo' })).toBeVisible();

  // A seeded sample of 10 for ana and ben, 40 % overlap: 4 shared, 7 each.
  await lead.getByLabel('Only a random sample of').check();
  await lead.getByLabel('Sample size').fill('10');
  await lead.getByLabel('Annotators (ids, separated by commas)').fill('ana, ben');
  await lead.getByLabel('Overlap (% of utterances given to two annotators)').fill('40');
  await lead.getByLabel('Seed').fill('7');
  await lead.getByRole('button', { name: 'Show who gets what' }).click();
  const who = lead.getByRole('table', { name: 'Who gets what' });
  await expect(who.getByRole('row', { name: /^ana/ })).toHaveText(['ana74']);
  await expect(who.getByRole('row', { name: /^ben/ })).toHaveText(['ben74']);
  await expect(lead.getByRole('table', { name: 'Shared utterances per pair' }).getByRole('row', { name: /ana and ben/ })).toHaveText(['ana and ben4']);
  await lead.getByRole('button', { name: 'Make the packs' }).click();
  const packLinks = lead.getByRole('list', { name: 'Packs to save' }).getByRole('link');
  await expect(packLinks).toHaveCount(2);
  await axeClean(lead);
  const packAPath = await fileDownloaded(lead, packLinks.filter({ hasText: 'pack-ana' }), 'pack-ana.jsonl');
  const packBPath = await fileDownloaded(lead, packLinks.filter({ hasText: 'pack-ben' }), 'pack-ben.jsonl');

  // The packs hold what the core's seeded plan gives for the same utterances and seed.
  const packOf = async (path: string): Promise<PackFile> => {
    const read = await packRead(readFileSync(path, 'utf8'));
    if (!read.ok) throw new Error(JSON.stringify(read.errors));
    return read.file;
  };
  const packA = await packOf(packAPath);
  const packB = await packOf(packBPath);
  const seqsA = packA.utterances.map((u) => u.seq);
  const seqsB = packB.utterances.map((u) => u.seq);
  const all = [...new Set([...seqsA, ...seqsB])].sort((a, b) => a - b);
  expect(all).toHaveLength(10);
  const plan = assignmentPlan(all, ['ana', 'ben'], 0.4, 7);
  expect(seqsA).toEqual(plan.items.filter((i) => i.annotators.includes('ana')).map((i) => i.id));
  expect(seqsB).toEqual(plan.items.filter((i) => i.annotators.includes('ben')).map((i) => i.id));
  expect(packA.header.project.uid).toBe(packB.header.project.uid);
  const shared = seqsA.filter((s) => seqsB.includes(s));
  expect(shared).toHaveLength(4);
  const [d1, d2] = shared as [number, number];
  const onlyA = seqsA.find((s) => !shared.includes(s)) as number;
  const onlyB = seqsB.find((s) => !shared.includes(s)) as number;

  // Two other machines, each with its own storage.
  const a = await annotatorWork(browser, base, packAPath, 'ana', [
    { seq: d1, slot: 'service', intent: 'book_visit', status: 'Done' },
    { seq: d2, intent: 'book_visit', status: 'Done' },
    { seq: onlyA, status: 'Skipped' },
  ]);
  const b = await annotatorWork(browser, base, packBPath, 'ben', [
    { seq: d1, intent: 'book_visit', status: 'Done' },
    { seq: d2, intent: 'reschedule', status: 'Done' },
    { seq: onlyB, intent: 'cancel', status: 'Done' },
  ]);

  // What came back, read in Node; expected new disagreements by the same rule against the demo layers.
  const fileOf = async (path: string) => {
    const read = await layersRead(readFileSync(path, 'utf8'));
    if (!read.ok) throw new Error(JSON.stringify(read.errors));
    return read.file.layers;
  };
  const layersA = await fileOf(a.path);
  const layersB = await fileOf(b.path);
  expect(layersA.map((l) => [l.seq, l.status, l.intent])).toEqual(
    [[d1, 'done', 'book_visit'], [d2, 'done', 'book_visit'], [onlyA, 'skipped', null]].sort((x, y) => (x[0] as number) - (y[0] as number)),
  );
  expect(layersA.find((l) => l.seq === d1)?.tags[0]).toBe('B-service');
  const externalOf = new Map([...packA.utterances, ...packB.utterances].map((u) => [u.seq, u.externalId ?? '']));
  const newAgainst = (mine: typeof layersA, others: (seq: number) => Labels[]) => mine.filter((l) => others(l.seq).some((o) => differ(l, o))).length;
  const expectA = newAgainst(layersA, (seq) => demoLayers.get(externalOf.get(seq) ?? '') ?? []);
  const expectB = newAgainst(layersB, (seq) => [...(demoLayers.get(externalOf.get(seq) ?? '') ?? []), ...layersA.filter((l) => l.seq === seq)]);

  // The lead merges both files.
  const historyBefore = await countOf(lead, 'history');
  const merge = lead.getByLabel('Layer files to merge');
  await merge.setInputFiles(a.path);
  await expect(lead.getByRole('status').filter({ hasText: 'Merged ana’s layers: 3 new layers, 0 newer revisions, 0 unchanged.' })).toBeVisible();
  const summary = lead.getByRole('table', { name: 'Merge summary' });
  // Annotator, received, done, skipped, new or newer, unchanged, older, new disagreements.
  await expect(summary.getByRole('row', { name: /^ana/ }).getByRole('cell')).toHaveText(['3', '2', '1', '3', '0', '0', String(expectA)]);
  await merge.setInputFiles(b.path);
  await expect(lead.getByRole('status').filter({ hasText: 'Merged ben’s layers: 3 new layers, 0 newer revisions, 0 unchanged.' })).toBeVisible();
  await expect(summary.getByRole('row', { name: /^ben/ }).getByRole('cell')).toHaveText(['3', '3', '0', '3', '0', '0', String(expectB)]);
  // ana and ben differ on the first shared utterance (a service span only ana marked).
  expect(expectB).toBeGreaterThanOrEqual(1);
  expect(await countOf(lead, 'history')).toBe(historyBefore + 6);
  const packRows = lead.getByRole('table', { name: 'Progress per pack' });
  // Pack, made, utterances, done, skipped, started, not started.
  await expect(packRows.getByRole('row', { name: /^ana/ }).getByRole('cell').nth(1)).toHaveText('7');
  await expect(packRows.getByRole('row', { name: /^ana/ }).getByRole('cell').nth(2)).toHaveText('2');
  await expect(packRows.getByRole('row', { name: /^ana/ }).getByRole('cell').nth(3)).toHaveText('1');
  await expect(packRows.getByRole('row', { name: /^ben/ }).getByRole('cell').nth(2)).toHaveText('3');

  // The same file again changes nothing.
  const layersBefore = await layersAll(lead);
  await merge.setInputFiles(a.path);
  await expect(lead.getByRole('status').filter({ hasText: 'Merged ana’s layers: 0 new layers, 0 newer revisions, 3 unchanged.' })).toBeVisible();
  expect(await layersAll(lead)).toEqual(layersBefore);
  expect(await countOf(lead, 'history')).toBe(historyBefore + 6);

  // A tampered file: one status changed by hand. Refused with the line and the reason; nothing changes.
  const text = readFileSync(a.path, 'utf8').split('\n');
  const line = text.findIndex((l) => l.includes('"status":"skipped"'));
  text[line] = (text[line] as string).replace('"status":"skipped"', '"status":"done"');
  const tampered = join(work, 'layers-ana-tampered.jsonl');
  writeFileSync(tampered, text.join('\n'));
  await merge.setInputFiles(tampered);
  const alert = lead.getByRole('alert').filter({ hasText: 'layers-ana-tampered.jsonl was not merged; nothing changed' });
  await expect(alert).toBeVisible();
  await expect(alert.getByRole('listitem')).toHaveText([`Line ${line + 1}: this line was changed after the file was written (its check does not match)`]);
  expect(await layersAll(lead)).toEqual(layersBefore);
  expect(await countOf(lead, 'history')).toBe(historyBefore + 6);

  await axeClean(lead);

  // Agreement: the screen's figures for ana against ben equal the command line's agree on both
  // layers written out as IOB2 through the export screen (done layers: the two shared ones).
  const exported: string[] = [];
  for (const annotator of ['ana', 'ben']) {
    await lead.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Write out data' }).click();
    await lead.getByRole('radio', { name: 'One annotator', exact: true }).check();
    await lead.getByRole('combobox', { name: /^Annotator/ }).selectOption(annotator);
    await lead.getByRole('button', { name: 'Write', exact: true }).click();
    const links = lead.getByRole('list', { name: 'Files to save' }).getByRole('link');
    await expect(links).toHaveCount(1, { timeout: SLOW });
    exported.push(await fileDownloaded(lead, links.first(), `${annotator}.iob2`));
  }
  const run = spawnSync(process.execPath, ['bin/slotsmith.mjs', 'agree', '--json', ...exported], { maxBuffer: 16 * 1024 * 1024 });
  expect(run.status).toBe(0);
  const cli = JSON.parse(run.stdout.toString('utf8')) as { utterances: number; kappa: { tag: number | null; slot: number | null }; intent: { kappa: number | null }; spans: { exactF1: number | null; overlapF1: number | null } };
  expect(cli.utterances).toBe(2);
  await lead.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Agreement' }).click();
  await lead.getByLabel('Layer A').selectOption('ana');
  await lead.getByLabel('Layer B').selectOption('ben');
  // As the agreement screen rounds: three decimals.
  const shown = (x: number | null) => (x === null ? /—|n\/a|undefined/ : x.toFixed(3));
  await expect(lead.getByTestId('figure-kappa-slot')).toContainText(shown(cli.kappa.slot), { timeout: SLOW });
  await expect(lead.getByTestId('figure-kappa-tag')).toContainText(shown(cli.kappa.tag));
  await expect(lead.getByTestId('figure-kappa-intent')).toContainText(shown(cli.intent.kappa));
  await expect(lead.getByTestId('figure-span-exact')).toContainText(shown(cli.spans.exactF1));
  await expect(lead.getByTestId('figure-span-overlap')).toContainText(shown(cli.spans.overlapF1));
  await expect(lead.getByTestId('agreement-compared')).toContainText('Compared 2 utterances');

  expect(foreign).toEqual([]);
  expect(a.foreign).toEqual([]);
  expect(b.foreign).toEqual([]);
});
