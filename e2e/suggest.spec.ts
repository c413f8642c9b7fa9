import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { transitionsValidate } from '../src/core/rules';
import { spansFromTags } from '../src/core/schemes';
import type { Span } from '../src/core/types';
import { watchOrigins } from './helpers';

const SLOW = 120_000;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'];

/** Invented requests with no labels yet: the model pre-labels these. */
const FRESH = [
  'can someone fix my boiler on tuesday',
  'need an electrician in north end this weekend',
  'how much for a plumber to unblock a sink',
  'please cancel the gutter cleaning on friday',
  'is my roofer still coming tomorrow morning',
  'book a painter for the hallway next monday',
  'my tap is dripping can you come after 5pm',
  'what does it cost to replace a fuse box',
  'move my visit to thursday afternoon',
  'call me on 555-0148 about the leak',
  'any chance of a handyman in riverside today',
  'status of the carpenter booked for saturday',
];

interface Stored {
  utteranceId: number;
  annotator: string;
  tags: string[];
  status: string;
  note: string;
  revision: number;
}

interface Row {
  id: number;
  seq: number;
  text: string;
  tokens: number[];
}

// Straight from IndexedDB, as checks independent of the screen (one closure each: the page's CSP forbids eval).
function layersOf(page: Page, annotator: string): Promise<Stored[]> {
  return page.evaluate(
    (who) =>
      new Promise<Stored[]>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction('layers').objectStore('layers').getAll();
          req.onsuccess = () => {
            open.result.close();
            resolve((req.result as Stored[]).filter((l) => l.annotator === who));
          };
        };
      }),
    annotator,
  );
}

function utterancesOf(page: Page, ids: number[]): Promise<Row[]> {
  return page.evaluate(
    (wanted) =>
      new Promise<Row[]>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const store = open.result.transaction('utterances').objectStore('utterances');
          const rows: Row[] = [];
          let left = wanted.length;
          for (const id of wanted) {
            const req = store.get(id);
            req.onsuccess = () => {
              const u = req.result as { id: number; seq: number; text: string; tokens: Int32Array };
              rows.push({ id: u.id, seq: u.seq, text: u.text, tokens: Array.from(u.tokens) });
              if (--left === 0) {
                open.result.close();
                resolve(rows);
              }
            };
          }
        };
      }),
    ids,
  );
}

const word = (row: Row, i: number) => row.text.slice(row.tokens[2 * i], row.tokens[2 * i + 1]);
const tokenAt = (page: Page, i: number) => page.locator(`#label-tok-${i}`);
const tokens = (page: Page) => page.getByRole('listbox', { name: /^Tokens of the utterance/ });
const saved = (page: Page) => expect(page.getByText(/^Saved \(revision \d+\)\.$/)).toBeVisible();
const panel = (page: Page) => page.getByRole('region', { name: 'Model suggestions' });

async function axeClean(page: Page) {
  const axe = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`)).toEqual([]);
}

/** The demo, the fresh requests, a quick model trained on the demo's finished layers, and its pre-labels. */
async function demoPrelabelled(page: Page): Promise<number> {
  // An adjudicator with blind labelling on: suggestions must show all the same.
  await page.addInitScript(() => localStorage.setItem('slotsmith.session', JSON.stringify({ profile: { id: 'lead', name: 'Lead', role: 'adjudicator' }, blind: true })));
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  const screens = page.getByRole('navigation', { name: 'Screens' });
  await screens.getByRole('button', { name: 'Bring in data' }).click({ timeout: SLOW });
  const projectId = Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
  const file = join(mkdtempSync(join(tmpdir(), 'slotsmith-suggest-')), 'fresh.txt');
  writeFileSync(file, `${FRESH.join('\n')}\n`);
  await page.getByLabel('File to bring in').setInputFiles(file);
  await page.getByLabel('Format').selectOption('text');
  await page.getByRole('button', { name: 'Preview' }).click();
  await page.getByRole('button', { name: 'Import' }).and(page.locator(':enabled')).click();
  await expect(page.getByText(`Stored ${FRESH.length} utterances`)).toBeVisible({ timeout: SLOW });
  await screens.getByRole('button', { name: 'Model' }).click();
  await page.getByLabel('Iterations').fill('30');
  await page.getByLabel('Folds for cross-validation').fill('2');
  await page.getByRole('button', { name: 'Train the model' }).click();
  await expect(page.getByText('Trained and saved in the project.')).toBeVisible({ timeout: SLOW });
  await page.getByRole('button', { name: 'Pre-label unlabelled utterances' }).click();
  await expect(page.getByText(`${FRESH.length} utterances tagged.`)).toBeVisible({ timeout: SLOW });
  return projectId;
}

test('suggestions: accept and reject by key and mouse, accept all, undo, reload; least sure first', async ({ page, baseURL }) => {
  test.setTimeout(360_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  const projectId = await demoPrelabelled(page);

  const model = await layersOf(page, 'model');
  expect(model).toHaveLength(FRESH.length);
  const spansOf = new Map(model.map((l) => [l.utteranceId, spansFromTags(l.tags)]));
  const byCount = [...model].sort((x, y) => (spansOf.get(y.utteranceId)?.length ?? 0) - (spansOf.get(x.utteranceId)?.length ?? 0) || x.utteranceId - y.utteranceId);
  const [first, second, third] = byCount;
  if (first === undefined || second === undefined || third === undefined) throw new Error('no model layers');
  // The quick model must have found something: at least two spans in one request, one in another.
  const spansA = spansOf.get(first.utteranceId) as Span[];
  const spansB = spansOf.get(second.utteranceId) as Span[];
  expect(spansA.length).toBeGreaterThanOrEqual(2);
  expect(spansB.length).toBeGreaterThanOrEqual(1);
  const spansC = spansOf.get(third.utteranceId) as Span[];
  expect(spansC.length).toBeGreaterThanOrEqual(1);
  const [rowA, rowB, rowC] = await utterancesOf(page, [first.utteranceId, second.utteranceId, third.utteranceId]);
  if (rowA?.id !== first.utteranceId || rowB?.id !== second.utteranceId || rowC?.id !== third.utteranceId) throw new Error('utterances not read back');
  const [accepted, rejected] = spansA as [Span, Span];

  // Utterance A: suggestions show dashed and marked, in blind mode too, and do not count as work.
  await page.goto(`/#/p/${projectId}/label?u=${rowA.id}`);
  await expect(tokens(page)).toBeVisible();
  await expect(page.getByLabel('Blind labelling (hide other layers)')).toBeChecked();
  await expect(page.getByText('Model suggestions still show: the model is not another annotator.')).toBeVisible();
  await expect(page.getByText('Hidden while you label (blind labelling)')).toBeVisible();
  await expect(panel(page)).toBeVisible();
  await expect(panel(page).getByRole('listitem')).toHaveCount(spansA.length);
  await expect(tokenAt(page, accepted.start)).toHaveAttribute('aria-label', `${word(rowA, accepted.start)}, suggested ${accepted.slot} (starts), not accepted`);
  await expect(tokenAt(page, accepted.start)).toHaveClass(/suggested/);
  await expect(tokens(page).getByText(`suggested: ${accepted.slot}`).first()).toBeVisible();
  await expect(page.getByText('Not started yet.')).toBeVisible();
  await axeClean(page);

  // Keyboard: Home, Shift+A accepts the first suggestion into the labeller's own layer.
  await tokens(page).focus();
  await page.keyboard.press('Home');
  await page.keyboard.press('Shift+A');
  await expect(tokenAt(page, accepted.start)).toHaveAttribute('aria-label', `${word(rowA, accepted.start)}, ${accepted.slot} (starts)`);
  await expect(tokenAt(page, accepted.start)).not.toHaveClass(/suggested/);
  await saved(page);
  // Mouse: reject the second one by its button.
  const rejectedName = `${rejected.slot} “${rowA.text.slice(rowA.tokens[2 * rejected.start], rowA.tokens[2 * rejected.end - 1])}”`;
  await panel(page).getByRole('button', { name: `Reject suggestion ${rejectedName}`, exact: true }).click();
  await expect(tokenAt(page, rejected.start)).toHaveAttribute('aria-label', word(rowA, rejected.start));
  await expect(panel(page).getByRole('listitem')).toHaveCount(spansA.length - 2);
  await expect(panel(page).getByText('One suggestion you rejected is hidden.')).toBeVisible();
  const ownA = (await layersOf(page, 'lead')).find((l) => l.utteranceId === rowA.id);
  expect(spansFromTags(ownA?.tags ?? [])).toEqual([{ start: accepted.start, end: accepted.end, slot: accepted.slot }]);
  expect(ownA?.status).toBe('draft');
  expect(transitionsValidate(ownA?.tags ?? [], 'iob2')).toEqual([]);

  // The keys are in the help overlay.
  await page.keyboard.press('?');
  const help = page.getByRole('dialog', { name: 'Keys of the label screen' });
  for (const keys of ['Shift+A', 'Shift+R', 'Shift+Y', 'Shift+X']) await expect(help.getByRole('row').filter({ hasText: keys }).filter({ hasText: 'suggestion' })).toHaveCount(1);
  await page.keyboard.press('Escape');
  await expect(help).toBeHidden();

  // Utterance C: Shift+R rejects the suggestion at the selection, Shift+X the rest; rejecting writes no
  // layer (it is not labelling work), and "show again" brings every one back.
  await page.goto(`/#/p/${projectId}/label?u=${rowC.id}`);
  await expect(panel(page).getByRole('listitem')).toHaveCount(spansC.length);
  await tokens(page).focus();
  await page.keyboard.press('End');
  await page.keyboard.press('Shift+R');
  await expect(panel(page).getByRole('listitem')).toHaveCount(spansC.length - 1);
  const lastC = spansC[spansC.length - 1] as Span;
  await expect(tokenAt(page, lastC.start)).toHaveAttribute('aria-label', word(rowC, lastC.start));
  await page.keyboard.press('Shift+X');
  await expect(panel(page).getByText('No suggestion left for this utterance.')).toBeVisible();
  await expect(page.getByText('Not started yet.')).toBeVisible();
  expect((await layersOf(page, 'lead')).find((l) => l.utteranceId === rowC.id)).toBeUndefined();
  await panel(page).getByRole('button', { name: 'Show rejected suggestions again' }).click();
  await expect(panel(page).getByRole('listitem')).toHaveCount(spansC.length);

  // Utterance B: accept all with Shift+Y, one undo step takes them all back, redo brings them again.
  await page.goto(`/#/p/${projectId}/label?u=${rowB.id}`);
  await expect(panel(page).getByRole('listitem')).toHaveCount(spansB.length);
  await tokens(page).focus();
  await page.keyboard.press('Shift+Y');
  await expect(panel(page).getByText('No suggestion left for this utterance.')).toBeVisible();
  await saved(page);
  const wanted = spansB.map((s) => ({ start: s.start, end: s.end, slot: s.slot }));
  await expect.poll(async () => spansFromTags((await layersOf(page, 'lead')).find((l) => l.utteranceId === rowB.id)?.tags ?? [])).toEqual(wanted);
  await page.keyboard.press('Control+z');
  await expect(panel(page).getByRole('listitem')).toHaveCount(spansB.length);
  await expect.poll(async () => (await layersOf(page, 'lead')).find((l) => l.utteranceId === rowB.id)?.status).toBe('unlabelled');
  await page.keyboard.press('Control+Shift+Z');
  await expect(panel(page).getByText('No suggestion left for this utterance.')).toBeVisible();
  await expect.poll(async () => spansFromTags((await layersOf(page, 'lead')).find((l) => l.utteranceId === rowB.id)?.tags ?? [])).toEqual(wanted);
  await saved(page);

  // Reload A: the accepted span is the labeller's, the rejected one stays hidden; the model layer is as it was.
  await page.goto(`/#/p/${projectId}/label?u=${rowA.id}`);
  await page.reload();
  await expect(tokenAt(page, accepted.start)).toHaveAttribute('aria-label', `${word(rowA, accepted.start)}, ${accepted.slot} (starts)`);
  await expect(tokenAt(page, rejected.start)).toHaveAttribute('aria-label', word(rowA, rejected.start));
  await expect(panel(page).getByText('One suggestion you rejected is hidden.')).toBeVisible();
  const modelAfter = await layersOf(page, 'model');
  expect(modelAfter.map((l) => [l.utteranceId, l.revision, l.status, l.tags.join(' ')])).toEqual(model.map((l) => [l.utteranceId, l.revision, l.status, l.tags.join(' ')]));

  // Least sure first: from an utterance outside the model's list, "Next not started" opens the least
  // sure pre-labelled one the labeller has not started (per the notes), then the next least sure.
  const order = model
    .map((l) => ({ id: l.utteranceId, score: Number(l.note) }))
    .filter((e) => e.id !== rowA.id && e.id !== rowB.id)
    .sort((x, y) => y.score - x.score || x.id - y.id);
  const demoFirst = Math.min(...(await layersOf(page, 'ann-a')).map((l) => l.utteranceId));
  await page.goto(`/#/p/${projectId}/label?u=${demoFirst}`);
  await expect(tokens(page)).toBeVisible();
  await expect(page.getByRole('radio', { name: 'in corpus order' })).toBeChecked();
  await page.getByRole('radio', { name: 'least sure first' }).check();
  await expect(page).toHaveURL(/[?&]order=uncertain/);
  await expect(page.getByText('your labels there teach the next model the most')).toBeVisible();
  await expect(page.getByText(`${FRESH.length} pre-labelled utterances come first`)).toBeVisible();
  await page.getByRole('button', { name: 'Next not started' }).click();
  await expect(page).toHaveURL(new RegExp(`u=${order[0]?.id}(&|$)`));
  await tokens(page).focus();
  await page.keyboard.press('Shift+N');
  await expect(page).toHaveURL(new RegExp(`u=${order[1]?.id}(&|$)`));
  // The choice lives in the URL: a reload keeps it.
  await page.reload();
  await expect(page.getByRole('radio', { name: 'least sure first' })).toBeChecked();
  await axeClean(page);
  expect(foreign).toEqual([]);
});
