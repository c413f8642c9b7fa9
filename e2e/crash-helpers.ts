/** Shared by the crash tests: a persistent Chromium profile, its browser process, a seeded generator. */
import { chromium, type BrowserContext } from '@playwright/test';
import { readdirSync, readFileSync } from 'node:fs';
import config from '../playwright.config';

/** mulberry32: a small seeded generator, so a failing run can be repeated (common practice, no source). */
export function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export async function launch(dir: string, downloads = false): Promise<BrowserContext> {
  const options = config.use?.launchOptions ?? {};
  return chromium.launchPersistentContext(dir, {
    headless: true,
    executablePath: options.executablePath ?? '/usr/bin/chromium',
    args: options.args ?? [],
    serviceWorkers: 'block',
    acceptDownloads: downloads,
  });
}

/** The browser process we launched on `dir` (the one without --type=, i.e. not a renderer or helper). */
export function browserPid(dir: string): number {
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    let cmdline: string;
    try {
      cmdline = readFileSync(`/proc/${entry}/cmdline`, 'utf8');
    } catch {
      continue;
    }
    const args = cmdline.split('\0');
    if (args.includes(`--user-data-dir=${dir}`) && !args.some((a) => a.startsWith('--type='))) return Number(entry);
  }
  throw new Error(`no browser process for ${dir}`);
}
