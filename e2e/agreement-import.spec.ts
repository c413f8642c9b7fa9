import { expect, test, type Page } from '@playwright/test';
import { spawnSync } from 'node:child_process';
import { watchOrigins } from './helpers';

// Two annotators' files of the invented sample corpus (ann-a and ann-b overlap on 400 utterances by id).
const FILES = ['sample-corpus/ann-a.iob2', 'sample-corpus/ann-b.iob2'] as const;
const SLOW = 60_000;

/** The real command line on the same files: the reference for the figures. */
function agree(): { utterances: number; kappa: { tag: number; slot: number } } {
  const run = spawnSync(process.execPath, ['bin/slotsmith.mjs', 'agree', '--json', ...FILES], { maxBuffer: 64 * 1024 * 1024 });
  expect(run.status).toBe(0);
  return JSON.parse(run.stdout.toString('utf8')) as { utterances: number; kappa: { tag: number; slot: number } };
}

async function fileImport(page: Page, file: string, annotator: string): Promise<void> {
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Bring in data' }).click();
  await page.getByLabel('File to bring in').setInputFiles(file);
  // The screen keeps the last name given: the person types whose labels these are.
  await page.getByLabel('Whose labels are these?').fill(annotator);
  await page.getByRole('button', { name: 'Preview' }).click();
  await expect(page.getByTestId('preview-utterances')).toHaveText('1,200');
  await page.getByRole('button', { name: 'Import' }).click();
  await expect(page.getByText('Stored 1,200 utterances')).toBeVisible({ timeout: SLOW });
}

test('after two annotators’ files are imported, the first dashboard run takes the layer copies the imports left, and its figures equal a full recomputation', async ({ page, baseURL }) => {
  test.setTimeout(180_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  const cli = agree();
  await page.goto('/');
  await page.getByLabel('New project name').fill('Two annotators');
  await page.getByRole('button', { name: 'Create project' }).click();
  await fileImport(page, FILES[0], 'ann-a');
  await fileImport(page, FILES[1], 'ann-b');
  await expect(page.getByTestId('import-attached')).toContainText('400 of them were already in the project');

  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Agreement' }).click();
  await expect(page.getByLabel('Layer A')).toHaveValue('ann-a');
  await expect(page.getByLabel('Layer B')).toHaveValue('ann-b');
  const compared = page.getByTestId('agreement-compared');
  await expect(compared).toHaveAttribute('data-pending', 'false', { timeout: SLOW });
  await expect(compared).toHaveAttribute('data-kept', 'false');
  await expect(compared).toContainText(`Compared ${cli.utterances} utterances`);
  // The copies were loaded at the project's signature as the imports left them: no layer was read.
  const steps = (await compared.getAttribute('data-steps')) ?? '';
  expect(steps).toContain('copies load');
  expect(steps).not.toContain('copies read');
  const figures = async () => ({
    tag: await page.getByTestId('figure-kappa-tag').textContent(),
    slot: await page.getByTestId('figure-kappa-slot').textContent(),
    rows: await page.getByRole('row', { name: /Token kappa|Span F1|Intent kappa/ }).allTextContents(),
  });
  const first = await figures();
  // The command line's figures on the same files (three decimals, as the screen rounds).
  expect(first.slot).toBe(cli.kappa.slot.toFixed(3));
  expect(first.tag).toBe(cli.kappa.tag.toFixed(3));

  // "Compute again" reads every layer: the same figures and intervals.
  await page.getByRole('button', { name: 'Compute again' }).click();
  await expect(compared).toHaveAttribute('data-pending', 'false', { timeout: SLOW });
  expect(await compared.getAttribute('data-steps')).toContain('copies read');
  expect(await figures()).toEqual(first);
  expect(foreign).toEqual([]);
});
