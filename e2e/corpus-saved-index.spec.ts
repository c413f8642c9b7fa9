import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { columnsRead } from '../src/core/formats';
import { transitionsValidate } from '../src/core/rules';
import { watchOrigins } from './helpers';

// The reference: the core reader and rule checker run in Node on the same file. Every slot and
// intent of the file is added to the (empty) schema on import, so only illegal transitions count.
const A = columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances;
const withProblems = A.filter((u) => transitionsValidate(u.tags, 'iob2').length > 0);
const fmt = (n: number) => n.toLocaleString('en');
const SLOW = 60_000;

/** A full page load (a new document and a new table worker), not a change of the URL's hash. */
async function load(page: Page, url: string): Promise<void> {
  await page.goto('about:blank');
  await page.goto(url);
}

/** The table's own step marks of this page load (see corpusMark), without their prefix. */
async function steps(page: Page): Promise<string[]> {
  return page.evaluate(() =>
    performance
      .getEntriesByType('mark')
      .map((m) => m.name)
      .filter((name) => name.startsWith('slotsmith-corpus:'))
      .map((name) => name.slice('slotsmith-corpus:'.length)),
  );
}

test('the first visit after an import answers a filter from the index the import saved; after an edit, never a stale one', async ({ page, baseURL }) => {
  test.setTimeout(180_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  expect(withProblems.length).toBeGreaterThan(0);
  await page.addInitScript(() => {
    localStorage.setItem('slotsmith.session', JSON.stringify({ profile: { id: 'ann-a', name: 'Ann A', role: 'adjudicator' }, blind: false }));
  });
  await page.goto('/');
  await page.getByLabel('New project name').fill('Saved index');
  await page.getByRole('button', { name: 'Create project' }).click();
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Bring in data' }).click();
  await page.getByLabel('File to bring in').setInputFiles('sample-corpus/ann-a.iob2');
  await expect(page.getByLabel('Whose labels are these?')).toHaveValue('ann-a');
  await page.getByRole('button', { name: 'Preview' }).click();
  await expect(page.getByTestId('preview-utterances')).toHaveText(fmt(A.length));
  await page.getByRole('button', { name: 'Import' }).click();
  await expect(page.getByText(`Stored ${fmt(A.length)} utterances`)).toBeVisible({ timeout: SLOW });
  const projectId = Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
  const table = `/#/p/${projectId}/corpus`;

  // A full page load with a filter: the worker finds the saved index (no build) and filters with it.
  await load(page, `${table}?problems=1`);
  const count = page.getByTestId('corpus-count');
  await expect(count).toHaveText(`Showing ${fmt(withProblems.length)} of ${fmt(A.length)} utterances`, { timeout: SLOW });
  const seen = await steps(page);
  expect(seen).toContain('warm-stored');
  expect(seen).not.toContain('answer-built');
  const rows = page.getByRole('table', { name: 'Utterances' }).locator('[role=row][aria-rowindex]');
  await expect(rows.filter({ has: page.locator('[role=cell]', { hasText: withProblems[0]?.id ?? '?' }) })).toHaveCount(1);

  // An edit: the first utterance with a problem gets flagged on the Label screen.
  await page.getByRole('table', { name: 'Utterances' }).locator('[role=row][aria-rowindex="2"]').click();
  await expect(page).toHaveURL(/#\/p\/\d+\/label\?u=\d+$/);
  await page.getByRole('radio', { name: 'Flagged for a second look' }).check();
  await expect(page.getByText(/^Saved \(revision \d+\)\.$/)).toBeVisible();

  // A new page load: the saved copy is older than the edit, so it is not shown as it was.
  await load(page, `${table}?status=flagged`);
  await expect(count).toHaveText(`Showing 1 of ${fmt(A.length)} utterances`, { timeout: SLOW });
  await expect(rows.nth(1).locator('[role=cell]').first()).toHaveText(withProblems[0]?.id ?? '?');
  await load(page, `${table}?problems=1&status=done`);
  await expect(count).toHaveText(`Showing ${fmt(withProblems.length - 1)} of ${fmt(A.length)} utterances`, { timeout: SLOW });
  expect(foreign).toEqual([]);
});
