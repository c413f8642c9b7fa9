import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { columnsRead } from '../src/core/formats';
import { spansFromTags } from '../src/core/schemes';
import { watchOrigins } from './helpers';

const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];
// The demo import runs two files through the worker on a shared machine.
const SLOW = 60_000;
const fmt = (n: number) => n.toLocaleString('en');

/** The reference counts: the demo's source files read by the core reader in Node. */
function slotCountsInFiles(slot: string) {
  let spans = 0;
  let layers = 0;
  for (const file of ['sample-corpus/ann-a.iob2', 'sample-corpus/ann-b.iob2']) {
    for (const u of columnsRead(readFileSync(file)).utterances) {
      const n = spansFromTags(u.tags).filter((s) => s.slot === slot).length;
      spans += n;
      if (n > 0) layers++;
    }
  }
  return { spans, layers };
}

async function axeClean(page: Page) {
  const results = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  const serious = results.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
  expect(serious.map((v) => `${v.id}: ${v.help}`)).toEqual([]);
}

async function schemaScreen(page: Page) {
  await page.getByRole('button', { name: 'Slots and intents' }).click();
  await expect(page.getByRole('heading', { name: /^Slots and intents: / })).toBeVisible();
}

test('slots and intents added by keyboard only survive a reload; mistakes are shown beside the field', async ({ page, baseURL }) => {
  const foreign = watchOrigins(page, baseURL ?? '');
  await page.goto('/');
  await page.getByLabel('New project name').fill('Gutter cleaning');
  await page.getByRole('button', { name: 'Create project' }).click();
  await schemaScreen(page);

  const name = page.getByLabel('Slot name');
  const key = page.getByLabel('Shortcut key');
  await name.focus();
  // Enter in the name field adds the slot with the proposed key and colour.
  await page.keyboard.type('area.from');
  await expect(key).toHaveValue('a');
  await page.keyboard.press('Enter');
  await expect(page.getByRole('status')).toHaveText('Added slot area.from.');
  await expect(name).toBeFocused();
  await expect(name).toHaveValue('');

  // A name with a space is refused next to the field, and focus goes there.
  await page.keyboard.type('time window');
  await page.keyboard.press('Enter');
  await expect(name).toHaveAttribute('aria-invalid', 'true');
  await expect(page.getByText('A slot name cannot contain spaces')).toBeVisible();
  await expect(name).toBeFocused();
  await page.keyboard.press('ControlOrMeta+a');
  await page.keyboard.type('time_window');
  // A reserved key is refused too: z is the editor's.
  await page.keyboard.press('Tab');
  await expect(key).toBeFocused();
  await page.keyboard.press('ControlOrMeta+a');
  await page.keyboard.type('z');
  await page.keyboard.press('Enter');
  await expect(key).toHaveAttribute('aria-invalid', 'true');
  await expect(page.getByText('kept for the labelling screen')).toBeVisible();
  await expect(key).toBeFocused();
  await page.keyboard.press('ControlOrMeta+a');
  await page.keyboard.type('w');
  // Into the colour swatches: the proposed one is checked; an arrow key picks the next.
  await page.keyboard.press('Tab');
  const proposed = page.getByRole('radio', { name: 'sky blue' });
  await expect(proposed).toBeFocused();
  await expect(proposed).toBeChecked();
  await page.keyboard.press('ArrowRight');
  await expect(page.getByRole('radio', { name: 'bluish green' })).toBeChecked();
  await page.keyboard.press('Shift+Tab');
  await page.keyboard.press('Enter');
  await expect(page.getByRole('status')).toHaveText('Added slot time_window.');

  const intentName = page.getByLabel('Intent name');
  await intentName.focus();
  for (const intent of ['book_visit', 'cancel']) {
    await page.keyboard.type(intent);
    await page.keyboard.press('Enter');
    await expect(page.getByRole('status')).toHaveText(`Added intent ${intent}.`);
  }
  // Limit time_window to book_visit, through the edit form.
  await page.getByRole('button', { name: 'Edit slot time_window' }).focus();
  await page.keyboard.press('Enter');
  const edit = page.getByRole('form', { name: 'Edit slot time_window' });
  await edit.getByRole('checkbox', { name: 'book_visit' }).focus();
  await page.keyboard.press('Space');
  await edit.getByLabel('Description and guideline').focus();
  await page.keyboard.type('When in the day the visit should be.');
  await edit.getByRole('button', { name: 'Save slot' }).focus();
  await page.keyboard.press('Enter');
  await expect(page.getByRole('status')).toHaveText('Saved slot time_window.');

  await page.reload();
  const slots = page.getByRole('list', { name: 'Slots' }).getByRole('listitem').filter({ has: page.locator('.schema-item-head') });
  await expect(slots).toHaveCount(2);
  await expect(slots.nth(0)).toContainText('area.from');
  await expect(slots.nth(0)).toContainText('key a · orange · any intent');
  await expect(slots.nth(1)).toContainText('time_window');
  await expect(slots.nth(1)).toContainText('key w · bluish green · only with book_visit');
  await expect(slots.nth(1)).toContainText('When in the day the visit should be.');
  await expect(page.getByRole('list', { name: 'Intents' })).toContainText('book_visit');
  await expect(page.getByRole('list', { name: 'Intents' })).toContainText('cancel');
  await axeClean(page);
  expect(foreign).toEqual([]);
});

test('renaming a slot in use in the demo project says how many labels change and rewrites every layer', async ({ page, baseURL }) => {
  test.setTimeout(180_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  const want = slotCountsInFiles('area');
  expect(want.spans).toBeGreaterThan(0);
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  // The project opens once both files are stored.
  await expect(page.getByRole('button', { name: 'Slots and intents' })).toBeVisible({ timeout: SLOW });
  await schemaScreen(page);

  await page.getByRole('button', { name: 'Rename slot area', exact: true }).click();
  await page.getByLabel('New name for slot area').fill('area.from');
  await page.getByRole('button', { name: 'Continue' }).click();
  const confirm = page.getByRole('alertdialog');
  await expect(confirm).toContainText(`Rename slot area to area.from? This changes ${fmt(want.spans)} spans in ${fmt(want.layers)} layers (ann-a, ann-b)`, { timeout: SLOW });
  await axeClean(page);
  await page.getByRole('button', { name: 'Rename everywhere' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Renamed slot area' })).toHaveText(
    `Renamed slot area to area.from: ${fmt(want.spans)} spans in ${fmt(want.layers)} layers (ann-a, ann-b) changed.`,
    { timeout: SLOW },
  );
  await expect(page.getByRole('button', { name: 'Rename slot area', exact: true })).toHaveCount(0);

  // The stored layers now hold area.from: asking to delete it counts the same labels (then keeps them).
  await page.reload();
  await page.getByRole('button', { name: 'Delete slot area.from' }).click();
  await expect(page.getByRole('alertdialog')).toContainText(`This affects ${fmt(want.spans)} spans in ${fmt(want.layers)} layers (ann-a, ann-b)`, { timeout: SLOW });
  await page.getByRole('button', { name: 'Keep it' }).click();
  await expect(page.getByRole('button', { name: 'Delete slot area.from' })).toBeFocused();

  // The export of ann-a's layers carries the new name, never the old one.
  await page.getByRole('button', { name: 'Write out data' }).click();
  await page.getByRole('radio', { name: 'One annotator', exact: true }).check();
  await page.getByRole('combobox', { name: 'Annotator', exact: true }).selectOption('ann-a');
  for (const status of ['done', 'draft', 'flagged', 'skipped']) {
    const box = page.getByRole('checkbox', { name: new RegExp(`^${status}`) });
    if (!(await box.isChecked())) await box.check();
  }
  await page.getByRole('button', { name: 'Write', exact: true }).click();
  const asIs = page.getByRole('button', { name: 'Write them as they are' });
  const links = page.getByRole('list', { name: 'Files to save' }).getByRole('link');
  await expect(asIs.or(links.first())).toBeVisible({ timeout: SLOW });
  if (await asIs.isVisible()) await asIs.click();
  await expect(links).toHaveCount(1, { timeout: SLOW });
  const [download] = await Promise.all([page.waitForEvent('download'), links.first().click()]);
  const written = columnsRead(readFileSync(await download.path()));
  const source = columnsRead(readFileSync('sample-corpus/ann-a.iob2'));
  const count = (doc: typeof written, slot: string) => doc.utterances.reduce((n, u) => n + spansFromTags(u.tags).filter((s) => s.slot === slot).length, 0);
  expect(written.utterances.length).toBe(source.utterances.length);
  expect(count(written, 'area')).toBe(0);
  expect(count(written, 'area.from')).toBe(count(source, 'area'));
  expect(foreign).toEqual([]);
});

test('the labeller profile is chosen in the header without blocking the screen, and persists', async ({ page, baseURL }) => {
  const foreign = watchOrigins(page, baseURL ?? '');
  await page.goto('/');
  await expect(page.getByText('No labeller chosen')).toBeVisible();
  // The projects screen stays usable while nobody is chosen.
  await expect(page.getByLabel('New project name')).toBeEditable();
  await page.getByRole('button', { name: 'Choose who is labelling' }).click();
  const panel = page.getByRole('region', { name: 'Who is labelling' });
  await expect(panel.getByLabel('Your name')).toBeFocused();
  await page.keyboard.type('Rosa Martín');
  await expect(panel.getByLabel('Id written into your labels')).toHaveValue('rosa-martín');
  await axeClean(page);
  // A reserved id is refused beside the field.
  await panel.getByLabel('Id written into your labels').fill('gold');
  await panel.getByRole('button', { name: 'Start labelling' }).click();
  await expect(panel.getByText('“gold” is kept for the agreed labels')).toBeVisible();
  await expect(panel.getByLabel('Id written into your labels')).toBeFocused();
  await panel.getByLabel('Id written into your labels').fill('rosa');
  await panel.getByRole('radio', { name: /^Adjudicator/ }).check();
  await panel.getByRole('button', { name: 'Start labelling' }).click();
  await expect(page.getByText('Labelling as Rosa Martín (rosa, adjudicator)')).toBeVisible();
  await expect(page.getByRole('button', { name: 'Change who is labelling' })).toBeFocused();

  // Blind mode: off by default for adjudicators; switched on here, it survives a reload.
  await page.getByRole('button', { name: 'Change who is labelling' }).click();
  const blind = panel.getByRole('checkbox', { name: 'Blind mode' });
  await expect(blind).not.toBeChecked();
  await expect(blind).toHaveAccessibleDescription(/Hides other people’s labels/);
  await blind.check();
  await axeClean(page);
  await page.keyboard.press('Escape');
  await expect(panel).toHaveCount(0);
  await page.reload();
  await expect(page.getByText('Labelling as Rosa Martín (rosa, adjudicator), blind mode on')).toBeVisible();
  expect(foreign).toEqual([]);
});
