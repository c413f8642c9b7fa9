/**
 * Hostile text through the import screen, the utterance table and the label screen: markup stays
 * text (no script runs, no dialog), bidi and zero-width characters and lone surrogates keep their
 * token offsets, and a 10,000-character line or a 1,000-token utterance wraps inside its box instead
 * of widening the page (our choice: wrap, never a page-wide horizontal scroll).
 */
import { expect, test, type Locator, type Page } from '@playwright/test';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { tokeniseWords } from '../src/core/tokenise/tokenise';
import { watchOrigins } from './helpers';

const SLOW = 60_000;

/** Invented home-repair requests carrying the payloads; ids name the case. */
const CASES: { id: string; text: string }[] = [
  { id: 'script-tag', text: 'book a plumber <script>window.__pwned = "script"</script> for friday' },
  { id: 'img-onerror', text: 'fix the tap <img src=x onerror="window.__pwned = \'img\'; alert(1)"> please' },
  { id: 'svg-onload', text: 'leak in the "><svg onload=alert(1)><b>kitchen</b> <iframe src="javascript:alert(1)"></iframe>' },
  { id: 'bidi', text: 'call me on \u202E555-0142 ton\u202C after six \u2067tomorrow\u2069' },
  { id: 'zero-width', text: 'fix\u200Bthe\u200Dboiler \u2060now \uFEFFplease' },
  { id: 'lone-surrogates', text: 'cancel \uD800 the visit \uDFFF on monday \uD83D' },
  { id: 'long-line', text: `quote for ${'x'.repeat(9_950)} and the roof ${'tile '.repeat(7)}`.slice(0, 10_000) },
  { id: 'many-tokens', text: Array.from({ length: 1_000 }, (_, i) => `t${i}`).join(' ') },
];

/** JSON Lines: lone surrogates can only reach a file as JSON \u escapes (a UTF-8 file cannot hold them). */
function hostileFile(): string {
  const lines = CASES.map((c) => JSON.stringify({ id: c.id, text: c.text, intent: 'book_visit' }));
  const path = join(mkdtempSync(join(tmpdir(), 'slotsmith-hostile-')), 'hostile.jsonl');
  writeFileSync(path, `${lines.join('\n')}\n`);
  return path;
}

function utteranceIds(page: Page): Promise<Record<string, number>> {
  return page.evaluate(
    () =>
      new Promise<Record<string, number>>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction('utterances').objectStore('utterances').getAll();
          req.onsuccess = () => {
            open.result.close();
            const rows = req.result as { id: number; externalId?: string; text: string }[];
            resolve(Object.fromEntries(rows.map((r) => [r.externalId ?? '', r.id])));
          };
        };
      }),
  );
}

/** Stored token offsets (start,end pairs) by external id. */
function storedTokens(page: Page): Promise<Record<string, number[]>> {
  return page.evaluate(
    () =>
      new Promise<Record<string, number[]>>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction('utterances').objectStore('utterances').getAll();
          req.onsuccess = () => {
            open.result.close();
            resolve(Object.fromEntries((req.result as { externalId?: string; tokens: Int32Array }[]).map((r) => [r.externalId ?? '', [...r.tokens]])));
          };
        };
      }),
  );
}

function storedTexts(page: Page): Promise<Record<string, string>> {
  return page.evaluate(
    () =>
      new Promise<Record<string, string>>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction('utterances').objectStore('utterances').getAll();
          req.onsuccess = () => {
            open.result.close();
            resolve(Object.fromEntries((req.result as { externalId?: string; text: string }[]).map((r) => [r.externalId ?? '', r.text])));
          };
        };
      }),
  );
}

/** Nothing ran: no flag, no dialog, and no element came from the text (markup shows as text). */
async function inert(page: Page, dialogs: string[]) {
  expect(await page.evaluate(() => (window as unknown as { __pwned?: unknown }).__pwned)).toBeUndefined();
  expect(dialogs).toEqual([]);
  expect(await page.locator('#root script, #root img[onerror], #root svg[onload], #root iframe').count()).toBe(0);
}

/**
 * Layout intact: the page never scrolls sideways, and nothing in the main area reaches past the
 * viewport unless a box that clips or scrolls (overflow other than visible) keeps it inside.
 */
async function layoutIntact(page: Page) {
  const sizes = await page.evaluate(() => {
    const viewport = document.documentElement.clientWidth;
    const main = document.querySelector('main') ?? document.body;
    const contained = (el: Element): boolean => {
      for (let a = el.parentElement; a !== null && a !== document.body; a = a.parentElement) {
        // A clipping box inside the viewport holds it; one reaching past is itself checked as an element.
        if (getComputedStyle(a).overflowX !== 'visible' && a.getBoundingClientRect().right <= viewport + 0.5) return true;
      }
      return false;
    };
    const offenders = [...main.querySelectorAll('*'), main]
      .filter((el) => el.getBoundingClientRect().right > viewport + 0.5 && !contained(el))
      .slice(0, 5)
      .map((el) => `${el.tagName.toLowerCase()}.${[...el.classList].join('.')} right=${Math.round(el.getBoundingClientRect().right)}`);
    return { pageScroll: document.documentElement.scrollWidth, viewport, offenders };
  });
  expect(sizes.pageScroll, 'page wider than the viewport').toBeLessThanOrEqual(sizes.viewport);
  expect(sizes.offenders, `elements past the viewport (${sizes.viewport}px)`).toEqual([]);
}

function dialogsWatch(page: Page): string[] {
  const dialogs: string[] = [];
  page.on('dialog', (d) => {
    dialogs.push(d.message());
    void d.dismiss();
  });
  return dialogs;
}

/** The hostile file through the import screen; the new project's id. */
async function hostileImport(page: Page): Promise<number> {
  await page.goto('/');
  await page.getByLabel('New project name').fill('Hostile text');
  await page.getByRole('button', { name: 'Create project' }).click();
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Bring in data' }).click();
  await page.getByLabel('File to bring in').setInputFiles(hostileFile());
  await page.getByRole('button', { name: 'Preview' }).click();
  await expect(page.getByTestId('preview-utterances')).toHaveText(String(CASES.length), { timeout: SLOW });
  await expect(page.getByTestId('preview-malformed')).toHaveText('0');
  await page.getByRole('button', { name: 'Import' }).click();
  await expect(page.getByText(`Stored ${CASES.length} utterances`)).toBeVisible({ timeout: SLOW });
  const projectId = Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
  expect(projectId).toBeGreaterThan(0);
  return projectId;
}

/** Open the label screen on one utterance, as the layer the file's labels went into. */
async function labelOpen(page: Page, projectId: number, utteranceId: number | undefined, first: boolean): Promise<Locator> {
  await page.goto(`/#/p/${projectId}/label?u=${utteranceId}`);
  if (first) await page.getByRole('button', { name: 'Continue as hostile' }).click();
  const strip = page.getByRole('listbox', { name: /^Tokens of the utterance/ });
  await expect(strip).toBeVisible({ timeout: SLOW });
  return strip;
}

test('hostile utterances import, list and label inert, with the right tokens and an intact layout', async ({ page, baseURL }) => {
  test.setTimeout(240_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  const dialogs = dialogsWatch(page);
  const projectId = await hostileImport(page);

  // Stored exactly, lone surrogates included.
  const texts = await storedTexts(page);
  for (const c of CASES) expect(texts[c.id], c.id).toBe(c.text);
  const ids = await utteranceIds(page);
  const stored = await storedTokens(page);
  for (const c of CASES) {
    const pairs = stored[c.id] ?? [];
    // Offsets in order and inside the text.
    for (let i = 0; i < pairs.length; i += 2) {
      const [start, end] = [pairs[i] ?? -1, pairs[i + 1] ?? -1];
      expect(start >= (i === 0 ? 0 : (pairs[i - 1] ?? 0)) && end > start && end <= c.text.length, `${c.id} token ${i / 2}`).toBe(true);
    }
  }
  expect((stored['many-tokens'] ?? []).length / 2).toBe(1_000);

  // The utterance table: markup is shown as text, the long line does not widen the page.
  await page.goto(`/#/p/${projectId}/corpus`);
  const table = page.getByRole('main');
  await expect(table.getByText('<script>window.__pwned', { exact: false }).first()).toBeVisible({ timeout: SLOW });
  await expect(table.getByText('<img src=x onerror=', { exact: false }).first()).toBeVisible();
  await inert(page, dialogs);
  await layoutIntact(page);

  // The label screen, each case: the stored tokens on screen, nothing runs, nothing overflows.
  let first = true;
  for (const c of CASES) {
    const strip = await labelOpen(page, projectId, ids[c.id], first);
    first = false;
    // Offsets as stored by the import (the browser's own word segmentation), sliced here in Node.
    const pairs = stored[c.id] ?? [];
    const want = Array.from({ length: pairs.length / 2 }, (_, i) => c.text.slice(pairs[2 * i], pairs[2 * i + 1]));
    expect(want.length, c.id).toBeGreaterThan(0);
    // Node's segmentation agrees on every case, the markup one too: the stops rule (src/core/tokenise/stops.ts)
    // removes the one place the engines' ICU versions differ (a colon or full stop between letters).
    expect(want, `${c.id}: browser and Node tokenise alike`).toEqual(tokeniseWords(c.text).map((t) => c.text.slice(t.start, t.end)));
    const options = strip.getByRole('option');
    await expect(options, c.id).toHaveCount(want.length, { timeout: SLOW });
    expect(await options.allTextContents(), c.id).toEqual(want);
    // The whole text is on screen in order: tokens and the gaps between them.
    expect(await strip.evaluate((el) => el.textContent), c.id).toBe(c.text);
    await inert(page, dialogs);
    // The unbroken 9,950-character token is checked in the known-bug test below.
    if (c.id === 'long-line') continue;
    // Our choice: the strip wraps long lines; it never needs a sideways scroll.
    expect(await strip.evaluate((el) => el.scrollWidth <= el.clientWidth), `${c.id}: token strip overflows sideways`).toBe(true);
    await layoutIntact(page);
  }
  expect(foreign).toEqual([]);
});

test('label screen: an unbroken 9,950-character token wraps inside the token strip', async ({ page }) => {
  // Found by this test: .label-token used to be an unbreakable inline-block (fixed in label.css).
  test.setTimeout(120_000);
  const projectId = await hostileImport(page);
  const ids = await utteranceIds(page);
  const strip = await labelOpen(page, projectId, ids['long-line'], true);
  expect(await strip.evaluate((el) => el.scrollWidth <= el.clientWidth), 'token strip overflows sideways').toBe(true);
  await layoutIntact(page);
  const long = strip.getByRole('option').nth(2);
  const box = await long.boundingBox();
  expect((box?.x ?? 0) + (box?.width ?? 0)).toBeLessThanOrEqual(page.viewportSize()?.width ?? 0);
});
