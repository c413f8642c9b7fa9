/**
 * Crash safety: random label edits, the browser killed with SIGKILL at random moments (no polite
 * close), relaunched on the same profile: every edit acknowledged on screen ("Saved (revision N).")
 * before the kill is stored, and the database opens cleanly. Layers are written with strict
 * durability (src/db/schema.ts), which is what makes an acknowledged save survive.
 *
 * `npm test` runs SLOTSMITH_CRASH_EDITS=60 edits (about three kills); the full run is
 *   SLOTSMITH_CRASH_EDITS=1000 SLOTSMITH_E2E_PORT=4188 npx playwright test e2e/crash.spec.ts
 */
import { expect, test, type Page } from '@playwright/test';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { browserPid, launch, random } from './crash-helpers';

const SLOW = 60_000;
const EDITS = Number(process.env.SLOTSMITH_CRASH_EDITS ?? 60);
const SEED = Number(process.env.SLOTSMITH_CRASH_SEED ?? 20_261_202);
const UTTERANCES = 12;

interface Layer {
  status: string;
  revision: number;
}

function layersRead(page: Page, ids: number[]): Promise<Record<number, Layer>> {
  return page.evaluate(
    (wanted) =>
      new Promise<Record<number, Layer>>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const store = open.result.transaction('layers').objectStore('layers');
          const out: Record<number, Layer> = {};
          for (const id of wanted) {
            const req = store.get([id, 'ann-a']);
            req.onsuccess = () => {
              const row = req.result as Layer | undefined;
              if (row !== undefined) out[id] = { status: row.status, revision: row.revision };
            };
          }
          store.transaction.oncomplete = () => {
            open.result.close();
            resolve(out);
          };
        };
      }),
    ids,
  );
}

function utteranceIds(page: Page, projectId: number, count: number): Promise<number[]> {
  return page.evaluate(
    ([project, n]) =>
      new Promise<number[]>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction('utterances').objectStore('utterances').getAll();
          req.onsuccess = () => {
            open.result.close();
            const rows = (req.result as { id: number; projectId: number; seq: number }[]).filter((r) => r.projectId === project).sort((a, b) => a.seq - b.seq);
            resolve(rows.slice(0, n).map((r) => r.id));
          };
        };
      }),
    [projectId, count] as const,
  );
}

const tokens = (page: Page) => page.getByRole('listbox', { name: /^Tokens of the utterance/ });

test('label edits survive SIGKILL of the browser at random moments', async ({ baseURL }) => {
  test.setTimeout(Math.max(300_000, EDITS * 2_000));
  const dir = mkdtempSync(join(tmpdir(), 'slotsmith-crash-'));
  const next = random(SEED);
  let context = await launch(dir);
  let page = context.pages()[0] ?? (await context.newPage());
  await page.goto(baseURL ?? '/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await page.waitForURL(/#\/p\/\d+\//, { timeout: SLOW });
  const projectId = Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
  const ids = await utteranceIds(page, projectId, UTTERANCES);
  expect(ids).toHaveLength(UTTERANCES);
  await page.goto(`${baseURL}/#/p/${projectId}/label?u=${ids[0]}`);
  await page.getByRole('button', { name: 'Continue as ann-a' }).click();
  await expect(tokens(page)).toBeVisible({ timeout: SLOW });

  /** What the screen acknowledged last, per utterance. */
  let acked = await layersRead(page, ids);
  let made = 0;
  let kills = 0;
  let lost = 0;
  let profileLost = 0;
  while (made < EDITS) {
    const burst = Math.min(EDITS - made, 5 + Math.floor(next() * 25));
    for (let i = 0; i < burst; i++) {
      const id = ids[Math.floor(next() * ids.length)] ?? 0;
      const now = acked[id] ?? { status: 'unlabelled', revision: 0 };
      const target = now.status === 'done' ? 'flagged' : 'done';
      await page.goto(`${baseURL}/#/p/${projectId}/label?u=${id}`);
      await expect(tokens(page)).toBeVisible({ timeout: SLOW });
      // The screen shows this utterance's stored revision first, so the next "Saved" is this edit's.
      if (now.revision > 0) await expect(page.getByText(`Saved (revision ${now.revision}).`, { exact: true })).toBeVisible({ timeout: SLOW });
      await tokens(page).focus();
      await page.keyboard.press(target === 'done' ? 'Shift+D' : 'Shift+F');
      await expect(page.getByText(`Saved (revision ${now.revision + 1}).`, { exact: true })).toBeVisible({ timeout: SLOW });
      acked = { ...acked, [id]: { status: target, revision: now.revision + 1 } };
      made++;
    }
    // One more edit in flight, then the kill at a random moment (0–40 ms): it may or may not be stored.
    const inflight = ids[Math.floor(next() * ids.length)] ?? 0;
    const inflightFrom = acked[inflight] ?? { status: 'unlabelled', revision: 0 };
    const inflightTarget = inflightFrom.status === 'done' ? 'flagged' : 'done';
    await page.goto(`${baseURL}/#/p/${projectId}/label?u=${inflight}`);
    await expect(tokens(page)).toBeVisible({ timeout: SLOW });
    await tokens(page).focus();
    await page.keyboard.press(inflightTarget === 'done' ? 'Shift+D' : 'Shift+F');
    await new Promise((r) => setTimeout(r, Math.floor(next() * 40)));
    process.kill(browserPid(dir), 'SIGKILL');
    kills++;
    await context.close().catch(() => undefined);

    context = await launch(dir);
    page = context.pages()[0] ?? (await context.newPage());
    await page.goto(`${baseURL}/#/p/${projectId}/label?u=${ids[0]}`);
    // The database opens cleanly: the app reads it and the label screen renders. The labeller choice
    // lives in localStorage, which Chromium writes lazily: a kill may lose it, so it is asked again.
    const again = page.getByRole('button', { name: 'Continue as ann-a' });
    await expect(tokens(page).or(again)).toBeVisible({ timeout: SLOW });
    if (await again.isVisible()) {
      profileLost++;
      await again.click();
      await expect(tokens(page)).toBeVisible({ timeout: SLOW });
    }
    const stored = await layersRead(page, ids);
    for (const id of ids) {
      const want = acked[id] ?? { status: 'unlabelled', revision: 0 };
      const got = stored[id] ?? { status: 'unlabelled', revision: 0 };
      const inflightLanded = id === inflight && got.revision === want.revision + 1 && got.status === inflightTarget;
      if (!inflightLanded && (got.revision !== want.revision || got.status !== want.status)) lost++;
      expect(inflightLanded || got, `utterance ${id} after kill ${kills}`).toEqual(inflightLanded ? true : want);
    }
    acked = stored;
  }
  console.log(`crash: ${made} acknowledged edits, ${kills} kills, ${lost} edits lost (labeller choice asked again after ${profileLost} kills)`);
  expect(lost).toBe(0);
  await context.close();
  rmSync(dir, { recursive: true, force: true });
});

function counts(page: Page): Promise<{ utterances: number; layers: number; history: number; batches: string[] }> {
  return page.evaluate(
    () =>
      new Promise<{ utterances: number; layers: number; history: number; batches: string[] }>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const tx = open.result.transaction(['utterances', 'layers', 'history', 'batches']);
          const out = { utterances: 0, layers: 0, history: 0, batches: [] as string[] };
          const u = tx.objectStore('utterances').count();
          u.onsuccess = () => (out.utterances = u.result);
          const l = tx.objectStore('layers').count();
          l.onsuccess = () => (out.layers = l.result);
          const h = tx.objectStore('history').count();
          h.onsuccess = () => (out.history = h.result);
          const b = tx.objectStore('batches').getAll();
          b.onsuccess = () => (out.batches = (b.result as { state: string }[]).map((r) => r.state));
          tx.oncomplete = () => {
            open.result.close();
            resolve(out);
          };
        };
      }),
  );
}

test('a kill in the middle of an import leaves nothing partial; the next start undoes it and says so', async ({ baseURL }) => {
  test.setTimeout(240_000);
  const dir = mkdtempSync(join(tmpdir(), 'slotsmith-crash-import-'));
  let text = '';
  for (let i = 0; i < 120_000; i++) text += `# id = k-${i}\n# intent = book_visit\nplumber\tB-service\non\tO\nday${i}\tB-day\n\n`;
  const file = join(dir, '..', `${dir.split('/').pop()}-visits.iob2`);
  writeFileSync(file, text);
  let context = await launch(dir);
  let page = context.pages()[0] ?? (await context.newPage());
  await page.goto(baseURL ?? '/');
  await page.getByLabel('New project name').fill('Killed import');
  await page.getByRole('button', { name: 'Create project' }).click();
  await page.getByRole('navigation', { name: 'Screens' }).getByRole('button', { name: 'Bring in data' }).click();
  await page.getByLabel('File to bring in').setInputFiles(file);
  await page.getByRole('button', { name: 'Preview' }).click();
  await expect(page.getByTestId('preview-utterances')).toHaveText('120,000', { timeout: SLOW });
  const before = await counts(page);
  await page.getByRole('button', { name: 'Import' }).click();
  // Some chunks are stored: the kill lands in the middle.
  await expect(page.getByText(/^[1-9][\d,]* of 120,000 utterances$/)).toBeVisible({ timeout: SLOW });
  const during = await counts(page);
  process.kill(browserPid(dir), 'SIGKILL');
  await context.close().catch(() => undefined);

  context = await launch(dir);
  page = context.pages()[0] ?? (await context.newPage());
  await page.goto(baseURL ?? '/');
  await expect(page.getByText(/An unfinished import was undone after the tab closed: .*visits\.iob2\. Nothing from it was kept\./)).toBeVisible({ timeout: SLOW });
  const after = await counts(page);
  expect(during.batches).toContain('importing');
  expect({ utterances: after.utterances, layers: after.layers, history: after.history }).toEqual({ utterances: before.utterances, layers: before.layers, history: before.history });
  expect(after.batches).not.toContain('importing');
  await page.reload();
  await expect(page.getByText(/An unfinished import was undone/)).toHaveCount(0);
  await context.close();
  rmSync(dir, { recursive: true, force: true });
  rmSync(file, { force: true });
});

interface HistoryStep {
  before: { status: string; revision: number } | null;
  after: { status: string; revision: number };
  who: string;
}

function historyOf(page: Page, utteranceId: number): Promise<HistoryStep[]> {
  return page.evaluate(
    (id) =>
      new Promise<HistoryStep[]>((resolve, reject) => {
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction('history').objectStore('history').getAll();
          req.onsuccess = () => {
            open.result.close();
            const rows = (req.result as (HistoryStep & { id: number; utteranceId: number; annotator: string })[]).filter((h) => h.utteranceId === id && h.annotator === 'ann-a');
            resolve(rows.sort((a, b) => a.id - b.id).map((h) => ({ before: h.before && { status: h.before.status, revision: h.before.revision }, after: { status: h.after.status, revision: h.after.revision }, who: h.who })));
          };
        };
      }),
    utteranceId,
  );
}

test('two tabs editing the same layer: the stale one is asked, and both versions stay in the history', async ({ page, context, baseURL }) => {
  test.setTimeout(180_000);
  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await page.waitForURL(/#\/p\/\d+\//, { timeout: SLOW });
  const projectId = Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
  const [id] = await utteranceIds(page, projectId, 1);
  await page.goto(`${baseURL}/#/p/${projectId}/label?u=${id}`);
  await page.getByRole('button', { name: 'Continue as ann-a' }).click();
  await expect(page.getByText('Saved (revision 1).', { exact: true })).toBeVisible({ timeout: SLOW });

  const other = await context.newPage();
  await other.goto(`${baseURL}/#/p/${projectId}/label?u=${id}`);
  await expect(other.getByText('Saved (revision 1).', { exact: true })).toBeVisible({ timeout: SLOW });
  await tokens(other).focus();
  await other.keyboard.press('Shift+F');
  await expect(other.getByText('Saved (revision 2).', { exact: true })).toBeVisible({ timeout: SLOW });

  // The first tab still shows revision 1; its edit is not written over the other one.
  await tokens(page).focus();
  await page.keyboard.press('Shift+S');
  const prompt = page.getByRole('dialog', { name: 'This utterance was changed in another tab or window' });
  await expect(prompt).toBeVisible({ timeout: SLOW });
  expect((await layersRead(page, [id ?? 0]))[id ?? 0]).toEqual({ status: 'flagged', revision: 2 });
  await prompt.getByRole('button', { name: 'Apply my change on top' }).click();
  await expect(page.getByText('Saved (revision 3).', { exact: true })).toBeVisible({ timeout: SLOW });
  expect((await layersRead(page, [id ?? 0]))[id ?? 0]).toEqual({ status: 'skipped', revision: 3 });
  // Both versions can be recovered: the other tab's (revision 2, flagged) and this one's (revision 3).
  const steps = await historyOf(page, id ?? 0);
  expect(steps.map((h) => [h.before?.revision ?? 0, h.after.revision, h.after.status])).toEqual([
    [1, 2, 'flagged'],
    [2, 3, 'skipped'],
  ]);
});
