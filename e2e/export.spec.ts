import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Locator, type Page } from '@playwright/test';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { columnsRead, columnsWrite } from '../src/core/formats';
import { transitionsValidate } from '../src/core/rules';
import { backupSeed } from './backup-seed';
import { watchOrigins } from './helpers';

const ANN_A = 'sample-corpus/ann-a.iob2';
const PROJECT = 'Sample ann-a';
const HOLDER = 'Restore holder';
// The machine is shared: a worker run over 1200 utterances may take longer than the default wait.
const SLOW = 30_000;
const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

/**
 * The seed: ann-a.iob2 read by the core reader in Node, one `ann-a` layer per utterance. Layers with
 * illegal transitions are marked `flagged`, the others `done`: the default export (done only) then
 * has nothing to refuse and must equal the CLI's convert of the legal utterances, while ticking
 * `flagged` too brings the refusal list up for exactly the utterances the CLI's `check` reports.
 */
const work = mkdtempSync(join(tmpdir(), 'slotsmith-export-'));
const doc = columnsRead(readFileSync(ANN_A));
const illegal = (tags: string[]) => transitionsValidate(tags, 'iob2').length > 0;
const seedPath = join(work, 'seed.slotsmith-backup.jsonl');
const seedText = backupSeed(doc.utterances, { projectName: PROJECT, annotator: 'ann-a', time: Date.UTC(2025, 4, 6, 10), statusOf: (u) => (illegal(u.tags) ? 'flagged' : 'done') });
writeFileSync(seedPath, seedText);
const legalPath = join(work, 'legal.iob2');
writeFileSync(legalPath, columnsWrite(doc.utterances.filter((u) => !illegal(u.tags))));

/** The real command line, as a user would run it. */
function cli(...args: string[]): { status: number | null; stdout: Buffer } {
  const run = spawnSync(process.execPath, ['bin/slotsmith.mjs', ...args], { maxBuffer: 64 * 1024 * 1024 });
  return { status: run.status, stdout: run.stdout };
}
function convert(file: string, to: string, ...more: string[]): Buffer {
  const run = cli('convert', file, '--to', to, ...more);
  expect(run.status).toBe(0);
  return run.stdout;
}

async function fileDownloaded(page: Page, trigger: Locator): Promise<Buffer> {
  const [download] = await Promise.all([page.waitForEvent('download'), trigger.click()]);
  return readFileSync(await download.path());
}

/** Byte for byte, with a readable diff when they differ. */
function sameBytes(got: Buffer, want: Buffer) {
  expect(got.toString('utf8')).toBe(want.toString('utf8'));
  expect(got.equals(want)).toBe(true);
}

/** A holder project gives access to the settings screen, whose restore control makes the real one. */
async function seedThroughRestore(page: Page, file = seedPath, name = PROJECT, wait = SLOW) {
  await page.goto('/');
  await expect(page.getByText('No projects yet.').or(page.getByRole('list', { name: 'Projects' }))).toBeVisible();
  if (!(await page.getByRole('list', { name: 'Projects' }).getByText(HOLDER).isVisible())) {
    await page.getByLabel('New project name').fill(HOLDER);
    await page.getByRole('button', { name: 'Create project' }).click();
  } else {
    await page.getByRole('button', { name: `Open ${HOLDER}` }).click();
  }
  await page.getByRole('button', { name: 'Project settings' }).click();
  await page.getByLabel('Restore from a backup file').setInputFiles(file);
  await expect(page.getByRole('status').filter({ hasText: 'Restored as the project' })).toContainText(name, { timeout: wait });
  await page.getByRole('button', { name: `Open “${name}”` }).click();
  await expect(page.getByRole('heading', { name: `Project settings: ${name}` })).toBeVisible();
  await page.getByRole('button', { name: 'Write out data' }).click();
  await expect(page.getByRole('heading', { name: 'Write out data' })).toBeVisible();
}

async function writeOne(page: Page): Promise<Buffer> {
  await page.getByRole('button', { name: 'Write', exact: true }).click();
  const links = page.getByRole('list', { name: 'Files to save' }).getByRole('link');
  await expect(links).toHaveCount(1, { timeout: SLOW });
  return fileDownloaded(page, links.first());
}

async function writeAsIs(page: Page): Promise<Buffer> {
  await page.getByRole('button', { name: 'Write', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'Nothing written: illegal tag sequences' })).toBeVisible({ timeout: SLOW });
  await page.getByRole('button', { name: 'Write them as they are' }).click();
  const links = page.getByRole('list', { name: 'Files to save' }).getByRole('link');
  await expect(links).toHaveCount(1, { timeout: SLOW });
  return fileDownloaded(page, links.first());
}

test('export IOB2, BIOES and JSON Lines through the UI: byte for byte the CLI convert of the same data', async ({ page, baseURL }) => {
  test.setTimeout(120_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  await seedThroughRestore(page);
  await expect(page.getByText(`${doc.utterances.length} utterances in “${PROJECT}”`)).toBeVisible();

  // Done only (the default): no illegal transitions left, so the strict export equals convert --to iob2.
  sameBytes(await writeOne(page), convert(legalPath, 'iob2'));
  await page.getByLabel('BIOES columns').check();
  sameBytes(await writeOne(page), convert(legalPath, 'bioes'));

  // With flagged layers too, export refuses and lists each illegal transition that `check` reports.
  await page.getByLabel('IOB2 columns').check();
  await page.getByRole('checkbox', { name: /^flagged/ }).check();
  await page.getByRole('button', { name: 'Write', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'Nothing written: illegal tag sequences' })).toBeVisible({ timeout: SLOW });
  const rows = page.getByRole('region', { name: 'Illegal transitions' }).locator('tbody tr');
  const check = cli('check', ANN_A, '--json');
  expect(check.status).toBe(1);
  const checked = JSON.parse(check.stdout.toString('utf8')) as { files: { violations: unknown[] }[] };
  const violationCount = checked.files[0]?.violations.length ?? -1;
  expect(violationCount).toBeGreaterThan(0);
  await expect(rows).toHaveCount(violationCount);
  await expect(page.getByText('Files ready')).toHaveCount(0);

  // As they are: IOB2 keeps the stored tags exactly, so it equals the source file (canonical IOB2),
  // not convert --to iob2, which re-encodes illegal sequences. BIOES and JSON Lines read a stray I-X
  // as a new span, as convert does, so they equal convert's output for the whole file.
  await page.getByRole('button', { name: 'Write them as they are' }).click();
  const links = page.getByRole('list', { name: 'Files to save' }).getByRole('link');
  await expect(links).toHaveCount(1, { timeout: SLOW });
  sameBytes(await fileDownloaded(page, links.first()), readFileSync(ANN_A));
  await page.getByLabel('BIOES columns').check();
  sameBytes(await writeAsIs(page), convert(ANN_A, 'bioes'));
  await page.getByLabel(/^JSON Lines/).check();
  sameBytes(await writeAsIs(page), convert(ANN_A, 'jsonl'));

  // Masking digits, done only: equals convert --mask digits, and no digit but 0 is left in any text.
  await page.getByRole('checkbox', { name: /^flagged/ }).uncheck();
  await page.getByLabel('IOB2 columns').check();
  await page.getByLabel('Mask digits (each becomes 0)').check();
  const masked = await writeOne(page);
  sameBytes(masked, convert(legalPath, 'iob2', '--mask', 'digits'));
  expect(readFileSync(legalPath, 'utf8')).toMatch(/^# text = .*[1-9]/m);
  expect(masked.toString('utf8')).not.toMatch(/^# text = .*[1-9]/m);
  expect(foreign).toEqual([]);
});

test('backup, delete the project, restore: the export is identical', async ({ page, baseURL }) => {
  test.setTimeout(120_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  await seedThroughRestore(page);
  await page.getByRole('checkbox', { name: /^flagged/ }).check();
  await page.getByLabel(/^JSON Lines/).check();
  const before = await writeAsIs(page);

  await page.getByRole('button', { name: 'Project settings' }).click();
  const backup = await fileDownloaded(page, page.getByRole('button', { name: 'Save a backup of this project' }));
  // Apart from the header's time stamp, the backup of the restored project is the seed, line for line.
  const body = (text: string) => text.split('\n').slice(1);
  expect(body(backup.toString('utf8'))).toEqual(body(seedText));
  const backupPath = join(work, 'made.slotsmith-backup.jsonl');
  writeFileSync(backupPath, backup);

  await page.getByRole('button', { name: 'All projects' }).click();
  await page.getByRole('button', { name: `Delete ${PROJECT}` }).click();
  await page.getByRole('button', { name: 'Delete for good' }).click();
  await expect(page.getByRole('list', { name: 'Projects' })).not.toContainText(PROJECT);

  await seedThroughRestore(page, backupPath);
  await page.getByRole('checkbox', { name: /^flagged/ }).check();
  await page.getByLabel(/^JSON Lines/).check();
  sameBytes(await writeAsIs(page), before);
  expect(foreign).toEqual([]);
});

test('a backup from a newer Slotsmith, or a broken one, is refused with line numbers and stores nothing; a copy gets a free name', async ({ page }) => {
  const lines = seedText.split('\n');
  const newer = join(work, 'newer.slotsmith-backup.jsonl');
  const newerText = [lines[0]?.replace(/"formatVersion":\d+/, '"formatVersion":99'), ...lines.slice(1)].join('\n');
  expect(newerText).toContain('"formatVersion":99');
  writeFileSync(newer, newerText);
  const broken = join(work, 'broken.slotsmith-backup.jsonl');
  writeFileSync(broken, [...lines.slice(0, 3), '{"type":"utterance","seq":"x"', ...lines.slice(3)].join('\n'));

  await page.goto('/');
  await page.getByLabel('New project name').fill(HOLDER);
  await page.getByRole('button', { name: 'Create project' }).click();
  await page.getByRole('button', { name: 'Project settings' }).click();
  const input = page.getByLabel('Restore from a backup file');
  await input.setInputFiles(newer);
  await expect(page.getByRole('alert')).toContainText('This backup comes from a newer Slotsmith');
  await expect(page.getByRole('list', { name: 'Problems in the backup file' })).toContainText('Line 1: made by a newer Slotsmith (format 99)');
  await input.setInputFiles(broken);
  await expect(page.getByRole('list', { name: 'Problems in the backup file' })).toContainText('Line 4:');
  await page.getByRole('button', { name: 'All projects' }).click();
  await expect(page.getByRole('list', { name: 'Projects' }).getByRole('listitem')).toHaveCount(1);

  // A restore never takes over an existing project: the second copy gets a free name.
  await page.getByRole('button', { name: `Open ${HOLDER}` }).click();
  await page.getByRole('button', { name: 'Project settings' }).click();
  await input.setInputFiles(seedPath);
  await expect(page.getByRole('status').filter({ hasText: 'Restored as' })).toContainText(`“${PROJECT}”`);
  await input.setInputFiles(seedPath);
  await expect(page.getByRole('status').filter({ hasText: 'Restored as' })).toContainText(`“${PROJECT} (restored)”`);
  await page.getByRole('button', { name: 'All projects' }).click();
  await expect(page.getByRole('list', { name: 'Projects' }).getByRole('listitem')).toHaveCount(3);
});

test('cancelling an export stops the worker, says so and offers no file; the next export still works', async ({ page, baseURL }) => {
  test.setTimeout(300_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  // Forty copies of the sample (distinct ids): reading takes long enough for Cancel to land while it runs.
  const copies = Array.from({ length: 40 }, (_, k) => doc.utterances.map((u) => ({ ...u, id: `${u.id ?? 'u'}-copy${k}` }))).flat();
  const bigPath = join(work, 'big.slotsmith-backup.jsonl');
  writeFileSync(bigPath, backupSeed(copies, { projectName: 'Big sample', annotator: 'ann-a', time: Date.UTC(2025, 4, 6, 10), statusOf: (u) => (illegal(u.tags) ? 'flagged' : 'done') }));
  // Restored in one transaction through the restore worker: on a loaded machine that takes a while.
  await seedThroughRestore(page, bigPath, 'Big sample', 150_000);
  await page.getByRole('button', { name: 'Write', exact: true }).click();
  // Reading 48,000 utterances takes seconds: the click lands while the worker runs.
  await expect(page.getByRole('progressbar', { name: 'Export progress' })).toBeVisible();
  await page.getByRole('button', { name: 'Cancel writing' }).click();
  await expect(page.getByRole('status').filter({ hasText: 'Writing was cancelled; no file was made.' })).toBeVisible();
  await expect(page.getByRole('progressbar', { name: 'Export progress' })).toHaveCount(0);
  await expect(page.getByRole('list', { name: 'Files to save' })).toHaveCount(0);
  // The worker is gone: no late progress brings the bar back.
  await page.waitForTimeout(1000);
  await expect(page.getByRole('progressbar', { name: 'Export progress' })).toHaveCount(0);
  expect(page.workers().filter((w) => w.url().includes('export.worker'))).toEqual([]);
  const links = page.getByRole('list', { name: 'Files to save' }).getByRole('link');
  await page.getByRole('button', { name: 'Write', exact: true }).click();
  await expect(links).toHaveCount(1, { timeout: 120_000 });
  const legal = copies.filter((u) => !illegal(u.tags)).length;
  await expect(page.getByText(`${legal} of ${copies.length} utterances chosen.`)).toBeVisible();
  expect(foreign).toEqual([]);
});

test('the export and settings screens have no accessibility violations (axe-core, WCAG 2.1 A/AA rules)', async ({ page }) => {
  await seedThroughRestore(page);
  await page.getByRole('checkbox', { name: /^flagged/ }).check();
  await page.getByLabel("Split into three files, keeping each intent's share alike").check();
  await page.getByRole('button', { name: 'Write', exact: true }).click();
  await expect(page.getByRole('heading', { name: 'Nothing written: illegal tag sequences' })).toBeVisible({ timeout: SLOW });
  const refused = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(refused.violations.map((v) => `${v.id}: ${v.help}`)).toEqual([]);

  await page.getByRole('button', { name: 'Write them as they are' }).click();
  await expect(page.getByRole('list', { name: 'Files to save' }).getByRole('link')).toHaveCount(3, { timeout: SLOW });
  const written = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(written.violations.map((v) => `${v.id}: ${v.help}`)).toEqual([]);

  await page.getByRole('button', { name: 'Project settings' }).click();
  await expect(page.getByText(/used of|does not say how much/)).toBeVisible();
  const settings = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  expect(settings.violations.map((v) => `${v.id}: ${v.help}`)).toEqual([]);
});
