import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { columnsRead } from '../src/core/formats';
import { spansFromTags } from '../src/core/schemes';
import { watchOrigins } from './helpers';

// The demo project is built from these two files (src/ui/features/import/demo-load.ts), each with
// status done; the test checks below that the app serves exactly these bytes for its demo.
const FILES = ['sample-corpus/ann-a.iob2', 'sample-corpus/ann-b.iob2'] as const;
const SLOW = 60_000;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

interface AgreeJson {
  utterances: number;
  kappa: { tag: number; slot: number; slotAnnotated: number };
  intent: { kappa: number };
  spans: { exactF1: number; overlapF1: number };
  disagreements: { total: number; items: { id: string }[] };
  ci: { kappa: { slot: { low: number; high: number } } };
}

/** The real command line on the same layers, as a user would run it. */
function agree(): AgreeJson {
  const run = spawnSync(process.execPath, ['bin/slotsmith.mjs', 'agree', '--json', ...FILES], { maxBuffer: 64 * 1024 * 1024 });
  expect(run.status).toBe(0);
  return JSON.parse(run.stdout.toString('utf8')) as AgreeJson;
}

/** As the screen rounds: three decimals. */
const shown = (x: number) => x.toFixed(3);

function axeSerious(page: Page) {
  return new AxeBuilder({ page })
    .withTags(AXE_TAGS)
    .analyze()
    .then((r) => r.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(', ')})`));
}

async function demoOpen(page: Page) {
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await expect(page.getByRole('heading', { name: 'Utterances: Home-repair demo' })).toBeVisible({ timeout: SLOW });
}

test('the agreement screen shows the command line’s figures for the demo layers', async ({ page, baseURL, request }) => {
  test.setTimeout(180_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  // The demo's files are the sample corpus, byte for byte.
  for (const file of FILES) {
    const served = await request.get(`/demo/${file.split('/').pop() ?? ''}`);
    expect(served.ok()).toBe(true);
    expect(Buffer.from(await served.body()).equals(readFileSync(file))).toBe(true);
  }
  const cli = agree();
  expect(cli.utterances).toBe(400);

  await demoOpen(page);
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Agreement' }).click();
  await expect(page.getByRole('heading', { name: 'Agreement: Home-repair demo' })).toBeVisible();
  await expect(page.getByLabel('Layer A')).toHaveValue('ann-a');
  await expect(page.getByLabel('Layer B')).toHaveValue('ann-b');
  await expect(page.getByTestId('figure-kappa-slot')).toHaveText(shown(cli.kappa.slot), { timeout: SLOW });
  await expect(page.getByTestId('figure-span-exact')).toHaveText(shown(cli.spans.exactF1));
  await expect(page.getByTestId('figure-span-overlap')).toHaveText(shown(cli.spans.overlapF1));
  await expect(page.getByTestId('figure-kappa-tag')).toHaveText(shown(cli.kappa.tag));
  await expect(page.getByTestId('figure-kappa-annotated')).toHaveText(shown(cli.kappa.slotAnnotated));
  await expect(page.getByTestId('figure-kappa-intent')).toHaveText(shown(cli.intent.kappa));
  // Same utterances in the same order and the same seed: the same bootstrap interval.
  const slotRow = page.getByRole('row', { name: /Token kappa, slot types/ });
  await expect(slotRow).toContainText(`${shown(cli.ci.kappa.slot.low)} to ${shown(cli.ci.kappa.slot.high)}`);
  await expect(slotRow).toContainText('almost perfect');
  await expect(page.getByText(/Landis & Koch \(1977\) bands are a convention/)).toBeVisible();
  await expect(page.getByTestId('agreement-compared')).toContainText('Compared 400 utterances');
  await expect(page.getByTestId('agreement-compared')).toContainText('status done: ann-a 1,200, ann-b 1,200');
  await expect(page.getByRole('img', { name: 'Token kappa per slot' })).toBeVisible();
  await expect(page.getByRole('img', { name: /Slot types per token/ })).toBeVisible();
  await expect(page.getByRole('img', { name: 'Slot kappa as layers were completed' })).toBeVisible();
  await expect(page.getByText(`${cli.disagreements.total} utterances differ between ann-a and ann-b`)).toBeVisible();

  expect(await axeSerious(page)).toEqual([]);

  // The top disagreement is the command line's, and it opens in the resolver on the same pair.
  const list = page.getByRole('list', { name: 'Disagreeing utterances' });
  const top = cli.disagreements.items[0]?.id ?? '';
  await expect(list.getByRole('listitem').first()).toContainText(top);
  await list.getByRole('button', { name: new RegExp(`^Resolve ${top}:`) }).click();
  await expect(page).toHaveURL(/#\/p\/\d+\/resolve\?a=ann-a&b=ann-b&u=\d+$/);
  expect(foreign).toEqual([]);
});

test('reopened with no layer changed, the screen shows the kept figures at once and says so; "Compute again" computes', async ({ page }) => {
  test.setTimeout(120_000);
  await demoOpen(page);
  const screens = page.getByRole('navigation', { name: 'Screens' });
  await screens.getByRole('button', { name: 'Agreement' }).click();
  const cli = agree();
  const compared = page.getByTestId('agreement-compared');
  await expect(compared).toHaveAttribute('data-pending', 'false', { timeout: SLOW });
  await expect(compared).toHaveAttribute('data-kept', 'false');
  await screens.getByRole('button', { name: 'Overview' }).click();
  await screens.getByRole('button', { name: 'Agreement' }).click();
  await expect(compared).toHaveAttribute('data-kept', 'true', { timeout: SLOW });
  await expect(compared).toContainText('no layer of this project has changed since');
  await expect(page.getByTestId('figure-kappa-slot')).toHaveText(shown(cli.kappa.slot));
  await page.getByRole('button', { name: 'Compute again' }).click();
  await expect(compared).toHaveAttribute('data-kept', 'false', { timeout: SLOW });
  await expect(compared).toHaveAttribute('data-pending', 'false', { timeout: SLOW });
  await expect(page.getByTestId('figure-kappa-slot')).toHaveText(shown(cli.kappa.slot));
});

test('counting drafts too changes nothing on the demo (all done) and says what was counted', async ({ page }) => {
  test.setTimeout(120_000);
  await demoOpen(page);
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Agreement' }).click();
  const cli = agree();
  await expect(page.getByTestId('figure-kappa-slot')).toHaveText(shown(cli.kappa.slot), { timeout: SLOW });
  await page.getByLabel('Count draft layers too').check();
  await expect(page).toHaveURL(/drafts=1/);
  await expect(page.getByTestId('agreement-compared')).toContainText('status done and draft', { timeout: SLOW });
  await expect(page.getByTestId('figure-kappa-slot')).toHaveText(shown(cli.kappa.slot));
  await page.getByLabel('Layer B').selectOption('ann-a');
  await expect(page.getByText('Choose two different layers to compare.')).toBeVisible();
});

test('the overview shows the demo’s distribution and progress', async ({ page, baseURL }) => {
  test.setTimeout(120_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  const layers = FILES.map((f) => columnsRead(readFileSync(f)).utterances);
  const spans = new Map<string, number>();
  for (const u of layers.flat()) for (const s of spansFromTags(u.tags)) spans.set(s.slot, (spans.get(s.slot) ?? 0) + 1);
  await demoOpen(page);
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Overview' }).click();
  await expect(page.getByRole('heading', { name: 'Overview: Home-repair demo' })).toBeVisible();
  const headline = page.getByRole('definition');
  await expect(page.getByLabel('Headline numbers')).toContainText('Utterances2,000', { timeout: SLOW });
  await expect(page.getByLabel('Headline numbers')).toContainText('Utterances done by two or more400');
  await expect(page.getByLabel('Headline numbers')).toContainText('Layers done2,400 of 2,400');
  expect(await headline.count()).toBe(6);
  await expect(page.getByRole('img', { name: 'Spans per slot' })).toBeVisible();
  await expect(page.getByRole('img', { name: 'Layers per annotator by status' })).toBeVisible();
  await page.getByText('Spans per slot as a table').click();
  const table = page.getByRole('table', { name: 'Spans per slot' });
  for (const [slot, n] of spans) await expect(table.getByRole('row', { name: new RegExp(`^${slot} `) })).toContainText(n.toLocaleString('en'));
  expect(await axeSerious(page)).toEqual([]);
  await page.getByLabel('Whose labels').selectOption('ann-b');
  await expect(page.getByText(/Counted 1,200 layers with status done of ann-b/)).toBeVisible({ timeout: SLOW });
  expect(foreign).toEqual([]);
});

test('after a label edit the figures come from patched layer copies and totals, and equal a full recomputation', async ({ page }) => {
  test.setTimeout(180_000);
  // Counts the agreement workers the page starts: it keeps one between runs (dashboard-worker.ts).
  await page.addInitScript(() => {
    const Original = window.Worker;
    const counter = window as unknown as { dashboardWorkers: number };
    counter.dashboardWorkers = 0;
    window.Worker = class extends Original {
      constructor(url: string | URL, options?: WorkerOptions) {
        super(url, options);
        if (String(url).includes('agreement-dashboard')) counter.dashboardWorkers++;
      }
    };
  });
  await demoOpen(page);
  const screens = page.getByRole('navigation', { name: 'Screens' });
  await screens.getByRole('button', { name: 'Agreement' }).click();
  const compared = page.getByTestId('agreement-compared');
  await expect(compared).toHaveAttribute('data-pending', 'false', { timeout: SLOW });
  const before = await page.getByTestId('figure-kappa-tag').textContent();
  // The top disagreement's utterance (its database id from the resolver's address).
  const list = page.getByRole('list', { name: 'Disagreeing utterances' });
  await list.getByRole('listitem').first().getByRole('button').first().click();
  await expect(page).toHaveURL(/&u=\d+$/);
  const utteranceId = Number(/&u=(\d+)$/.exec(page.url())?.[1]);
  // ann-b's layer there becomes all O, written as the label screen writes (layer and history row in one transaction).
  await page.evaluate(async (utteranceId) => {
    const db = await new Promise<IDBDatabase>((resolve, reject) => {
      const open = indexedDB.open('slotsmith');
      open.onsuccess = () => resolve(open.result);
      open.onerror = () => reject(open.error);
    });
    const tx = db.transaction(['layers', 'history'], 'readwrite');
    const get = tx.objectStore('layers').get([utteranceId, 'ann-b']);
    get.onsuccess = () => {
      const row = get.result as { projectId: number; tags: string[]; intent: string | null; status: string; note: string; revision: number; updated: number };
      const next = { ...row, tags: row.tags.map(() => 'O'), revision: row.revision + 1, updated: Date.now() };
      tx.objectStore('layers').put(next);
      const before = { tags: row.tags, intent: row.intent, status: row.status, note: row.note, revision: row.revision, updated: row.updated };
      const after = { tags: next.tags, intent: next.intent, status: next.status, note: next.note, revision: next.revision, updated: next.updated };
      tx.objectStore('history').add({ projectId: row.projectId, utteranceId, annotator: 'ann-b', before, after, who: 'ann-b', when: next.updated });
    };
    await new Promise((resolve, reject) => {
      tx.oncomplete = resolve;
      tx.onerror = () => reject(tx.error);
    });
    db.close();
  }, utteranceId);
  await screens.getByRole('button', { name: 'Agreement' }).click();
  await expect(compared).toHaveAttribute('data-pending', 'false', { timeout: SLOW });
  await expect(compared).toHaveAttribute('data-kept', 'false');
  // Taken from the kept copies (patched, not read again) and the kept totals (one utterance changed).
  const steps = (await compared.getAttribute('data-steps')) ?? '';
  expect(steps).toContain('copies patch');
  expect(steps).not.toContain('copies read');
  expect(steps).toContain('totals kept (1 utterances changed)');
  const figures = async () => ({
    tag: await page.getByTestId('figure-kappa-tag').textContent(),
    slot: await page.getByTestId('figure-kappa-slot').textContent(),
    rows: await page.getByRole('row', { name: /Token kappa|Span F1|Intent kappa/ }).allTextContents(),
  });
  const patched = await figures();
  expect(patched.tag).not.toBe(before);
  // "Compute again" reads every layer and resamples from scratch: the same figures and intervals.
  await page.getByRole('button', { name: 'Compute again' }).click();
  await expect(compared).toHaveAttribute('data-pending', 'false', { timeout: SLOW });
  expect(await compared.getAttribute('data-steps')).toContain('copies read');
  expect(await figures()).toEqual(patched);
  // Three runs (first, after the edit, "Compute again"), one worker: the page kept it between them.
  expect(await page.evaluate(() => (window as unknown as { dashboardWorkers: number }).dashboardWorkers)).toBe(1);
});
