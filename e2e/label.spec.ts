import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Locator, type Page } from '@playwright/test';
import { transitionsValidate } from '../src/core/rules';
import { watchOrigins } from './helpers';

// The demo import runs in a worker on a shared 2-core machine.
const SLOW = 60_000;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'];
// Shortcut keys for some demo slots (the demo schema has none).
const KEYS: Record<string, string> = { service: 'v', problem: 'p', day: 'd', area: 'a', time_window: 't' };

interface StoredLayer {
  tags: string[];
  intent: string | null;
  status: string;
  note: string;
  revision: number;
}

// Straight from IndexedDB, as checks independent of the screen. Each helper is one closure: the
// page's Content-Security-Policy forbids eval, so no code travels as text.

function utteranceIdOf(page: Page, externalId: string): Promise<number> {
  return page.evaluate(
    (wanted) =>
      new Promise<number>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction('utterances').objectStore('utterances').getAll();
          req.onsuccess = () => {
            const row = (req.result as { id: number; externalId?: string }[]).find((u) => u.externalId === wanted);
            open.result.close();
            if (row === undefined) reject(new Error(`no utterance ${wanted}`));
            else resolve(row.id);
          };
        };
      }),
    externalId,
  );
}

function layerOf(page: Page, utteranceId: number, annotator: string): Promise<StoredLayer | null> {
  return page.evaluate(
    ([id, who]) =>
      new Promise<StoredLayer | null>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction('layers').objectStore('layers').get([id, who]);
          req.onsuccess = () => {
            open.result.close();
            resolve((req.result as StoredLayer | undefined) ?? null);
          };
        };
      }),
    [utteranceId, annotator] as const,
  );
}

/**
 * The schema screen is built alongside; the demo schema gets its shortcut keys straight in the store,
 * and a reload lets the app read them (its live queries only see the app's own writes).
 */
async function slotKeysSet(page: Page, projectId: number): Promise<void> {
  await page.evaluate(
    ([id, keys]) =>
      new Promise<void>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const tx = open.result.transaction('projects', 'readwrite');
          const store = tx.objectStore('projects');
          const req = store.get(id);
          req.onsuccess = () => {
            const p = req.result as { schema: { slots: { name: string; key?: string }[] } };
            p.schema.slots = p.schema.slots.map((s) => { const key = keys[s.name]; return key === undefined ? s : { ...s, key }; });
            store.put(p);
          };
          tx.oncomplete = () => {
            open.result.close();
            resolve();
          };
          tx.onerror = () => reject(tx.error);
        };
      }),
    [projectId, KEYS] as const,
  );
}

async function demoMake(page: Page): Promise<number> {
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await page.waitForURL(/#\/p\/\d+\//, { timeout: SLOW });
  const projectId = Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
  expect(projectId).toBeGreaterThan(0);
  return projectId;
}

/** The profile feature's chooser: a new name (its id is derived from it), or someone who already labels here. */
async function profileChoose(page: Page, id: string, known = false) {
  if (known) {
    await page.getByRole('button', { name: `Continue as ${id}` }).click();
    return;
  }
  await page.getByLabel('Your name').fill(id);
  await expect(page.getByLabel('Id written into your labels')).toHaveValue(id);
  await page.getByRole('radio', { name: /^Annotator/ }).check();
  await page.getByRole('button', { name: 'Start labelling' }).click();
}

async function labelOpen(page: Page, projectId: number, utteranceId: number) {
  await page.goto(`/#/p/${projectId}/label?u=${utteranceId}`);
  await expect(tokens(page)).toBeVisible();
}

const tokens = (page: Page): Locator => page.getByRole('listbox', { name: /^Tokens of the utterance/ });
const token = (page: Page, name: string): Locator => tokens(page).getByRole('option', { name, exact: true });
const saved = (page: Page) => expect(page.getByText(/^Saved \(revision \d+\)\.$/)).toBeVisible();

async function drag(page: Page, from: Locator, to: Locator) {
  const a = await from.boundingBox();
  const b = await to.boundingBox();
  if (a === null || b === null) throw new Error('token not on screen');
  await page.mouse.move(a.x + a.width / 2, a.y + a.height / 2);
  await page.mouse.down();
  await page.mouse.move((a.x + b.x) / 2 + b.width / 2, b.y + b.height / 2, { steps: 4 });
  await page.mouse.move(b.x + b.width / 2, b.y + b.height / 2, { steps: 2 });
  await page.mouse.up();
}

test('label by keyboard and by mouse, intent and status, undo/redo across utterances, reload: all stored', async ({ page, baseURL }) => {
  test.setTimeout(180_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  const projectId = await demoMake(page);
  await slotKeysSet(page, projectId);
  const first = await utteranceIdOf(page, 'hr-00006');
  const second = await utteranceIdOf(page, 'hr-00010');

  await page.goto(`/#/p/${projectId}/label?u=${first}`);
  await expect(page.getByRole('heading', { name: 'Label' })).toBeVisible();
  await profileChoose(page, 'lee');
  await expect(page.getByRole('heading', { name: 'Label: Home-repair demo' })).toBeVisible();
  await expect(tokens(page)).toBeVisible();
  // Tokens read as the original text, pieces apart.
  await expect(tokens(page)).toHaveText('need a handyman asap, got a flat-pack wardrobe to build');
  await expect(tokens(page).getByRole('option')).toHaveCount(13);

  // Keyboard only: move to "handyman", one key labels it.
  await tokens(page).focus();
  await page.keyboard.press('ArrowRight');
  await page.keyboard.press('ArrowRight');
  await page.keyboard.press('v');
  await expect(token(page, 'handyman, service (starts)')).toBeVisible();
  await expect(tokens(page).getByText('service', { exact: true })).toBeVisible();
  // "flat-pack wardrobe": select by shift+arrows, then the searchable list: "/", type, Enter.
  for (let i = 0; i < 5; i++) await page.keyboard.press('ArrowRight');
  for (let i = 0; i < 3; i++) await page.keyboard.press('Shift+ArrowRight');
  await page.keyboard.press('/');
  await expect(page.getByRole('dialog', { name: 'Label the selection as…' })).toBeVisible();
  await page.keyboard.type('prob');
  await page.keyboard.press('Enter');
  await expect(page.getByRole('dialog')).toHaveCount(0);
  await expect(token(page, 'flat, problem (starts)')).toBeVisible();
  await expect(token(page, 'wardrobe, problem')).toBeVisible();
  // A caret inside a span relabels the whole span; Backspace removes it.
  await page.keyboard.press('ArrowLeft');
  await page.keyboard.press('d');
  await expect(token(page, 'flat, day (starts)')).toBeVisible();
  await page.keyboard.press('Backspace');
  await expect(token(page, 'flat')).toBeVisible();
  await page.keyboard.press('p');
  await expect(token(page, 'flat, problem (starts)')).toBeVisible();
  await page.keyboard.press('Shift+I');
  await expect(page.getByLabel('Intent')).toBeFocused();
  await page.getByLabel('Intent').selectOption('book_visit');
  await tokens(page).focus();
  await page.keyboard.press('Shift+D');
  await expect(page.getByRole('radio', { name: 'Done' })).toBeChecked();
  await saved(page);

  // Next utterance from the keyboard, then a mouse drag over "9th of may" and its key.
  // hr-00007 sits between them in project order: ] twice, [ once back, ] again.
  const between = await utteranceIdOf(page, 'hr-00007');
  await page.keyboard.press(']');
  await expect(page).toHaveURL(new RegExp(`u=${between}$`));
  await page.keyboard.press(']');
  await expect(page).toHaveURL(new RegExp(`u=${second}$`));
  await page.keyboard.press('[');
  await expect(page).toHaveURL(new RegExp(`u=${between}$`));
  await expect(tokens(page)).toContainText('Can You Make It This Weekend');
  await page.keyboard.press(']');
  await expect(page).toHaveURL(new RegExp(`u=${second}$`));
  await expect(tokens(page)).toHaveText('please push my appointment to the 9th of may.');
  await drag(page, token(page, '9th'), token(page, 'may'));
  await expect(token(page, '9th')).toHaveAttribute('aria-selected', 'true');
  await expect(token(page, 'of')).toHaveAttribute('aria-selected', 'true');
  await page.keyboard.press('d');
  await expect(token(page, '9th, day (starts)')).toBeVisible();
  await expect(token(page, 'may, day')).toBeVisible();
  // A click (no drag) on a labelled token selects its span.
  await token(page, 'of, day').click();
  await expect(token(page, '9th, day (starts)')).toHaveAttribute('aria-selected', 'true');
  await page.getByLabel('Note').fill('date written as 9th');
  await tokens(page).focus();
  await page.keyboard.press('Shift+F');
  await expect(page.getByRole('radio', { name: 'Flagged for a second look' })).toBeChecked();
  await saved(page);
  expect(await layerOf(page, second, 'lee')).toMatchObject({ tags: ['O', 'O', 'O', 'O', 'O', 'O', 'B-day', 'I-day', 'I-day', 'O'], note: 'date written as 9th', status: 'flagged' });

  // Undo walks back through both utterances; redo comes forward again.
  await page.keyboard.press('Control+z');
  await expect(page.getByRole('radio', { name: 'Flagged for a second look' })).not.toBeChecked();
  await page.keyboard.press('Control+z');
  await expect(page.getByLabel('Note')).toHaveValue('');
  await page.keyboard.press('Control+z');
  await expect(token(page, '9th')).toBeVisible();
  await page.keyboard.press('Control+z');
  await expect(page).toHaveURL(new RegExp(`u=${first}$`));
  await expect(page.getByRole('radio', { name: 'Done' })).not.toBeChecked();
  await tokens(page).focus();
  await page.keyboard.press('Control+Shift+Z');
  await expect(page.getByRole('radio', { name: 'Done' })).toBeChecked();
  await page.keyboard.press('Control+Shift+Z');
  await expect(page).toHaveURL(new RegExp(`u=${second}$`));
  await expect(token(page, '9th, day (starts)')).toBeVisible();
  await saved(page);

  // An immediate reload keeps everything.
  await page.reload();
  await expect(token(page, '9th, day (starts)')).toBeVisible();
  await expect(page.getByLabel('Note')).toHaveValue('');
  await labelOpen(page, projectId, first);
  await expect(token(page, 'handyman, service (starts)')).toBeVisible();
  await expect(token(page, 'flat, problem (starts)')).toBeVisible();
  await expect(token(page, 'build, problem')).toHaveCount(0);
  await expect(page.getByLabel('Intent')).toHaveValue('book_visit');
  await expect(page.getByRole('radio', { name: 'Done' })).toBeChecked();
  const stored = await layerOf(page, first, 'lee');
  expect(stored).toMatchObject({ intent: 'book_visit', status: 'done' });
  expect(stored?.tags).toEqual(['O', 'O', 'B-service', 'O', 'O', 'O', 'O', 'B-problem', 'I-problem', 'I-problem', 'I-problem', 'O', 'O']);
  expect(transitionsValidate(stored?.tags ?? [], 'iob2')).toEqual([]);
  // Undo still works after the reload: the steps come back from the edit history.
  await tokens(page).focus();
  await page.keyboard.press('Control+z');
  await expect(page).toHaveURL(new RegExp(`u=${second}$`));
  await expect(token(page, '9th')).toBeVisible();
  await expect.poll(async () => (await layerOf(page, second, 'lee'))?.tags[6]).toBe('O');
  expect(foreign).toEqual([]);
});

test('blind labelling hides another annotator’s layer; turning it off shows it read-only', async ({ page, baseURL }) => {
  test.setTimeout(120_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  const projectId = await demoMake(page);
  const shared = await utteranceIdOf(page, 'hr-00010');
  await page.goto(`/#/p/${projectId}/label?u=${shared}`);
  await profileChoose(page, 'ann-a', true);
  await expect(tokens(page)).toBeVisible();
  // ann-a's own imported layer is the one being edited.
  await expect(token(page, '9th, day (starts)')).toBeVisible();
  const others = page.getByRole('region', { name: 'Other layers' });
  await expect(page.getByLabel('Blind labelling (hide other layers)')).toBeChecked();
  await expect(others).toContainText('Hidden while you label');
  await expect(others.getByTestId('other-layer-ann-b')).toHaveCount(0);
  await expect(others).not.toContainText('ann-b');
  await page.getByLabel('Blind labelling (hide other layers)').uncheck();
  await expect(others.getByTestId('other-layer-ann-b')).toContainText('day: “9th of may”');
  await page.reload();
  await expect(others.getByTestId('other-layer-ann-b')).toBeVisible();
  await page.getByLabel('Blind labelling (hide other layers)').check();
  await expect(others.getByTestId('other-layer-ann-b')).toHaveCount(0);
  expect(foreign).toEqual([]);
});

test('a second tab saving the same layer first brings up the conflict prompt; nothing is overwritten silently', async ({ page, context, baseURL }) => {
  test.setTimeout(120_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  const projectId = await demoMake(page);
  await slotKeysSet(page, projectId);
  const id = await utteranceIdOf(page, 'hr-00006');
  await page.goto(`/#/p/${projectId}/label?u=${id}`);
  await profileChoose(page, 'lee');
  await expect(tokens(page)).toBeVisible();

  const other = await context.newPage();
  const foreignOther = watchOrigins(other, baseURL ?? '');
  await labelOpen(other, projectId, id);
  await tokens(other).focus();
  await other.keyboard.press('ArrowRight');
  await other.keyboard.press('ArrowRight');
  await other.keyboard.press('v');
  await saved(other);

  // This tab still shows the version it opened; its edit is refused and the user is asked.
  await tokens(page).focus();
  await page.keyboard.press('End');
  await page.keyboard.press('p');
  const prompt = page.getByRole('dialog', { name: 'This utterance was changed in another tab or window' });
  await expect(prompt).toBeVisible();
  await expect(prompt.getByRole('region', { name: 'Saved elsewhere' })).toContainText('service: “handyman”');
  await expect(prompt.getByRole('region', { name: 'Your version' })).toContainText('problem: “build”');
  expect((await layerOf(page, id, 'lee'))?.tags[2]).toBe('B-service');
  expect((await layerOf(page, id, 'lee'))?.tags[12]).toBe('O');
  const axe = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical')).toEqual([]);
  await prompt.getByRole('button', { name: 'Apply my change on top' }).click();
  await expect(prompt).toHaveCount(0);
  await expect(token(page, 'handyman, service (starts)')).toBeVisible();
  await expect(token(page, 'build, problem (starts)')).toBeVisible();
  await saved(page);
  expect(await layerOf(page, id, 'lee')).toMatchObject({ revision: 2 });
  expect((await layerOf(page, id, 'lee'))?.tags.filter((t) => t !== 'O')).toEqual(['B-service', 'B-problem']);
  // The other tab is told a newer version exists rather than having it swapped under the cursor.
  await expect(other.getByText(/changed in another tab or window \(now revision 2\)/)).toBeVisible();
  await other.getByRole('button', { name: 'Show the newer version' }).click();
  await expect(token(other, 'build, problem (starts)')).toBeVisible();
  expect([...foreign, ...foreignOther]).toEqual([]);
});

test('axe: the editor, the help overlay (focus kept inside, Escape closes) and the slot list', async ({ page, baseURL }) => {
  test.setTimeout(120_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  const projectId = await demoMake(page);
  await slotKeysSet(page, projectId);
  const shared = await utteranceIdOf(page, 'hr-00010');
  await page.goto(`/#/p/${projectId}/label?u=${shared}`);
  await profileChoose(page, 'ann-a', true);
  await expect(tokens(page)).toBeVisible();
  await page.getByLabel('Blind labelling (hide other layers)').uncheck();
  const serious = async () => (await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze()).violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
  expect(await serious()).toEqual([]);

  // The guideline shows on keyboard focus of a slot button.
  await page.getByRole('button', { name: /^day/ }).focus();
  await expect(page.getByRole('tooltip').filter({ hasText: /./ }).first()).toBeVisible();

  await tokens(page).focus();
  await page.keyboard.press('?');
  const help = page.getByRole('dialog', { name: 'Keys of the label screen' });
  await expect(help).toBeVisible();
  await expect(help).toContainText('Label the selection as “day”');
  await expect(help).toContainText('Ctrl+Shift+Z');
  expect(await serious()).toEqual([]);
  for (let i = 0; i < 4; i++) {
    await page.keyboard.press('Tab');
    expect(await help.evaluate((d) => d.contains(document.activeElement))).toBe(true);
  }
  await page.keyboard.press('Shift+Tab');
  expect(await help.evaluate((d) => d.contains(document.activeElement))).toBe(true);
  await page.keyboard.press('Escape');
  await expect(help).toHaveCount(0);
  await expect(tokens(page)).toBeFocused();

  await page.keyboard.press('/');
  await expect(page.getByRole('dialog', { name: 'Label the selection as…' })).toBeVisible();
  expect(await serious()).toEqual([]);
  await page.keyboard.press('Escape');
  await expect(page.getByRole('dialog')).toHaveCount(0);
  expect(foreign).toEqual([]);
});
