import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { crfModelToJson, crfSequenceFromUtterance, crfTagger, crfTrain } from '../src/core/crf';
import {
  identicalFind,
  modelDisagreementsFind,
  slotOutliersFind,
  variationFind,
  type LabelledUtterance,
  type ModelComparedUtterance,
  type SlotOutlierFinding,
} from '../src/core/error-detect';
import { columnsRead } from '../src/core/formats';
import { findingsAcrossUtterances } from '../src/workers/findings-choose';
import { watchOrigins } from './helpers';

const SLOW = 90_000;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

/**
 * The reference: the core detectors run in Node over both demo files. Every demo layer is done and
 * there is no gold, so the screen checks every layer of both annotators, as here.
 */
const files = ['ann-a', 'ann-b'].map((who) => ({ who, utterances: columnsRead(readFileSync(`sample-corpus/${who}.iob2`)).utterances }));
const pool: LabelledUtterance[] = files.flatMap(({ who, utterances }) =>
  utterances.map((u) => ({
    id: u.id ?? '',
    layer: who,
    tokens: u.tokens.map((t) => u.text.slice(t.start, t.end)),
    tags: u.tags,
    ...(u.intent === undefined ? {} : { intent: u.intent }),
  })),
);
const { kept, dropped } = findingsAcrossUtterances([...variationFind(pool), ...identicalFind(pool), ...slotOutliersFind(pool)]);
const count = (kind: string) => kept.filter((f) => f.kind === kind).length;
const VARIATION = count('variation');
const IDENTICAL = count('identical');
const OUTLIERS = count('slot-outlier');
const TOP_OUTLIER = kept.find((f): f is SlotOutlierFinding => f.kind === 'slot-outlier');
const n = (x: number) => x.toLocaleString('en');

async function demoMistakes(page: Page) {
  await page.addInitScript(() => localStorage.setItem('slotsmith.session', JSON.stringify({ profile: { id: 'lead', name: 'Lead', role: 'adjudicator' }, blind: false })));
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Likely mistakes' }).click({ timeout: SLOW });
  await expect(page.getByRole('heading', { name: 'Likely mistakes: Home-repair demo' })).toBeVisible();
}

const summary = (page: Page) => page.locator('.mistakes-summary');
const group = (page: Page, title: RegExp) => page.getByRole('region', { name: title });

test('findings of three kinds, ranked; jump to Label; dismiss, undo, reload, show dismissed; filters in the URL', async ({ page, baseURL }) => {
  test.setTimeout(240_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  expect(VARIATION).toBeGreaterThan(0);
  expect(IDENTICAL).toBeGreaterThan(0);
  expect(OUTLIERS).toBeGreaterThan(0);
  const total = VARIATION + IDENTICAL + OUTLIERS;
  await demoMistakes(page);

  await expect(summary(page)).toHaveText(
    `${n(total)} likely mistakes to look at, from 2,400 layers of 2,000 utterances: 0 gold, 2,400 from annotators. ${n(dropped)} differences within single utterances left to the Resolve screen.`,
    { timeout: SLOW },
  );
  await expect(page.getByText('The model check was skipped: no model is saved in this project.')).toBeVisible();
  await expect(group(page, /^The model is sure of something else/)).toContainText('Not checked: no model is saved in this project.');

  const variation = group(page, /^Same words, labelled differently/);
  const identical = group(page, /^Same utterance, different labels/);
  const outliers = group(page, /^A value under an unusual slot/);
  await expect(variation.getByRole('heading')).toHaveText(`Same words, labelled differently (${n(VARIATION)})`);
  await expect(identical.getByRole('heading')).toHaveText(`Same utterance, different labels (${n(IDENTICAL)})`);
  await expect(outliers.getByRole('heading')).toHaveText(`A value under an unusual slot (${n(OUTLIERS)})`);
  await expect(variation.locator('li.mistake')).toHaveCount(Math.min(25, VARIATION));
  await expect(identical.locator('li.mistake')).toHaveCount(Math.min(25, IDENTICAL));
  // Ranked as the core ranks them: the largest gap between the two slots first.
  const first = outliers.locator('li.mistake').first();
  await expect(first.locator('.mistake-head')).toHaveText(`1. ${TOP_OUTLIER?.value}`);
  await expect(first.getByRole('list', { name: /^Labels given/ }).locator(':scope > li')).toHaveText([
    new RegExp(`^${TOP_OUTLIER?.majorityCount} × slot ${TOP_OUTLIER?.majoritySlot}`),
    new RegExp(`^${TOP_OUTLIER?.count} × slot ${TOP_OUTLIER?.slot}`),
  ]);
  await expect(first.locator('mark')).toHaveText(TOP_OUTLIER?.value ?? '');

  const axe = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help} (${v.nodes.slice(0, 3).map((x) => x.target.join(' ')).join('; ')})`)).toEqual([]);

  // Dismiss, undo, dismiss again: the card leaves the list and the counts say so.
  const name = `unusual slot 1, “${TOP_OUTLIER?.value}”`;
  await page.getByRole('button', { name: `Dismiss ${name}` }).click();
  await expect(page.getByText(`Dismissed unusual slot “${TOP_OUTLIER?.value}”.`)).toBeVisible();
  await expect(page.getByRole('button', { name: 'Undo' })).toBeFocused();
  await expect(outliers.getByRole('heading')).toHaveText(`A value under an unusual slot (${n(OUTLIERS - 1)}, 1 dismissed)`);
  await page.getByRole('button', { name: 'Undo' }).click();
  await expect(outliers.getByRole('heading')).toHaveText(`A value under an unusual slot (${n(OUTLIERS)})`);
  await expect(page.getByText(`Brought back unusual slot “${TOP_OUTLIER?.value}”.`)).toBeFocused();
  await page.getByRole('button', { name: `Dismiss ${name}` }).click();
  await expect(summary(page)).toContainText(`${n(total - 1)} likely mistakes to look at (1 dismissed)`);
  await expect(page.getByRole('button', { name: `Dismiss ${name}` })).toHaveCount(0);

  // Remembered across a reload (a new scan).
  await page.reload();
  await expect(summary(page)).toContainText(`${n(total - 1)} likely mistakes to look at (1 dismissed)`, { timeout: SLOW });
  await expect(outliers.getByRole('heading')).toHaveText(`A value under an unusual slot (${n(OUTLIERS - 1)}, 1 dismissed)`);
  await expect(page.getByRole('button', { name: `Dismiss ${name}` })).toHaveCount(0);

  // Show dismissed and one kind: both in the URL, and the dismissed card is back with a way to restore it.
  await page.getByRole('checkbox', { name: 'Show dismissed findings' }).check();
  await page.getByRole('combobox', { name: 'Show' }).selectOption('slot-outlier');
  await expect(page).toHaveURL(/#\/p\/\d+\/mistakes\?dismissed=shown&kind=slot-outlier$/);
  await expect(page.getByRole('region', { name: /^Same words/ })).toHaveCount(0);
  await page.reload();
  await expect(page.getByRole('checkbox', { name: 'Show dismissed findings' })).toBeChecked({ timeout: SLOW });
  await expect(page.getByRole('combobox', { name: 'Show' })).toHaveValue('slot-outlier');
  const back = outliers.locator('li.mistake').first();
  await expect(back.locator('.mistake-head')).toHaveText(`1. ${TOP_OUTLIER?.value} (dismissed)`, { timeout: SLOW });
  await expect(back.getByRole('button', { name: `Bring back ${name}` })).toBeVisible();
  const axeDismissed = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axeDismissed.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help} (${v.nodes.slice(0, 3).map((x) => x.target.join(' ')).join('; ')})`)).toEqual([]);

  // Jump: the place opens that utterance in the Label screen.
  const place = back.getByRole('link', { name: /^utterance \d+ \(ann-[ab]\)$/ });
  const href = (await place.getAttribute('href')) ?? '';
  expect(href).toMatch(/^#\/p\/\d+\/label\?u=\d+$/);
  await place.click();
  await expect(page).toHaveURL(new RegExp(`${href.replace(/[?]/g, '\\?')}$`));
  await expect(page.getByRole('main')).toContainText(TOP_OUTLIER?.value ?? '', { timeout: SLOW });
  expect(foreign).toEqual([]);
});

test('with a saved model, its confident disagreements are listed too, and open in Label', async ({ page, baseURL }) => {
  test.setTimeout(240_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  // A model trained here in Node on every demo layer (few iterations: enough to be sure of the common cases).
  const model = await crfTrain(
    files.flatMap(({ utterances }) => utterances.map((u) => crfSequenceFromUtterance(u))),
    { maxIterations: 20, seed: 5 },
  );
  const file = join(mkdtempSync(join(tmpdir(), 'slotsmith-mistakes-')), 'demo.model.json');
  writeFileSync(file, crfModelToJson(model));
  const tagger = crfTagger(model);
  const compared: ModelComparedUtterance[] = pool.map((u) => {
    const tagging = tagger.tag(u.tokens);
    return { ...u, modelTags: tagging.tags, confidences: Array.from(tagging.confidence) };
  });
  const disagreements = modelDisagreementsFind(compared);
  expect(disagreements.length).toBeGreaterThan(0);
  const top = disagreements[0];

  await demoMistakes(page);
  await expect(summary(page)).toBeVisible({ timeout: SLOW });
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Model' }).click();
  await page.getByLabel('Load a model file').setInputFiles(file);
  await expect(page.getByRole('status').filter({ hasText: 'and saved it in the project.' })).toBeVisible();
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Likely mistakes' }).click();

  const total = VARIATION + IDENTICAL + OUTLIERS + disagreements.length;
  await expect(summary(page)).toContainText(`${n(total)} likely mistakes to look at`, { timeout: SLOW });
  await expect(page.getByText(/^Checked against the model saved in this project \(loaded from a file on /)).toBeVisible();
  const models = group(page, /^The model is sure of something else/);
  await expect(models.getByRole('heading')).toHaveText(`The model is sure of something else (${n(disagreements.length)})`);
  const first = models.locator('li.mistake').first();
  await expect(first.locator('.mistake-head')).toHaveText(`1. ${top?.tokens.join(' ')}`);
  await expect(first.getByRole('list', { name: /^Labels given/ }).locator(':scope > li').first()).toContainText(`(at least ${Math.floor((top?.confidence ?? 0) * 100)} % sure)`);
  await expect(first.getByRole('list', { name: /^Labels given/ }).locator(':scope > li').nth(1)).toContainText(`${top?.location.layer}: `);
  await page.getByRole('combobox', { name: 'Show' }).selectOption('model-disagreement');
  const axe = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help} (${v.nodes.slice(0, 3).map((x) => x.target.join(' ')).join('; ')})`)).toEqual([]);

  await first.getByRole('link').first().click();
  await expect(page).toHaveURL(/#\/p\/\d+\/label\?u=\d+$/);
  await expect(page.getByRole('main')).toContainText(top?.tokens.join(' ') ?? '', { ignoreCase: true, timeout: SLOW });
  expect(foreign).toEqual([]);
});
