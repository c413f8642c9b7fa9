import { statSync } from 'node:fs';
import type { Page } from '@playwright/test';

// 100k utterances on a shared 2-core machine: waits are long, and a stuck step still ends the run.
const LONG = 20 * 60_000;
const fmt = (n: number) => n.toLocaleString('en');

export interface ImportResult {
  utterances: number;
  seconds: number;
  previewSeconds: number;
  annotator: string;
}

/** The real UI path: new project, choose the file, Preview, Import, until the summary shows. */
export async function appImport(page: Page, url: string, file: string, projectName: string): Promise<ImportResult> {
  await page.goto(url);
  await page.getByLabel('New project name').fill(projectName);
  await page.getByRole('button', { name: 'Create project' }).click();
  // A new project may open on another screen: go to the import screen by the header's button.
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Bring in data' }).click();
  await page.getByRole('heading', { name: `Bring in data to ${projectName}` }).waitFor();
  await page.getByLabel('File to bring in').setInputFiles(file);
  const annotator = 'ann-bench';
  await page.getByLabel('Whose labels are these?').fill(annotator);
  const previewStarted = performance.now();
  await page.getByRole('button', { name: 'Preview' }).click();
  const count = page.getByTestId('preview-utterances');
  await page.getByRole('button', { name: 'Import' }).and(page.locator(':enabled')).waitFor({ timeout: LONG });
  await count.waitFor({ timeout: LONG });
  const previewSeconds = (performance.now() - previewStarted) / 1000;
  const utterances = Number((await count.innerText()).replace(/,/g, ''));
  const started = performance.now();
  await page.getByRole('button', { name: 'Import' }).click();
  const done = page.getByText(`Stored ${fmt(utterances)} utterances`);
  const failed = page.getByRole('alert');
  await done.or(failed).first().waitFor({ timeout: LONG });
  const seconds = (performance.now() - started) / 1000;
  if (await failed.isVisible()) throw new Error(`import failed: ${await failed.innerText()}`);
  return { utterances, seconds, previewSeconds, annotator };
}

export interface HeapResult {
  pageMb: number;
  pageTotalMb: number;
  memoryApiMb: number | null;
  workers: number;
}

/** The page's JS heap after a forced collection (CDP); workers have heaps of their own, not counted here. */
export async function heapAfterGc(page: Page): Promise<HeapResult> {
  const cdp = await page.context().newCDPSession(page);
  await cdp.send('HeapProfiler.enable');
  await cdp.send('HeapProfiler.collectGarbage');
  const usage = await cdp.send('Runtime.getHeapUsage');
  await cdp.detach();
  const memoryApi = await page.evaluate(() => {
    const g = globalThis as { gc?: () => void; performance: { memory?: { usedJSHeapSize: number } } };
    g.gc?.();
    return g.performance.memory?.usedJSHeapSize ?? null;
  });
  const mb = (b: number) => b / (1024 * 1024);
  return { pageMb: mb(usage.usedSize), pageTotalMb: mb(usage.totalSize), memoryApiMb: memoryApi === null ? null : mb(memoryApi), workers: page.workers().length };
}

export interface ExportResult {
  seconds: number;
  bytes: number;
  refused: boolean;
}

/** "Write out data": one annotator's done layers as IOB2; a refusal (illegal sequences) is written as is, timed to the end. */
export async function appExport(page: Page, annotator: string): Promise<ExportResult> {
  await page.getByRole('button', { name: 'Write out data' }).first().click();
  await page.getByRole('heading', { name: 'Write out data' }).waitFor();
  await page.getByRole('radio', { name: 'One annotator', exact: true }).check();
  await page.getByRole('group', { name: 'Whose labels' }).locator('select').selectOption(annotator);
  for (const box of await page.getByRole('checkbox', { name: /^(unlabelled|draft|flagged|skipped)/ }).all()) await box.uncheck();
  await page.getByRole('checkbox', { name: /^done/ }).check();
  await page.getByRole('radio', { name: 'IOB2 columns', exact: true }).check();
  const links = page.getByRole('list', { name: 'Files to save' }).getByRole('link');
  const refusal = page.getByRole('heading', { name: 'Nothing written: illegal tag sequences' });
  const started = performance.now();
  await page.getByRole('button', { name: 'Write', exact: true }).click();
  await links.first().or(refusal).waitFor({ timeout: LONG });
  const refused = await refusal.isVisible();
  if (refused) {
    await page.getByRole('button', { name: 'Write them as they are' }).click();
    await links.first().waitFor({ timeout: LONG });
  }
  const seconds = (performance.now() - started) / 1000;
  const [download] = await Promise.all([page.waitForEvent('download'), links.first().click()]);
  const bytes = statSync(await download.path()).size;
  return { seconds, bytes, refused };
}
