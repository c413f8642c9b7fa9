/**
 * Nothing leaves the machine: every screen with the demo project loaded makes no request beyond the
 * local server, the Content-Security-Policy allows no other origin, and the built scripts and styles
 * name no other host except in the harmless strings listed below.
 */
import { expect, test } from '@playwright/test';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { PROJECT_VIEWS } from '../src/state/nav';
import { watchOrigins } from './helpers';

const SLOW = 60_000;

/** CSP source expressions that name no other origin (CSP Level 3, section 2.3.1 "Source Lists"). */
// 'wasm-unsafe-eval' names no origin: it lets the page compile WebAssembly (the bootstrap), never eval text.
const LOCAL_SOURCES = new Set(["'self'", "'none'", 'data:', 'blob:', "'wasm-unsafe-eval'"]);

/** URLs in the bundle that are text, never fetched (and the CSP would block them anyway). */
const HARMLESS_URLS: { pattern: RegExp; reason: string }[] = [
  { pattern: /^http:\/\/www\.w3\.org\/(1999\/xlink|2000\/svg|XML\/1998\/namespace|1998\/Math\/MathML)$/, reason: 'XML namespace names used by React DOM for SVG/MathML; identifiers, not addresses' },
  { pattern: /^https:\/\/tinyurl\.com\/y2uuvskb$/, reason: 'Dexie error message text ("IndexedDB API missing. Please visit …")' },
  { pattern: /^http:\/\/bit\.ly\/2kdckMn$/, reason: 'Dexie error message text ("Transaction committed too early. See …")' },
  { pattern: /^https:\/\/react\.dev\/errors\/$/, reason: "React's production error message points there for the full text" },
  { pattern: /^https:\/\/github\.com\/mholt\/PapaParse$/, reason: 'papaparse error message text' },
];

function cspParse(policy: string): Map<string, string[]> {
  const directives = new Map<string, string[]>();
  for (const part of policy.split(';')) {
    const [name, ...sources] = part.trim().split(/\s+/);
    if (name !== undefined && name !== '') directives.set(name.toLowerCase(), sources);
  }
  return directives;
}

function outDir(): string {
  const port = Number(process.env.SLOTSMITH_E2E_PORT ?? 4174);
  return process.env.SLOTSMITH_E2E_PORT !== undefined && port !== 4174 ? `dist-e2e-${port}` : 'dist';
}

test('every screen with the demo project loaded stays on the local server', async ({ page, baseURL }) => {
  test.setTimeout(240_000);
  const foreign = watchOrigins(page, baseURL ?? '');
  // Any socket or worker fetch shows up as a request too; track those separately to name them.
  const sockets: string[] = [];
  page.on('websocket', (ws) => sockets.push(ws.url()));

  await page.goto('/');
  await page.getByRole('button', { name: /Try the demo project/ }).click();
  await page.waitForURL(/#\/p\/\d+\//, { timeout: SLOW });
  const projectId = Number(/#\/p\/(\d+)\//.exec(page.url())?.[1]);
  expect(projectId).toBeGreaterThan(0);

  const visited: string[] = [];
  for (const view of PROJECT_VIEWS) {
    await page.goto(`/#/p/${projectId}/${view}`);
    await expect(page.getByRole('main')).toBeVisible();
    await page.waitForLoadState('networkidle');
    visited.push(view);
  }
  await page.goto('/#/');
  await page.waitForLoadState('networkidle');
  await expect(page.getByRole('list', { name: 'Projects' })).toBeVisible();
  expect(visited).toEqual([...PROJECT_VIEWS]);
  expect(foreign).toEqual([]);
  expect(sockets).toEqual([]);
});

test('the Content-Security-Policy allows no other origin', async ({ page, request }) => {
  await page.goto('/');
  const fromPage = await page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content');
  // The served file says the same as the live page.
  const served = await (await request.get('/')).text();
  expect(served).toContain('http-equiv="Content-Security-Policy"');
  expect(fromPage).not.toBeNull();
  const csp = cspParse(fromPage ?? '');
  expect(csp.get('default-src')).toEqual(["'self'"]);
  expect(csp.get('connect-src')).toEqual(["'self'"]);
  expect(csp.get('object-src')).toEqual(["'none'"]);
  for (const [name, sources] of csp) {
    for (const source of sources) expect(LOCAL_SOURCES.has(source), `${name} allows ${source}`).toBe(true);
  }
  // Every fetch directive is covered: listed, or falling back to default-src 'self' (CSP Level 3, section 6.1).
  expect(csp.has('default-src')).toBe(true);
});

test('the built scripts and styles name no other host, apart from known harmless strings', () => {
  const dir = join(outDir(), 'assets');
  const files = readdirSync(dir).filter((f) => /\.(js|css)$/.test(f));
  expect(files.length).toBeGreaterThan(0);
  const unexplained: string[] = [];
  const seen = new Set<string>();
  // The service worker and the manifest sit beside index.html, outside assets/.
  const top = ['index.html', 'sw.js', 'manifest.webmanifest'].map((f) => join(outDir(), f));
  for (const file of [...files.map((f) => join(dir, f)), ...top]) {
    const text = readFileSync(file, 'utf8');
    for (const match of text.matchAll(/\bhttps?:\/\/[^\s"'`)\\<>]+/g)) {
      const url = match[0].replace(/[.,;]+$/, '');
      if (/^https?:\/\/(127\.0\.0\.1|localhost)([:/]|$)/.test(url)) continue;
      seen.add(url);
      if (!HARMLESS_URLS.some((h) => h.pattern.test(url))) unexplained.push(`${file}: ${url}`);
    }
  }
  expect(unexplained).toEqual([]);
  // The list stays honest: each exception is still present (drop it when its source is gone).
  for (const h of HARMLESS_URLS) expect([...seen].some((u) => h.pattern.test(u)), `${h.pattern} (${h.reason}) no longer found`).toBe(true);
});
