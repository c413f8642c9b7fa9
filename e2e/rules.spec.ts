import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { columnsRead } from '../src/core/formats';
import { schemaValidate, transitionsValidate, type LabelSchema } from '../src/core/rules';
import { watchOrigins } from './helpers';

const SLOW = 30_000;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

/**
 * The reference: the core validators run in Node over both demo files, with the demo schema read
 * straight from schema.json (a slot no intent lists goes with any intent, as the app reads it).
 */
const corpus = JSON.parse(readFileSync('sample-corpus/schema.json', 'utf8')) as { intents: { name: string; slots?: string[] }[]; slots: { name: string }[] };
const listed = new Set(corpus.intents.flatMap((i) => i.slots ?? []));
const free = corpus.slots.map((s) => s.name).filter((s) => !listed.has(s));
const schema: LabelSchema = {
  slots: corpus.slots.map((s) => s.name),
  intents: corpus.intents.map((i) => i.name),
  allowedSlotsByIntent: Object.fromEntries(corpus.intents.map((i) => [i.name, [...(i.slots ?? []), ...free]])),
};
const layers = ['ann-a', 'ann-b'].flatMap((file) => columnsRead(readFileSync(`sample-corpus/${file}.iob2`)).utterances);
const perLayer = layers.map((u) => {
  const transitions = transitionsValidate(u.tags, 'iob2').length;
  const issues = schemaValidate(u, schema);
  return { transitions, schema: issues.length, repairable: transitions > 0 || issues.some((i) => i.index !== null) };
});
const sum = (f: (x: (typeof perLayer)[number]) => number) => perLayer.reduce((n, x) => n + f(x), 0);
const TRANSITIONS = sum((x) => x.transitions);
const SCHEMA = sum((x) => x.schema);
const WITH = perLayer.filter((x) => x.transitions + x.schema > 0).length;
const REPAIRABLE = perLayer.filter((x) => x.repairable).length;

const summaryText = (findings: number, withFindings: number, transitions: number, schemaRules: number) =>
  `${findings} finding${findings === 1 ? '' : 's'} in ${withFindings} layer${withFindings === 1 ? '' : 's'} (${layers.length} checked): ${transitions} transition rule${transitions === 1 ? '' : 's'}, ${schemaRules} schema rule${schemaRules === 1 ? '' : 's'}.`;

async function demoRules(page: Page) {
  await page.addInitScript(() => localStorage.setItem('slotsmith.session', JSON.stringify({ profile: { id: 'lead', name: 'Lead', role: 'adjudicator' }, blind: false })));
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Rule review' }).click({ timeout: SLOW });
  await expect(page.getByRole('heading', { name: 'Rule review: Home-repair demo' })).toBeVisible();
}

const summary = (page: Page) => page.locator('.rules-summary');
const findingRowsText = (page: Page) => page.getByRole('region', { name: 'Rule findings' }).locator('tbody tr').allInnerTexts();

test('repair one, then all with a preview; a second scan finds none; undo brings back exactly the same list', async ({ page, baseURL }) => {
  test.setTimeout(180_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  expect(TRANSITIONS).toBeGreaterThan(10);
  await demoRules(page);
  await expect(summary(page)).toHaveText(summaryText(TRANSITIONS + SCHEMA, WITH, TRANSITIONS, SCHEMA), { timeout: SLOW });
  const before = await findingRowsText(page);
  expect(before).toHaveLength(TRANSITIONS + SCHEMA);
  // The rule in plain words, and the context with the token at fault.
  const strayRow = page.getByRole('region', { name: 'Rule findings' }).locator('tbody tr').filter({ hasText: 'An I- tag follows O; in IOB2 every span starts with B-.' }).first();
  await expect(strayRow.locator('.rules-token.marked')).toHaveCount(2);
  await expect(strayRow.locator('.rules-token.marked').nth(1)).toContainText(/^▶ .* I-\S+$/);
  await expect(strayRow.locator('.rules-token.marked').first()).toContainText(/ O$/);

  // One layer: its own preview, applied; the scan then has that layer's transition findings fewer.
  await page.getByRole('combobox', { name: 'Show' }).selectOption('transition');
  const firstRow = page.getByRole('region', { name: 'Rule findings' }).locator('tbody tr').first();
  await firstRow.getByRole('button', { name: /^Preview the repair of/ }).click();
  await expect(page.getByRole('list', { name: 'Layers the repair changes' }).getByRole('listitem')).toHaveCount(1);
  await expect(page.getByRole('list', { name: 'Layers the repair changes' })).toContainText('*');
  // Axe with a preview open (one layer: scanning ~70 preview tables costs a minute on this machine).
  const axe = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`)).toEqual([]);
  await page.getByRole('button', { name: 'Apply this repair to 1 layer' }).click();
  await expect(page.getByText(/^Repaired 1 layer \(\d+ tags?\) in one step/)).toBeVisible();
  await expect(summary(page)).toContainText(/transition rules?, /, { timeout: SLOW });
  const afterOne = await summary(page).innerText();
  const transitionsLeft = Number(/: (\d+) transition/.exec(afterOne)?.[1]);
  expect(transitionsLeft).toBeLessThan(TRANSITIONS);
  await page.getByRole('button', { name: /^Undo the last repair/ }).click();
  await expect(page.getByText('Undone: the previous tags of 1 layer are back.')).toBeVisible();
  await expect(summary(page)).toHaveText(summaryText(TRANSITIONS + SCHEMA, WITH, TRANSITIONS, SCHEMA), { timeout: SLOW });

  // All layers, schema spans too: the preview lists every layer that changes, before anything is written.
  await page.getByLabel(/^Also drop spans the schema does not allow/).check();
  await page.getByRole('button', { name: `Preview the repair of all ${WITH} layers` }).click();
  await expect(page.getByRole('list', { name: 'Layers the repair changes' }).getByRole('listitem')).toHaveCount(REPAIRABLE);
  await page.getByRole('button', { name: `Apply this repair to ${REPAIRABLE} layers` }).click();
  await expect(page.getByText(new RegExp(`^Repaired ${REPAIRABLE} layers`))).toBeVisible();
  // A second scan: nothing left (the demo has no unknown intents, the one finding repair cannot fix).
  expect(SCHEMA + TRANSITIONS).toBe(sum((x) => (x.repairable ? x.transitions + x.schema : 0)));
  await expect(summary(page)).toHaveText(summaryText(0, 0, 0, 0), { timeout: SLOW });
  await expect(page.getByText('No findings: every layer follows the rules.')).toBeVisible();

  // The undo outlives a reload: the repair is rebuilt from its history rows.
  await page.reload();
  await expect(summary(page)).toHaveText(summaryText(0, 0, 0, 0), { timeout: SLOW });
  await page.getByRole('button', { name: `Undo the last repair (${REPAIRABLE} layers)` }).click();
  await expect(page.getByText(`Undone: the previous tags of ${REPAIRABLE} layers are back.`)).toBeVisible();
  await expect(summary(page)).toHaveText(summaryText(TRANSITIONS + SCHEMA, WITH, TRANSITIONS, SCHEMA), { timeout: SLOW });
  await page.getByRole('combobox', { name: 'Show' }).selectOption('all');
  expect(await findingRowsText(page)).toEqual(before);
  const axeList = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axeList.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`)).toEqual([]);
  expect(foreign).toEqual([]);
});
