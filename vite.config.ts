import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, relative, resolve, sep } from 'node:path';
import react from '@vitejs/plugin-react';
import type { Plugin } from 'vite';
import { defineConfig } from 'vitest/config';

const pkg = JSON.parse(readFileSync(new URL('./package.json', import.meta.url), 'utf8')) as { version: string };

// The demo project's files, served from sample-corpus/ under /demo/ (emitted into the build, never copied into public/).
const DEMO_FILES = ['ann-a.iob2', 'ann-b.iob2', 'schema.json'];

function demoCorpus(): Plugin {
  const read = (name: string) => readFileSync(new URL(`./sample-corpus/${name}`, import.meta.url));
  return {
    name: 'slotsmith-demo-corpus',
    configureServer(server) {
      server.middlewares.use((req, res, next) => {
        const name = /^\/demo\/([^/?#]+)/.exec(req.url ?? '')?.[1];
        if (name === undefined || !DEMO_FILES.includes(name)) return next();
        res.setHeader('Content-Type', name.endsWith('.json') ? 'application/json' : 'text/plain; charset=utf-8');
        res.end(read(name));
      });
    },
    generateBundle() {
      for (const name of DEMO_FILES) this.emitFile({ type: 'asset', fileName: `demo/${name}`, source: read(name) });
    },
  };
}

/** Every file under `dir`, as paths relative to it with forward slashes. */
function filesUnder(dir: string): string[] {
  return readdirSync(dir, { recursive: true, withFileTypes: true })
    .filter((entry) => entry.isFile())
    .map((entry) => relative(dir, join(entry.parentPath, entry.name)).split(sep).join('/'));
}

/**
 * Offline use: after the build, fill public/sw.js's precache list with every built file (source maps
 * aside) and stamp a version hashed from their contents, so each new build installs a new worker.
 * Hand-written rather than a PWA plugin: ~40 lines instead of ~320 extra packages (TOOLCHAIN.md).
 */
function offlineWorker(): Plugin {
  let outDir = 'dist';
  return {
    name: 'slotsmith-offline-worker',
    apply: 'build',
    configResolved(config) {
      outDir = resolve(config.root, config.build.outDir);
    },
    closeBundle() {
      const files = filesUnder(outDir)
        .filter((f) => f !== 'sw.js' && !f.endsWith('.map'))
        .sort();
      const hash = createHash('sha256');
      for (const f of files) hash.update(f).update(readFileSync(join(outDir, f)));
      const worker = join(outDir, 'sw.js');
      const source = readFileSync(worker, 'utf8');
      const filled = source
        .replace("'dev'; /* slotsmith:version */", `${JSON.stringify(hash.digest('hex').slice(0, 16))};`)
        // The page is cached as `/`: the preview server redirects /index.html there, and a redirected
        // response cannot answer a navigation (Service Workers spec, "handle fetch", from memory).
        .replace('[]; /* slotsmith:precache */', `${JSON.stringify(files.map((f) => (f === 'index.html' ? '/' : `/${f}`)))};`);
      if (filled === source) throw new Error('public/sw.js lost its slotsmith:version / slotsmith:precache markers');
      writeFileSync(worker, filled);
    },
  };
}

export default defineConfig({
  plugins: [react(), demoCorpus(), offlineWorker()],
  define: {
    __APP_VERSION__: JSON.stringify(pkg.version),
  },
  build: {
    outDir: 'dist',
    sourcemap: true,
  },
  preview: {
    host: '127.0.0.1',
    port: 4173,
  },
  test: {
    include: ['tests/**/*.test.ts', 'tests/**/*.test.tsx'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: 'forks',
    globalSetup: ['tests/global-setup.ts'],
  },
});
