/**
 * Storage pressure: with the origin's quota squeezed to almost nothing, an edit on the label screen,
 * an import and a restore each fail with the clear "no room left" message, announced as an alert that
 * says what to do (free space, save a backup) without taking the focus, and leave the database as it was. Writes fail the way IndexedDB reports a full disk: put/add throw a DOMException named
 * QuotaExceededError (IndexedDB 3.0, "store a record into an object store"). In the page an init
 * script patches IDBObjectStore; the import and restore workers get the same patch prepended to their
 * script (the service worker is blocked so every script comes through the route), failing after N
 * writes so the failure lands mid-way. (Chromium's own quota override through the DevTools protocol,
 * Storage.overrideQuotaForOrigin, was tried first: headless Chromium kept accepting writes.)
 */
import { expect, test, type BrowserContext, type Page } from '@playwright/test';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { columnsRead } from '../src/core/formats';
import { backupSeed } from './backup-seed';
import { watchOrigins } from './helpers';

const SLOW = 60_000;
const NO_ROOM = /no room left for Slotsmith data/;
/** What the user can do, as the alert says it (src/db/errors.ts StorageFullError). */
const WHAT_TO_DO = /Free some disk space or delete projects you no longer need, save a backup of your projects .* then try again\./;

/** The failure is announced as an alert (assertive) with the reason and what to do, and the focus stays where it was. */
async function noRoomAlerted(page: Page): Promise<void> {
  const alert = page.getByRole('alert').filter({ hasText: NO_ROOM });
  await expect(alert).toHaveCount(1, { timeout: SLOW });
  await expect(alert).toContainText(WHAT_TO_DO);
  await expect(alert).toContainText('Nothing from this change was saved');
}

/** Every row of every store, as JSON text (typed arrays as lists), to compare before and after. */
function databaseDump(page: Page): Promise<string> {
  return page.evaluate(
    () =>
      new Promise<string>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const db = open.result;
          const names = [...db.objectStoreNames].sort();
          const tx = db.transaction(names);
          const out: Record<string, unknown[]> = {};
          for (const name of names) {
            const req = tx.objectStore(name).getAll();
            req.onsuccess = () => {
              out[name] = req.result as unknown[];
            };
          }
          tx.oncomplete = () => {
            db.close();
            resolve(JSON.stringify(out, (_k, v: unknown) => (v instanceof Int32Array ? [...v] : v)));
          };
        };
      }),
  );
}

test.use({ serviceWorkers: 'block' });

/**
 * The patch, as source text for the worker scripts and as a function for the page. `left()` says how
 * many more writes may pass (Infinity: no pressure).
 */
function quotaPatch(left: () => number, spend: () => void): void {
  for (const method of ['put', 'add'] as const) {
    const original = IDBObjectStore.prototype[method];
    IDBObjectStore.prototype[method] = function quotaFull(this: IDBObjectStore, ...args: Parameters<typeof original>) {
      if (left() <= 0) throw new DOMException('The quota has been exceeded (test).', 'QuotaExceededError');
      spend();
      return original.apply(this, args);
    };
  }
}

/** Page side: writes fail while window.__quotaFull is true. */
async function pageQuotaInstall(context: BrowserContext): Promise<void> {
  await context.addInitScript(`(${quotaPatch.toString()})(() => (window.__quotaFull ? 0 : Infinity), () => {});`);
}

async function pageQuotaFull(page: Page, full: boolean): Promise<void> {
  await page.evaluate((value) => {
    (window as unknown as { __quotaFull: boolean }).__quotaFull = value;
  }, full);
}

/** Worker side: the named worker scripts fail after `writes` record writes. */
async function workerQuotaInstall(context: BrowserContext, pattern: RegExp, writes: number): Promise<void> {
  await context.route(pattern, async (route) => {
    const response = await route.fetch();
    const body = await response.text();
    const patch = `let __quotaLeft = ${writes};\n(${quotaPatch.toString()})(() => __quotaLeft, () => { __quotaLeft--; });\n`;
    await route.fulfill({ response, body: patch + body });
  });
}

async function demoMake(page: Page): Promise<number> {
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await page.waitForURL(/#\/p\/\d+\//, { timeout: SLOW });
  return Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
}

test('a full disk during a label edit: a clear message, nothing changed, the edit works once there is room', async ({ page, context, baseURL }) => {
  test.setTimeout(180_000);
  await pageQuotaInstall(context);
  const foreign = watchOrigins(page, baseURL ?? '');
  const projectId = await demoMake(page);
  await page.goto(`/#/p/${projectId}/label`);
  await page.getByRole('button', { name: 'Continue as ann-a' }).click();
  const tokens = page.getByRole('listbox', { name: /^Tokens of the utterance/ });
  await expect(tokens).toBeVisible({ timeout: SLOW });
  const before = await databaseDump(page);

  await pageQuotaFull(page, true);
  await tokens.focus();
  await page.keyboard.press('Shift+F');
  await expect(page.getByText(/^Not saved: .*no room left for Slotsmith data/)).toBeVisible({ timeout: SLOW });
  await noRoomAlerted(page);
  // The alert does not take the focus: the labeller's keys still go to the tokens.
  await expect(tokens).toBeFocused();
  expect(await databaseDump(page)).toBe(before);
  // A second failed save is counted in the same alert, not stacked.
  await page.keyboard.press('Shift+F');
  await expect(page.getByRole('alert').filter({ hasText: NO_ROOM })).toContainText('(2 saves failed.)', { timeout: SLOW });
  await page.getByRole('alert').getByRole('button', { name: 'Dismiss' }).click();
  await expect(page.getByRole('alert').filter({ hasText: NO_ROOM })).toHaveCount(0);

  await page.reload();
  await expect(tokens).toBeVisible({ timeout: SLOW });
  expect(await databaseDump(page)).toBe(before);
  await tokens.focus();
  await page.keyboard.press('Shift+F');
  await expect(page.getByText(/^Saved \(revision \d+\)\.$/)).toBeVisible({ timeout: SLOW });
  expect(await databaseDump(page)).not.toBe(before);
  expect(foreign).toEqual([]);
});

test('a full disk during an import: a clear message, nothing stored', async ({ page, context, baseURL }) => {
  test.setTimeout(180_000);
  // Past the batch row and a few chunks, so the failure comes half-way through.
  await workerQuotaInstall(context, /\/assets\/import\.worker-[^/]*\.js$/, 400);
  const foreign = watchOrigins(page, baseURL ?? '');
  await page.goto('/');
  await page.getByLabel('New project name').fill('Squeezed import');
  await page.getByRole('button', { name: 'Create project' }).click();
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Bring in data' }).click();
  await page.getByLabel('File to bring in').setInputFiles('sample-corpus/ann-a.iob2');
  await page.getByRole('button', { name: 'Preview' }).click();
  await expect(page.getByTestId('preview-malformed')).toHaveText('0', { timeout: SLOW });
  const before = await databaseDump(page);

  await page.getByRole('button', { name: 'Import' }).click();
  await noRoomAlerted(page);
  await page.reload();
  await expect(page.getByText('This project holds 0 utterances')).toBeVisible({ timeout: SLOW });
  // The failed batch may stay listed as failed; no utterance or layer is left behind.
  const after = JSON.parse(await databaseDump(page)) as Record<string, unknown[]>;
  const was = JSON.parse(before) as Record<string, unknown[]>;
  for (const store of ['utterances', 'layers', 'history', 'projects']) expect(after[store], store).toEqual(was[store]);
  expect(foreign).toEqual([]);
});

test('a full disk during a restore: a clear message, no project made', async ({ page, context, baseURL }) => {
  test.setTimeout(180_000);
  await workerQuotaInstall(context, /\/assets\/restore\.worker-[^/]*\.js$/, 200);
  const foreign = watchOrigins(page, baseURL ?? '');
  const doc = columnsRead(readFileSync('sample-corpus/ann-a.iob2'));
  const file = join(mkdtempSync(join(tmpdir(), 'slotsmith-pressure-')), 'squeezed.slotsmith-backup.jsonl');
  writeFileSync(file, backupSeed(doc.utterances.slice(0, 300), { projectName: 'Squeezed restore', annotator: 'ann-a', time: Date.UTC(2025, 4, 6, 10) }));
  await page.goto('/');
  await page.getByLabel('New project name').fill('Holder');
  await page.getByRole('button', { name: 'Create project' }).click();
  await page.getByRole('button', { name: 'Project settings' }).click();
  const before = await databaseDump(page);

  await page.getByLabel('Restore from a backup file').setInputFiles(file);
  await noRoomAlerted(page);
  await page.reload();
  expect(await databaseDump(page)).toBe(before);
  await page.getByRole('button', { name: 'All projects' }).click();
  await expect(page.getByRole('list', { name: 'Projects' }).getByRole('listitem')).toHaveCount(1);
  expect(foreign).toEqual([]);
});
