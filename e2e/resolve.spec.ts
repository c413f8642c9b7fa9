import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { adjudicationDiff, draftStart, goldTags, spansPlace, spansTake } from '../src/core/adjudication';
import { columnsRead } from '../src/core/formats';
import type { Utterance } from '../src/core/types';
import { watchOrigins } from './helpers';

// The machine is shared: the demo import runs two files through a worker.
const SLOW = 30_000;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];
const A = new Map(columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances.map((u) => [u.id as string, u]));
const B = new Map(columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances.map((u) => [u.id as string, u]));

/**
 * Spans counted straight from IOB2 columns the CoNLL-2000 way (a stray I-X opens a span; conlleval's
 * startOfChunk, from memory), written apart from the core's decoder, as start:end:slot strings.
 */
function spansByHand(tags: readonly string[]): string[] {
  const spans: string[] = [];
  let open: { start: number; slot: string } | null = null;
  const close = (end: number) => {
    if (open !== null) spans.push(`${open.start}:${end}:${open.slot}`);
    open = null;
  };
  tags.forEach((tag, i) => {
    const slot = tag.slice(2);
    if (tag === 'O' || !/^[BI]-/.test(tag)) close(i);
    else if (tag.startsWith('B-') || (open as { slot: string } | null)?.slot !== slot) {
      close(i);
      open = { start: i, slot };
    }
  });
  close(tags.length);
  return spans;
}

/** IOB2 written by hand from those spans: what gold must hold after taking one side throughout. */
function iob2ByHand(tags: readonly string[]): string[] {
  const out = tags.map(() => 'O');
  for (const span of spansByHand(tags)) {
    const [start, end, slot] = span.split(':') as [string, string, string];
    for (let i = Number(start); i < Number(end); i++) out[i] = `${i === Number(start) ? 'B' : 'I'}-${slot}`;
  }
  return out;
}

const disagreeing = [...A.keys()].filter((id) => {
  const a = A.get(id) as Utterance;
  const b = B.get(id);
  return b !== undefined && (spansByHand(a.tags).join() !== spansByHand(b.tags).join() || (a.intent ?? '') !== (b.intent ?? ''));
});
const shared = [...A.keys()].filter((id) => B.has(id)).length;

async function demoOpen(page: Page, profile: { id: string; name: string; role: string } | null) {
  await page.addInitScript((value) => {
    // Only on the first load: later reloads keep what the test set since.
    if (sessionStorage.getItem('seeded') === null) {
      sessionStorage.setItem('seeded', '1');
      localStorage.setItem('slotsmith.session', JSON.stringify({ profile: value, blind: false }));
    }
  }, profile);
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Resolve' }).click({ timeout: SLOW });
  await expect(page.getByRole('heading', { name: 'Resolve: Home-repair demo' })).toBeVisible();
}

const utteranceHeading = (page: Page) => page.getByRole('heading', { level: 3, name: /^Utterance \d+/ });

async function openId(page: Page): Promise<string> {
  await expect(utteranceHeading(page)).toBeVisible({ timeout: SLOW });
  const text = await utteranceHeading(page).innerText();
  return /\((hr-\d+)\)/.exec(text)?.[1] ?? '';
}

async function nextOpenUtterance(page: Page, previous: string): Promise<string> {
  await page.keyboard.press('u');
  await expect(utteranceHeading(page)).not.toContainText(previous);
  return openId(page);
}

const items = (page: Page) => page.getByRole('list', { name: 'Disagreements in this utterance' }).getByRole('listitem');

test('resolve disagreements by keyboard; the exported gold layer is exactly what was chosen', async ({ page, baseURL }) => {
  test.setTimeout(180_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  expect(disagreeing.length).toBeGreaterThan(10);
  await demoOpen(page, { id: 'lead', name: 'Lead', role: 'adjudicator' });
  const progress = page.getByText(/^Resolved \d+ of \d+ utterances where/);
  await expect(progress).toHaveText(`Resolved 0 of ${disagreeing.length} utterances where ann-a and ann-b disagree`, { timeout: SLOW });
  await expect(page.getByText(`(${shared} labelled by both)`)).toBeVisible();
  // The keys are listed on screen.
  for (const key of ['Take A for the current disagreement', 'Take B for the current disagreement', 'Next disagreement (on to the next utterance after the last)', 'Previous disagreement']) {
    await expect(page.getByRole('region', { name: 'Keys' }).or(page.locator('.resolve-keys')).getByText(key)).toBeVisible();
  }
  const want = new Map<string, { tags: string[]; intent: string | undefined }>();

  // 1: the whole utterance from A.
  const first = await openId(page);
  expect(disagreeing[0]).toBe(first);
  await page.keyboard.press('Shift+A');
  await expect(progress).toContainText(`Resolved 1 of ${disagreeing.length}`);
  const a1 = A.get(first) as Utterance;
  want.set(first, { tags: iob2ByHand(a1.tags), intent: a1.intent });

  // 2: B for each disagreement in turn, with a reason written first.
  const second = await nextOpenUtterance(page, first);
  const n2 = await items(page).count();
  await page.keyboard.press('r');
  await page.keyboard.type('the customer gave the day twice');
  await page.keyboard.press('Escape');
  for (let i = 0; i < n2; i++) {
    await page.keyboard.press('b');
    await expect(page.getByText(`${i + 1} of ${n2} disagreement${n2 === 1 ? '' : 's'} settled here`)).toBeVisible();
  }
  await expect(progress).toContainText(`Resolved 2 of ${disagreeing.length}`);
  await page.getByText('Decisions so far (gold note)').click();
  await expect(page.locator('.resolve-note pre')).toContainText('took ann-b (the customer gave the day twice)');
  const b2 = B.get(second) as Utterance;
  want.set(second, { tags: iob2ByHand(b2.tags), intent: b2.intent });

  // 3: alternate A and B per disagreement; the expected gold is built with the core's own steps.
  const third = await nextOpenUtterance(page, second);
  const n3 = await items(page).count();
  for (let i = 0; i < n3; i++) {
    await page.keyboard.press(i % 2 === 0 ? 'a' : 'b');
    await expect(page.getByText(`${i + 1} of ${n3} disagreement${n3 === 1 ? '' : 's'} settled here`)).toBeVisible();
  }
  const a3 = A.get(third) as Utterance;
  const b3 = B.get(third) as Utterance;
  const diff3 = adjudicationDiff(a3.tags, b3.tags);
  const spans3 = diff3.regions.reduce((acc, r, i) => spansTake(acc, r, i % 2 === 0 ? 'a' : 'b'), draftStart(diff3));
  const intentDiffers3 = (a3.intent ?? '') !== (b3.intent ?? '');
  want.set(third, { tags: goldTags(spans3, a3.tags.length, 'iob2'), intent: intentDiffers3 ? (diff3.regions.length % 2 === 0 ? a3.intent : b3.intent) : a3.intent });
  await expect(progress).toContainText(`Resolved 3 of ${disagreeing.length}`);

  // Next and previous step through disagreements, across utterances.
  const fourth = await nextOpenUtterance(page, third);
  const n4 = await items(page).count();
  for (let i = 1; i < n4; i++) await page.keyboard.press('n');
  await expect(items(page).nth(n4 - 1)).toHaveAttribute('aria-current', 'true');
  await page.keyboard.press('n');
  await expect(utteranceHeading(page)).not.toContainText(fourth);
  await page.keyboard.press('p');
  await expect(utteranceHeading(page)).toContainText(fourth);
  await expect(items(page).nth(n4 - 1)).toHaveAttribute('aria-current', 'true');

  // A hand edit (token 1 labelled area), then B for the whole utterance; built with the core's steps.
  await page.getByRole('button', { name: /^Token 1: / }).click();
  await page.getByRole('combobox', { name: 'Slot', exact: true }).selectOption('area');
  await page.getByRole('button', { name: 'Label the selected tokens' }).click();
  await expect(page.getByText('Saved to gold: labelled tokens 1-1 as area.')).toBeVisible();
  await page.keyboard.press('Shift+B');
  await expect(page.getByText('Saved to gold: took ann-b for the whole utterance.')).toBeVisible();
  await expect(progress).toContainText(`Resolved 4 of ${disagreeing.length}`);
  const a4 = A.get(fourth) as Utterance;
  const b4 = B.get(fourth) as Utterance;
  const diff4 = adjudicationDiff(a4.tags, b4.tags);
  const spans4 = diff4.regions.reduce((acc, r) => spansTake(acc, r, 'b'), spansPlace(draftStart(diff4), 0, 1, 'area'));
  want.set(fourth, { tags: goldTags(spans4, a4.tags.length, 'iob2'), intent: (a4.intent ?? '') !== (b4.intent ?? '') ? b4.intent : a4.intent });

  // The project's list of disagreements shows which are resolved, and opens one.
  await page.getByText('All disagreements between ann-a and ann-b').click();
  const index = page.getByRole('list', { name: 'Disagreements in the project' }).getByRole('listitem');
  await expect(index.first()).toContainText('resolved');
  await index.first().getByRole('button').click();
  await expect(utteranceHeading(page)).toContainText(first);

  const axe = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`)).toEqual([]);

  // Every decision is a history row of the gold layer, written by the adjudicator, with a time.
  const history = await page.evaluate(
    () =>
      new Promise<{ annotator: string; who: string; when: number }[]>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const get = open.result.transaction('history').objectStore('history').getAll();
          get.onsuccess = () => resolve(get.result as { annotator: string; who: string; when: number }[]);
        };
      }),
  );
  const gold = history.filter((h) => h.annotator === 'gold');
  expect(gold).toHaveLength(1 + n2 + n3 + 2);
  expect(gold.every((h) => h.who === 'lead' && h.when > Date.UTC(2020, 0, 1))).toBe(true);

  // The export screen, gold layer, done only: exactly the four resolved utterances as chosen.
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Write out data' }).click();
  await page.getByLabel('Gold (the agreed labels)').check();
  await page.getByRole('button', { name: 'Write', exact: true }).click();
  const link = page.getByRole('list', { name: 'Files to save' }).getByRole('link');
  await expect(link).toHaveCount(1, { timeout: SLOW });
  const [download] = await Promise.all([page.waitForEvent('download'), link.first().click()]);
  const exported = columnsRead(readFileSync(await download.path())).utterances;
  expect(exported.map((u) => u.id).sort()).toEqual([...want.keys()].sort());
  for (const u of exported) expect({ tags: u.tags, intent: u.intent }).toEqual(want.get(u.id as string));
  expect(foreign).toEqual([]);
});

test('an annotator sees the resolver read-only, with the reason; no gold is written', async ({ page, baseURL }) => {
  test.setTimeout(120_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  await demoOpen(page, { id: 'ann-a', name: 'Ann A', role: 'annotator' });
  await expect(page.getByRole('note')).toContainText('only adjudicators write the gold layer, so this screen is read-only');
  await openId(page);
  await expect(page.getByRole('button', { name: /^Take A/ })).toHaveCount(0);
  await page.keyboard.press('a');
  await expect(page.getByText('Read-only: only an adjudicator writes gold.')).toBeVisible();
  await expect(page.getByText(/^Resolved 0 of/)).toBeVisible();
  const axe = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id}: ${v.help}`)).toEqual([]);

  // With no profile at all the screen says so too.
  await page.evaluate(() => localStorage.setItem('slotsmith.session', JSON.stringify({ profile: null, blind: true })));
  await page.reload();
  await expect(page.getByRole('note')).toContainText('No profile is chosen');
  expect(foreign).toEqual([]);
});
