import AxeBuilder from '@axe-core/playwright';
import { expect, test } from '@playwright/test';
import { watchOrigins } from './helpers';

test('create, rename and delete a project; it survives a reload (real IndexedDB)', async ({ page, baseURL }) => {
  const foreign = watchOrigins(page, baseURL ?? '');
  await page.goto('/');
  await page.getByLabel('New project name').fill('Boiler repairs');
  await page.getByRole('button', { name: 'Create project' }).click();
  await page.getByRole('button', { name: 'All projects' }).click();
  await expect(page.getByRole('list', { name: 'Projects' })).toContainText('Boiler repairs');

  await page.reload();
  await expect(page.getByRole('list', { name: 'Projects' })).toContainText('Boiler repairs');

  await page.getByRole('button', { name: 'Rename Boiler repairs' }).click();
  await page.getByLabel('New name for Boiler repairs').fill('Boiler and heating');
  await page.getByRole('button', { name: 'Save name' }).click();
  await expect(page.getByRole('list', { name: 'Projects' })).toContainText('Boiler and heating');

  await page.getByRole('button', { name: 'Delete Boiler and heating' }).click();
  await expect(page.getByRole('alertdialog')).toContainText('cannot be undone');
  await page.getByRole('button', { name: 'Keep it' }).click();
  await expect(page.getByRole('list', { name: 'Projects' })).toContainText('Boiler and heating');
  await page.getByRole('button', { name: 'Delete Boiler and heating' }).click();
  await page.getByRole('button', { name: 'Delete for good' }).click();
  await expect(page.getByText('No projects yet.')).toBeVisible();
  expect(foreign).toEqual([]);
});

test('the project list has no accessibility violations (axe-core, WCAG 2.1 A/AA rules)', async ({ page }) => {
  await page.goto('/');
  await page.getByLabel('New project name').fill('Locksmith calls');
  await page.getByRole('button', { name: 'Create project' }).click();
  await page.getByRole('button', { name: 'All projects' }).click();
  await page.getByRole('button', { name: 'Delete Locksmith calls' }).click();
  const results = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
  expect(results.violations.map((v) => `${v.id}: ${v.help}`)).toEqual([]);
});

test('the page forbids other origins with a Content-Security-Policy', async ({ page }) => {
  await page.goto('/');
  const csp = await page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content');
  expect(csp).toContain("default-src 'self'");
  expect(csp).toContain("connect-src 'self'");
  // The browser itself blocks a request to another origin and reports a CSP violation (the target
  // is a loopback address, so even an unblocked request would stay on this machine).
  const violation = await page.evaluate(async () => {
    const seen = new Promise<string>((resolve) => document.addEventListener('securitypolicyviolation', (e) => resolve(e.violatedDirective), { once: true }));
    await fetch('http://127.0.0.2:9/').catch(() => undefined);
    return seen;
  });
  expect(violation).toBe('connect-src');
});
