import AxeBuilder from '@axe-core/playwright';
import { expect, test } from '@playwright/test';
import pkg from '../package.json' with { type: 'json' };

test('the served page loads in Chromium and shows the product name and version', async ({ page }) => {
  const errors: string[] = [];
  page.on('pageerror', (error) => errors.push(error.message));
  await page.goto('/');
  await expect(page.getByRole('heading', { level: 1 })).toContainText('Slotsmith');
  await expect(page.getByRole('heading', { level: 1 })).toContainText(`v${pkg.version}`);
  expect(errors).toEqual([]);
});

test('the shell has no accessibility violations (axe-core, WCAG 2.1 A/AA rules)', async ({ page }) => {
  await page.goto('/');
  await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
  const results = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
  expect(results.violations.map((v) => `${v.id}: ${v.help}`)).toEqual([]);
});
