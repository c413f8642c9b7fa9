/**
 * Offline use: once the service worker controls the page, the app starts and works with the network
 * off — the project list, the demo project already loaded, and the label screen.
 */
import { expect, test, type Page } from '@playwright/test';
import { watchOrigins } from './helpers';

const SLOW = 60_000;

async function controlled(page: Page) {
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: SLOW });
}

test('after the first load the app starts and labels with the network off', async ({ page, context, baseURL }) => {
  test.setTimeout(180_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  await page.goto('/');
  // The worker claims the page once it has cached every built file.
  await page.evaluate(() => navigator.serviceWorker.ready.then(() => undefined));
  await controlled(page);
  const cached = await page.evaluate(async () => {
    const names = await caches.keys();
    const keys = (await Promise.all(names.map(async (n) => (await caches.open(n)).keys()))).flat();
    return keys.map((r) => new URL(r.url).pathname);
  });
  expect(cached).toContain('/');
  expect(cached).toContain('/manifest.webmanifest');
  expect(cached.some((p) => /^\/assets\/index-.*\.js$/.test(p))).toBe(true);
  expect(cached.some((p) => /^\/assets\/import\.worker-.*\.js$/.test(p))).toBe(true);

  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await page.waitForURL(/#\/p\/\d+\//, { timeout: SLOW });
  const projectId = Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);

  await context.setOffline(true);
  // The network really is off: a file the worker has not cached cannot be fetched.
  expect(await page.evaluate(() => fetch(`/not-cached-${Date.now()}.txt`).then(() => 'reached', () => 'failed'))).toBe('failed');

  await page.goto('/');
  await expect(page.getByRole('list', { name: 'Projects' })).toContainText('Home-repair demo', { timeout: SLOW });
  await page.goto(`/#/p/${projectId}/corpus`);
  await expect(page.getByRole('main')).toContainText('hr-0000', { timeout: SLOW });
  await page.goto(`/#/p/${projectId}/label`);
  await page.reload();
  await page.getByRole('button', { name: 'Continue as ann-a' }).click();
  const tokens = page.getByRole('listbox', { name: /^Tokens of the utterance/ });
  await expect(tokens).toBeVisible({ timeout: SLOW });
  expect(await tokens.getByRole('option').count()).toBeGreaterThan(0);
  // An edit made offline is stored.
  await tokens.focus();
  await page.keyboard.press('Shift+D');
  await expect(page.getByRole('radio', { name: 'Done' })).toBeChecked();
  await expect(page.getByText(/^Saved \(revision \d+\)\.$/)).toBeVisible();

  await context.setOffline(false);
  expect(foreign).toEqual([]);
});

test('the web app manifest names the app and its icons, all served from here', async ({ page, request }) => {
  await page.goto('/');
  const href = await page.locator('link[rel="manifest"]').getAttribute('href');
  expect(href).toBe('/manifest.webmanifest');
  const manifest = (await (await request.get(href ?? '')).json()) as { name: string; start_url: string; display: string; icons: { src: string; type: string }[] };
  expect(manifest).toMatchObject({ name: 'Slotsmith', start_url: '/', display: 'standalone' });
  expect(manifest.icons.length).toBeGreaterThan(0);
  for (const icon of manifest.icons) {
    expect(icon.src.startsWith('/')).toBe(true);
    const response = await request.get(icon.src);
    expect(response.ok()).toBe(true);
    expect(await response.text()).toContain('<svg');
  }
});
