import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { columnsRead } from '../src/core/formats';
import { schemaValidate, transitionsValidate, type LabelSchema } from '../src/core/rules';
import { spansFromTags } from '../src/core/schemes';
import type { Utterance } from '../src/core/types';
import { watchOrigins } from './helpers';

// The demo project is these two files imported in this order (ann-b attaches to ann-a's shared ids).
const A = columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances;
const B = columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances;
const corpusSchema = JSON.parse(readFileSync('sample-corpus/schema.json', 'utf8')) as { slots: { name: string }[]; intents: { name: string; slots?: string[] }[] };
// schema.json lists the slots each intent allows, read here directly (the app stores it turned per slot).
const labelSchema: LabelSchema = {
  slots: corpusSchema.slots.map((s) => s.name),
  intents: corpusSchema.intents.map((i) => i.name),
  allowedSlotsByIntent: Object.fromEntries(corpusSchema.intents.flatMap((i) => (i.slots === undefined ? [] : [[i.name, i.slots]]))),
};
const problems = (u: Utterance) => transitionsValidate(u.tags, 'iob2').length + schemaValidate(u, labelSchema).length;
const hasSlot = (u: Utterance, slot: string) => spansFromTags(u.tags).some((s) => s.slot === slot);
const byIdA = new Map(A.map((u) => [u.id, u]));
const byIdB = new Map(B.map((u) => [u.id, u]));
const stored = [...A, ...B.filter((u) => !byIdA.has(u.id))];
const differ = (a: Utterance, b: Utterance) => a.intent !== b.intent || a.tags.join(' ') !== b.tags.join(' ');

const want = {
  total: stored.length,
  area: A.filter((u) => hasSlot(u, 'area')).length,
  unlabelled: stored.length - A.length,
  done: A.length,
  problems: A.filter((u) => problems(u) > 0).length,
  boiler: stored.filter((u) => u.text.toLowerCase().includes('boiler')).length,
  differ: A.filter((u) => byIdB.has(u.id) && differ(u, byIdB.get(u.id) as Utterance)).length,
  dayProblemsB: B.filter((u) => hasSlot(u, 'day') && problems(u) > 0).length,
};
// Most rule problems first, ties in stored order: the first rows after sorting "Rule problems" descending.
const mostProblems = stored
  .map((u, i) => ({ id: u.id, n: byIdA.has(u.id) ? problems(byIdA.get(u.id) as Utterance) : 0, i }))
  .sort((x, y) => y.n - x.n || x.i - y.i)
  .slice(0, 5)
  .map((x) => x.id);

const fmt = (n: number) => n.toLocaleString('en');
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];
const SLOW = 60_000;

function count(page: Page) {
  return page.getByTestId('corpus-count');
}

async function expectShowing(page: Page, n: number) {
  await expect(count(page)).toHaveText(`Showing ${fmt(n)} of ${fmt(want.total)} utterances`, { timeout: SLOW });
}

/** The Id cells of the first `n` rows in table order, once they are read (no placeholders). */
async function firstIds(page: Page, n: number): Promise<string[]> {
  const table = page.getByRole('table', { name: 'Utterances' });
  const cells = async () =>
    table.locator('[role=row][aria-rowindex]').evaluateAll((rows, upTo) => {
      const body = rows
        .map((r) => ({ at: Number(r.getAttribute('aria-rowindex')), id: r.querySelector('[role=cell]')?.textContent ?? '' }))
        .filter((r) => r.at >= 2)
        .sort((x, y) => x.at - y.at);
      return body.slice(0, upTo).map((r) => r.id);
    }, n);
  await expect.poll(async () => (await cells()).filter((id) => id !== '' && id !== '…').length, { timeout: SLOW }).toBe(Math.min(n, want.total));
  return cells();
}

async function demoOpen(page: Page) {
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await expect(page.getByRole('heading', { name: 'Utterances: Home-repair demo' })).toBeVisible({ timeout: SLOW });
  await expectShowing(page, want.total);
}

test('the utterance table: filters, counts, URL round trip, sorting, opening a row', async ({ page, baseURL, context }) => {
  test.setTimeout(240_000);
  expect(want.area).toBeGreaterThan(0);
  expect(want.problems).toBeGreaterThan(0);
  expect(want.differ).toBeGreaterThan(0);
  const foreign = watchOrigins(page, baseURL ?? '');
  await demoOpen(page);
  const table = page.getByRole('table', { name: 'Utterances' });
  await expect(table).toHaveAttribute('aria-rowcount', String(want.total + 1));
  expect(await firstIds(page, 5)).toEqual(stored.slice(0, 5).map((u) => u.id));

  const axe = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`)).toEqual([]);

  // Without a profile the first annotator's layer (ann-a) is shown.
  await expect(page.getByLabel('Show labels of')).toHaveValue('ann-a');
  await page.getByLabel('Slot').selectOption('area');
  await expectShowing(page, want.area);
  await expect(page).toHaveURL(/slot=area/);
  await page.getByLabel('Slot').selectOption('');
  await page.getByLabel('Status').selectOption('unlabelled');
  await expectShowing(page, want.unlabelled);
  await page.getByLabel('Status').selectOption('done');
  await expectShowing(page, want.done);
  await page.getByLabel('Status').selectOption('');
  await page.getByLabel('Has rule problems').check();
  await expectShowing(page, want.problems);
  await page.getByRole('button', { name: 'Clear filters' }).click();
  await expectShowing(page, want.total);
  await page.getByLabel('Search the text').fill('BoIlEr');
  await expectShowing(page, want.boiler);
  await expect(page).toHaveURL(/q=BoIlEr/);
  await page.getByLabel('Search the text').fill('');
  await expectShowing(page, want.total);
  await page.getByLabel('Annotators differ').check();
  await expectShowing(page, want.differ);
  await page.getByLabel('Annotators differ').uncheck();

  // Another layer with two filters: the URL holds all of it; a reload and a fresh page restore it.
  await page.getByLabel('Show labels of').selectOption('ann-b');
  await page.getByLabel('Slot').selectOption('day');
  await page.getByLabel('Has rule problems').check();
  await expectShowing(page, want.dayProblemsB);
  const url = page.url();
  expect(url).toMatch(/layer=ann-b/);
  const ids = await firstIds(page, 8);
  await page.reload();
  await expectShowing(page, want.dayProblemsB);
  await expect(page.getByLabel('Slot')).toHaveValue('day');
  await expect(page.getByLabel('Has rule problems')).toBeChecked();
  expect(page.url()).toBe(url);
  expect(await firstIds(page, 8)).toEqual(ids);
  const other = await context.newPage();
  await other.goto(url);
  await expectShowing(other, want.dayProblemsB);
  expect(await firstIds(other, 8)).toEqual(ids);
  await other.close();

  // Sorting: the heading is a button; aria-sort follows; the order is what the rules give.
  await page.getByRole('button', { name: 'Clear filters' }).click();
  await page.getByLabel('Show labels of').selectOption('ann-a');
  await expectShowing(page, want.total);
  const header = table.getByRole('columnheader', { name: 'Rule problems' });
  await expect(header).toHaveAttribute('aria-sort', 'none');
  await header.getByRole('button').click();
  await expect(header).toHaveAttribute('aria-sort', 'ascending');
  await header.getByRole('button').click();
  await expect(header).toHaveAttribute('aria-sort', 'descending');
  await expect(page).toHaveURL(/sort=-violations/);
  await expect.poll(() => firstIds(page, 5), { timeout: SLOW }).toEqual(mostProblems);
  await table.getByRole('columnheader', { name: 'Id' }).getByRole('button').click();
  await expect(table.getByRole('columnheader', { name: 'Id' })).toHaveAttribute('aria-sort', 'ascending');
  await expect.poll(() => firstIds(page, 3), { timeout: SLOW }).toEqual(stored.slice(0, 3).map((u) => u.id));

  // Keyboard: arrows move the focus between rows, Enter opens the focused one for labelling.
  await table.locator('[role=row][aria-rowindex="2"]').focus();
  await page.keyboard.press('ArrowDown');
  await page.keyboard.press('ArrowDown');
  await expect(table.locator('[role=row][aria-rowindex="4"]')).toBeFocused();
  await page.keyboard.press('End');
  // A far row is rendered after the scroll; the machine may be busy.
  await expect(table.locator(`[role=row][aria-rowindex="${want.total + 1}"]`)).toBeFocused({ timeout: SLOW });
  await page.keyboard.press('Home');
  await expect(table.locator('[role=row][aria-rowindex="2"]')).toBeFocused({ timeout: SLOW });
  await page.keyboard.press('ArrowDown');
  await page.keyboard.press('ArrowDown');
  await page.keyboard.press('Enter');
  await expect(page).toHaveURL(/#\/p\/\d+\/label\?u=\d+$/);
  await expect(page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Label' })).toHaveAttribute('aria-current', 'page');
  const opened = Number(/u=(\d+)$/.exec(page.url())?.[1]);
  const externalId = await page.evaluate(
    (id) =>
      new Promise<string>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const get = open.result.transaction('utterances').objectStore('utterances').get(id);
          get.onsuccess = () => resolve((get.result as { externalId: string }).externalId);
        };
      }),
    opened,
  );
  expect(externalId).toBe(stored[2]?.id);

  // Back to the table, a click opens a row too.
  await page.goBack();
  await expectShowing(page, want.total);
  await table.locator('[role=row][aria-rowindex="3"]').click();
  await expect(page).toHaveURL(/#\/p\/\d+\/label\?u=\d+$/);
  expect(foreign).toEqual([]);
});

test('blind mode shows only the labeller’s own layer and no disagreement', async ({ page, baseURL }) => {
  test.setTimeout(120_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  await page.addInitScript(() => {
    localStorage.setItem('slotsmith.session', JSON.stringify({ profile: { id: 'ann-b', name: 'Ann B', role: 'annotator' }, blind: true }));
  });
  await demoOpen(page);
  await expect(page.getByLabel('Show labels of')).toHaveCount(0);
  await expect(page.getByLabel('Annotators differ')).toHaveCount(0);
  const table = page.getByRole('table', { name: 'Utterances' });
  await expect(table.getByRole('columnheader', { name: 'Differs' })).toHaveCount(0);
  // A shared link asking for disagreement does not filter by it here.
  await page.goto(page.url().replace(/\?.*$/, '') + '?differ=1');
  await page.reload();
  await expectShowing(page, want.total);
  // An utterance only ann-a labelled: in ann-b's blind view it has no labels and no intent.
  const aOnly = stored.findIndex((u) => !byIdB.has(u.id));
  expect(aOnly).toBeGreaterThanOrEqual(0);
  expect(aOnly).toBeLessThan(8);
  const row = table.locator(`[role=row][aria-rowindex="${aOnly + 2}"]`);
  await expect(row.getByRole('cell').nth(0)).toHaveText(stored[aOnly]?.id ?? '');
  await expect(row.locator('mark')).toHaveCount(0);
  await expect(row.getByRole('cell').nth(2)).toHaveText('none');
  // One both labelled shows ann-b's own labels.
  const both = stored.findIndex((u) => byIdB.has(u.id) && spansFromTags(byIdB.get(u.id)?.tags ?? []).length > 0);
  expect(both).toBeLessThan(8);
  const shared = table.locator(`[role=row][aria-rowindex="${both + 2}"]`);
  await expect(shared.locator('mark')).toHaveCount(spansFromTags(byIdB.get(stored[both]?.id)?.tags ?? []).length);
  await expect(shared.getByRole('cell').nth(2)).toHaveText(byIdB.get(stored[both]?.id)?.intent ?? '');
  await page.getByLabel('Status').selectOption('done');
  await expectShowing(page, B.length);
  await page.getByLabel('Slot').selectOption('area');
  await expectShowing(page, B.filter((u) => hasSlot(u, 'area')).length);
  const axe = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`)).toEqual([]);
  expect(foreign).toEqual([]);
});
