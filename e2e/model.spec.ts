import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { crfModelFromJson } from '../src/core/crf';
import { columnsRead } from '../src/core/formats';
import { spansFromTags } from '../src/core/schemes';
import { watchOrigins } from './helpers';

const SLOW = 120_000;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

/** The reference: the demo's utterances read in Node; every demo layer is done, so each one trains. */
const a = columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances;
const b = columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances;
const idsA = new Set(a.map((u) => u.id));
const TRAINED = a.length + b.filter((u) => !idsA.has(u.id)).length;
// ann-a comes first by name, so its layer is the one used where both finished an utterance.
const SLOTS = [...new Set([...a, ...b.filter((u) => !idsA.has(u.id))].flatMap((u) => spansFromTags(u.tags).map((s) => s.slot)))].sort();

/** Invented requests with no labels yet: the utterances the model pre-labels. */
const FRESH = [
  'can someone fix my boiler on tuesday',
  'need an electrician in north end this weekend',
  'how much for a plumber to unblock a sink',
  'please cancel the gutter cleaning on friday',
  'is my roofer still coming tomorrow morning',
  'book a painter for the hallway next monday',
  'my tap is dripping can you come after 5pm',
  'what does it cost to replace a fuse box',
  'move my visit to thursday afternoon',
  'call me on 555-0148 about the leak',
  'any chance of a handyman in riverside today',
  'status of the carpenter booked for saturday',
];

async function demoModel(page: Page) {
  await page.addInitScript(() => localStorage.setItem('slotsmith.session', JSON.stringify({ profile: { id: 'lead', name: 'Lead', role: 'adjudicator' }, blind: false })));
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  const screens = page.getByRole('navigation', { name: 'Screens' });
  await screens.getByRole('button', { name: 'Bring in data' }).click({ timeout: SLOW });
  const file = join(mkdtempSync(join(tmpdir(), 'slotsmith-model-')), 'fresh.txt');
  writeFileSync(file, `${FRESH.join('\n')}\n`);
  await page.getByLabel('File to bring in').setInputFiles(file);
  await page.getByLabel('Format').selectOption('text');
  await page.getByRole('button', { name: 'Preview' }).click();
  await page.getByRole('button', { name: 'Import' }).and(page.locator(':enabled')).click();
  await expect(page.getByText(`Stored ${FRESH.length} utterances`)).toBeVisible({ timeout: SLOW });
  await screens.getByRole('button', { name: 'Model' }).click();
  await expect(page.getByRole('heading', { name: 'Model: Home-repair demo' })).toBeVisible();
}

test('train with cross-validation, read the per-slot table, pre-label the unlabelled, follow the least-sure queue', async ({ page, baseURL }) => {
  test.setTimeout(300_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  expect(SLOTS.length).toBeGreaterThan(3);
  await demoModel(page);
  await expect(page.getByRole('button', { name: 'Pre-label unlabelled utterances' })).toBeDisabled();

  // Cancel stops the run in its worker: nothing is saved, the form is back.
  await page.getByLabel('Iterations').fill('500');
  await page.getByRole('button', { name: 'Train the model' }).click();
  await expect(page.getByText(/Cross-validating, fold 1 of 5: iteration \d+ of at most 500/)).toBeVisible({ timeout: SLOW });
  await expect(page.getByRole('progressbar', { name: 'Training progress' })).toBeVisible();
  await page.getByRole('button', { name: 'Cancel training' }).click();
  await expect(page.getByRole('button', { name: 'Train the model' })).toBeEnabled();
  await expect(page.getByText('No model is saved in this project yet.')).toBeVisible();

  await page.getByLabel('Iterations').fill('5');
  await page.getByLabel('Folds for cross-validation').fill('2');
  await page.getByRole('button', { name: 'Train the model' }).click();
  await expect(page.locator('.model-used')).toHaveText(
    `${TRAINED.toLocaleString('en')} utterances used: 0 from the gold layer, ${TRAINED.toLocaleString('en')} from an annotator's done layer (where several annotators finished one, the first by name).`,
  );
  await expect(page.getByText('Trained and saved in the project.')).toBeVisible({ timeout: SLOW });
  const table = page.getByRole('table', { name: 'Span F1 per slot' });
  await expect(table).toBeVisible();
  await expect(table.locator('caption')).toContainText(`2-fold cross-validation over ${TRAINED.toLocaleString('en')} utterances`);
  // Every slot of the training data has a row (predicted-only slots may add rows, never remove one).
  const rowSlots = await table.locator('tbody th').allInnerTexts();
  for (const slot of SLOTS) expect(rowSlots).toContain(slot);
  await expect(page.locator('.model-reading')).toContainText('On utterances it had not seen');
  await expect(page.locator('.model-info')).toContainText(`Trained here`);

  const axe = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`)).toEqual([]);

  // The download is a model file the core reads back.
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download the model file' }).click()]);
  const path = await download.path();
  const model = crfModelFromJson(readFileSync(path, 'utf8'));
  expect(model.training.utterances).toBe(TRAINED);
  expect(model.labels).toContain(`B-${SLOTS[0]}`);

  await page.getByRole('button', { name: 'Pre-label unlabelled utterances' }).click();
  await expect(page.getByText(`${FRESH.length} utterances tagged.`)).toBeVisible({ timeout: SLOW });
  await expect(page.locator('.model-count')).toHaveText(`The model layer holds suggestions for ${FRESH.length} utterances.`);
  const queue = page.getByRole('list', { name: 'Least sure first' });
  await expect(queue.getByRole('link')).toHaveCount(FRESH.length);
  const scores = (await queue.locator('.model-score').allInnerTexts()).map(Number);
  expect(scores).toEqual([...scores].sort((x, y) => y - x));
  expect(new Set(await queue.getByRole('link').allInnerTexts())).toEqual(new Set(FRESH));

  const axeAfter = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axeAfter.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`)).toEqual([]);

  // The model and its figures survive a reload; loading the downloaded file back replaces it.
  await page.reload();
  await expect(page.getByRole('table', { name: 'Span F1 per slot' })).toBeVisible();
  await page.getByLabel('Load a model file').setInputFiles(path);
  await expect(page.getByRole('status').filter({ hasText: 'and saved it in the project.' })).toBeVisible();
  await expect(page.locator('.model-info')).toContainText('Loaded from a file');

  const first = queue.getByRole('link').first();
  await first.click();
  // The label screen opens in the same order, so "next not started" goes on down the list.
  await expect(page).toHaveURL(/#\/p\/\d+\/label\?order=uncertain&u=\d+$/);
  await expect(page.getByRole('radio', { name: /least sure first/ })).toBeChecked();
  expect(foreign).toEqual([]);
});
