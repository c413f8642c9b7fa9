import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { columnsRead } from '../src/core/formats';
import { transitionsValidate } from '../src/core/rules';
import { watchOrigins } from './helpers';

const ANN_A = 'sample-corpus/ann-a.iob2';
const MALFORMED = 'tests/fixtures/cli/malformed.iob2';

/** The reference figures: the core reader run in Node on the same file. */
function expected(path: string) {
  const doc = columnsRead(readFileSync(path));
  const violations = doc.utterances.reduce((n, u) => n + transitionsValidate(u.tags, doc.scheme).length, 0);
  return { utterances: doc.utterances.length, violations };
}

async function projectNew(page: Page, name: string) {
  await page.goto('/');
  await page.getByLabel('New project name').fill(name);
  await page.getByRole('button', { name: 'Create project' }).click();
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Bring in data' }).click();
  await expect(page.getByRole('heading', { name: `Bring in data to ${name}` })).toBeVisible();
}

const fmt = (n: number) => n.toLocaleString('en');

test('import the sample corpus: preview figures match the core reader, stored data survives a reload', async ({ page, baseURL }) => {
  const foreign = watchOrigins(page, baseURL ?? '');
  const want = expected(ANN_A);
  await projectNew(page, 'Sample import');
  await page.getByLabel('File to bring in').setInputFiles(ANN_A);
  await expect(page.getByLabel('Whose labels are these?')).toHaveValue('ann-a');
  await page.getByRole('button', { name: 'Preview' }).click();
  await expect(page.getByTestId('preview-utterances')).toHaveText(fmt(want.utterances));
  await expect(page.getByTestId('preview-violations')).toHaveText(fmt(want.violations));
  await expect(page.getByTestId('preview-malformed')).toHaveText('0');

  const axe = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
  expect(axe.violations.map((v) => `${v.id}: ${v.help}`)).toEqual([]);

  await page.getByRole('button', { name: 'Import' }).click();
  await expect(page.getByText(`Stored ${fmt(want.utterances)} utterances`)).toBeVisible();
  await page.reload();
  await expect(page.getByText(`This project holds ${fmt(want.utterances)} utterances`)).toBeVisible();
  await page.getByRole('button', { name: 'All projects' }).click();
  await expect(page.getByRole('list', { name: 'Projects' })).toContainText(`${want.utterances} utterances`);
  expect(foreign).toEqual([]);
});

test('a malformed file shows line-numbered errors and stores nothing', async ({ page, baseURL }) => {
  const foreign = watchOrigins(page, baseURL ?? '');
  await projectNew(page, 'Broken file');
  await page.getByLabel('File to bring in').setInputFiles(MALFORMED);
  await page.getByRole('button', { name: 'Preview' }).click();
  const lines = page.getByRole('list', { name: 'Malformed lines' }).getByRole('listitem');
  await expect(lines).toHaveCount(3);
  for (const [i, line] of [8, 12, 16].entries()) await expect(lines.nth(i)).toContainText(`Line ${line}:`);
  await expect(page.getByRole('button', { name: 'Import' })).toBeDisabled();
  await page.reload();
  await expect(page.getByText('This project holds 0 utterances')).toBeVisible();
  expect(foreign).toEqual([]);
});

test('cancelling an import half-way leaves nothing behind', async ({ page, baseURL }) => {
  test.setTimeout(90_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  // Big enough for many stored chunks, so Cancel lands while the import runs.
  let text = '';
  for (let i = 0; i < 120_000; i++) text += `# id = v-${i}\n# intent = book_visit\nplumber\tB-service\non\tO\nday${i}\tB-day\n\n`;
  const path = join(mkdtempSync(join(tmpdir(), 'slotsmith-e2e-')), 'visits.iob2');
  writeFileSync(path, text);
  await projectNew(page, 'Cancelled import');
  await page.getByLabel('File to bring in').setInputFiles(path);
  await page.getByRole('button', { name: 'Preview' }).click();
  await expect(page.getByTestId('preview-utterances')).toHaveText(fmt(120_000));
  await page.getByRole('button', { name: 'Import' }).click();
  const progress = page.getByRole('progressbar', { name: 'Import progress' });
  await expect(progress).toBeVisible();
  await expect(page.getByText(/^[1-9][\d,]* of 120,000 utterances$/)).toBeVisible({ timeout: 30_000 });
  await page.getByRole('button', { name: 'Cancel' }).click();
  // Cancel takes effect between two stored chunks, then the rollback runs before the message shows.
  await expect(page.getByRole('alert')).toContainText('cancelled', { timeout: 30_000 });
  await page.reload();
  await expect(page.getByText('This project holds 0 utterances')).toBeVisible();
  const batches = await page.evaluate(
    () =>
      new Promise<string[]>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const get = open.result.transaction('batches').objectStore('batches').getAll();
          get.onsuccess = () => resolve((get.result as { state: string }[]).map((b) => b.state));
        };
      }),
  );
  expect(batches).toEqual(['cancelled']);
  expect(foreign).toEqual([]);
});

test("a second annotator's file of the same utterances: the summary says how many only got a layer", async ({ page, baseURL }) => {
  const foreign = watchOrigins(page, baseURL ?? '');
  const a = columnsRead(readFileSync(ANN_A)).utterances;
  const b = columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances;
  const idsA = new Set(a.map((u) => u.id));
  const shared = b.filter((u) => idsA.has(u.id)).length;
  expect(shared).toBeGreaterThan(0);
  await projectNew(page, 'Two annotators');
  for (const [file, who, count] of [[ANN_A, 'ann-a', a.length], ['sample-corpus/ann-b.iob2', 'ann-b', b.length]] as const) {
    await page.getByLabel('File to bring in').setInputFiles(file);
    await page.getByLabel('Whose labels are these?').fill(who);
    await page.getByRole('button', { name: 'Preview' }).click();
    await page.getByRole('button', { name: 'Import' }).and(page.locator(':enabled')).click();
    await expect(page.getByText(`Stored ${fmt(count)} utterances`)).toBeVisible();
  }
  await expect(page.getByTestId('import-attached')).toHaveText(
    `${fmt(shared)} of them were already in the project (same id, text and tokens): they only got a layer by ann-b; ${fmt(b.length - shared)} are new.`,
  );
  await expect(page.getByText(`This project holds ${fmt(a.length + b.length - shared)} utterances`)).toBeVisible();
  expect(foreign).toEqual([]);
});

test('the demo project is one click away, with both annotators’ layers', async ({ page, baseURL }) => {
  const foreign = watchOrigins(page, baseURL ?? '');
  const a = expected('sample-corpus/ann-a.iob2').utterances;
  const b = expected('sample-corpus/ann-b.iob2').utterances;
  // ann-b attaches its layers to the utterances ann-a already brought in under the same id.
  const idsA = new Set(columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances.map((u) => u.id));
  const shared = columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances.filter((u) => idsA.has(u.id)).length;
  expect(shared).toBeGreaterThan(0);
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await expect(page.getByRole('heading', { name: 'Utterances: Home-repair demo' })).toBeVisible();
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Bring in data' }).click();
  await expect(page.getByRole('heading', { name: 'Bring in data to Home-repair demo' })).toBeVisible();
  await expect(page.getByText(`This project holds ${fmt(a + b - shared)} utterances`)).toBeVisible();
  const stored = await page.evaluate(
    () =>
      new Promise<{ layers: Record<string, number>; twoLayers: number }>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const get = open.result.transaction('layers').objectStore('layers').getAll();
          get.onsuccess = () => {
            const layers: Record<string, number> = {};
            const perUtterance = new Map<number, number>();
            for (const l of get.result as { annotator: string; utteranceId: number }[]) {
              layers[l.annotator] = (layers[l.annotator] ?? 0) + 1;
              perUtterance.set(l.utteranceId, (perUtterance.get(l.utteranceId) ?? 0) + 1);
            }
            resolve({ layers, twoLayers: [...perUtterance.values()].filter((n) => n === 2).length });
          };
        };
      }),
  );
  expect(stored).toEqual({ layers: { 'ann-a': a, 'ann-b': b }, twoLayers: shared });
  expect(foreign).toEqual([]);
});
