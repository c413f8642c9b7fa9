import { defineConfig } from '@playwright/test';

// Debian's Chromium only: a browser download is neither needed nor possible here.
const chromiumArgs = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

const port = Number(process.env.SLOTSMITH_E2E_PORT ?? 4174);
// A run on another port builds into its own folder and keeps its own results, so runs can overlap.
const separate = process.env.SLOTSMITH_E2E_PORT !== undefined && port !== 4174;

export default defineConfig({
  testDir: 'e2e',
  fullyParallel: false,
  workers: 1,
  reporter: [['list']],
  outputDir: separate ? `test-results-${port}` : 'test-results',
  timeout: 60_000,
  use: {
    baseURL: `http://127.0.0.1:${port}`,
    headless: true,
    launchOptions: { executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', args: chromiumArgs },
  },
  projects: [{ name: 'chromium', use: { browserName: 'chromium' } }],
  webServer: {
    // The README's own command, so this run proves `npm start` serves a working page.
    command: 'node scripts/start.mjs',
    env: { PORT: String(port), ...(separate && { SLOTSMITH_OUT_DIR: `dist-e2e-${port}` }) },
    url: `http://127.0.0.1:${port}`,
    reuseExistingServer: false,
    timeout: 60_000,
  },
});
