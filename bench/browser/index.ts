/**
 * The browser part of `npm run bench`: in one Chromium run, the raw IndexedDB put rate (the limit),
 * the app's import of the 100k-utterance file through the real UI, the page heap after it, and the
 * export of the same project through "Write out data", key-press-to-paint on the label screen of that
 * project, the agreement dashboard on a 100k double-annotated project, and the page's longest task
 * while the Model screen trains on the demo project. Numbers are printed,
 * never asserted.
 */
import { existsSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext } from '@playwright/test';
import { columnsWrite } from '../../src/core/formats';
import type { Utterance } from '../../src/core/types';
import { corpusGenerate } from '../../scripts/corpus/generate';
import { appExport, appImport, heapAfterGc } from './app-flow';
import { agreementDashboardBench, agreementDashboardPrint } from './agreement-dashboard';
import { idbRawRate } from './idb-raw';
import { labelKeysBench } from './label-keys';
import { modelTrainBench, modelTrainPrint } from './model-train';
import { workerCdp, workerHeap, workerHeapPeak } from './worker-cdp';
import { distEnsure, previewStart } from './server';

// As playwright.config.ts, plus --expose-gc so the page can collect before the heap is read.
const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--js-flags=--expose-gc',
];
const HEAP_TARGET_MB = 150;

export interface BrowserBenchOptions {
  root: string;
  out: string;
  count: number;
  seed: number;
}

/** The same file as run.ts's prepare() writes (annotated.iob2), reused when already there. */
function fileEnsure({ out, count, seed }: BrowserBenchOptions): string {
  const file = `${out}/annotated.iob2`;
  if (existsSync(file)) return file;
  const corpus = corpusGenerate({ seed, count });
  const byId = new Map<string, Utterance>();
  for (const layer of corpus.layers) for (const u of layer.utterances) if (u.id !== undefined && !byId.has(u.id)) byId.set(u.id, u);
  writeFileSync(file, columnsWrite(corpus.truth.map((u) => ({ ...(byId.get(u.id ?? '') ?? u), meta: {} }))));
  return file;
}

const mb = (bytes: number) => bytes / (1024 * 1024);
const met = (ok: boolean) => (ok ? 'met' : 'NOT met');

export async function browserBench(options: BrowserBenchOptions): Promise<void> {
  const { root, count } = options;
  const file = fileEnsure(options);
  distEnsure(root);
  const server = await previewStart(root);
  // One profile folder for both launches below, so the second finds the projects the first stored.
  const profile = mkdtempSync(join(tmpdir(), 'slotsmith-bench-profile-'));
  const launch = (extra: string[]) =>
    chromium.launchPersistentContext(profile, { executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', headless: true, args: [...CHROMIUM_ARGS, ...extra], acceptDownloads: true });
  let context: BrowserContext = await launch([]);
  try {
    const page = context.pages()[0] ?? (await context.newPage());
    await page.goto(server.url);
    console.log(`\n== browser: IndexedDB limit, app import/export of ${mb(statSync(file).size).toFixed(1)} MB IOB2 (Chromium headless, one run each)`);
    const rawDefault = await idbRawRate(page, count, 'default');
    const rawStrict = await idbRawRate(page, count, 'strict');
    for (const r of [rawDefault, rawStrict]) {
      console.log(`  raw IndexedDB put, ${r.durability.padEnd(7)} durability  ${r.seconds.toFixed(2).padStart(7)} s  ${r.perSecond.toFixed(0).padStart(7)} records/s (${r.records} records, 5,000 a transaction)`);
    }

    // Attached before the import, so the import worker (started by Preview) is watched from its start.
    const workers = await workerCdp(page);
    const peak = workerHeapPeak(workers, 'import.worker');
    const imported = await appImport(page, server.url, file, 'Bench import');
    const workerPeakMb = await peak.stop();
    const rate = imported.utterances / imported.seconds;
    console.log(`  app preview (read + checks)          ${imported.previewSeconds.toFixed(2).padStart(7)} s`);
    console.log(`  app import (Import → summary)        ${imported.seconds.toFixed(2).padStart(7)} s  ${rate.toFixed(0).padStart(7)} utterances/s (${imported.utterances} utterances)`);
    // The app's own transactions are strict, so strict is the like-for-like limit; default is shown too.
    for (const r of [rawStrict, rawDefault]) {
      const ratio = rate / r.perSecond;
      console.log(`  ratio import/raw ${r.durability.padEnd(7)}: ${ratio.toFixed(3)} (target ≥ 1/3: ${met(ratio >= 1 / 3)})`);
    }

    const heap = await heapAfterGc(page);
    console.log(
      `  page JS heap after import, after GC: ${heap.pageMb.toFixed(1)} MB used of ${heap.pageTotalMb.toFixed(1)} MB` +
        `${heap.memoryApiMb === null ? '' : ` (performance.memory: ${heap.memoryApiMb.toFixed(1)} MB)`}`,
    );
    // The import worker keeps running after the import (one per tab): its heap is the data side of the import.
    const workerBefore = await workerHeap(workers, 'import.worker', false);
    const workerAfter = await workerHeap(workers, 'import.worker', true);
    console.log(
      `  import worker JS heap (CDP Runtime.getHeapUsage on the worker): peak while importing ${workerPeakMb.toFixed(1)} MB (sampled every 250 ms), ` +
        `after import ${workerBefore.usedMb.toFixed(1)} MB, after GC ${workerAfter.usedMb.toFixed(1)} MB`,
    );
    const totalMb = heap.pageMb + workerAfter.usedMb;
    const peakTotalMb = heap.pageMb + workerPeakMb;
    console.log(
      `  page + import worker after import, after GC: ${totalMb.toFixed(1)} MB (target ≤ ${HEAP_TARGET_MB} MB: ${met(totalMb <= HEAP_TARGET_MB)}); ` +
        `with the worker's peak instead: ${peakTotalMb.toFixed(1)} MB (${met(peakTotalMb <= HEAP_TARGET_MB)})`,
    );
    await workers.detach();

    const exported = await appExport(page, imported.annotator);
    console.log(
      `  app export IOB2, one annotator, done   ${exported.seconds.toFixed(2).padStart(7)} s  ${(mb(exported.bytes) / exported.seconds).toFixed(1)} MB/s output (${mb(exported.bytes).toFixed(1)} MB)` +
        (exported.refused ? ', after the illegal-sequence refusal, written as they are' : ''),
    );

    // The export leaves the page on the imported project's screens: its id is in the URL.
    const projectId = Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
    console.log(`\n== browser: label screen of the ${count.toLocaleString('en')}-utterance project`);
    await labelKeysBench(page, server.url, projectId);
    agreementDashboardPrint(await agreementDashboardBench(page, server.url, { out: options.out, count, seed: options.seed }));
    modelTrainPrint(await modelTrainBench(page, server.url));

    // The same presses with frames drawn as soon as they are ready (no wait for the 60 Hz clock): what
    // remains is the app's own work from key to paint, whatever the phase of the press in the frame.
    await context.close();
    context = await launch(['--disable-frame-rate-limit', '--disable-gpu-vsync']);
    console.log(`\n== browser: label screen again, same project, frame rate not capped`);
    await labelKeysBench(context.pages()[0] ?? (await context.newPage()), server.url, projectId, {
      frames: 'drawn as soon as ready (--disable-frame-rate-limit --disable-gpu-vsync): no wait for the next 60 Hz frame',
    });
  } finally {
    await context.close();
    server.stop();
    rmSync(profile, { recursive: true, force: true });
  }
}
