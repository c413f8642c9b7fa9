import { readFileSync } from 'node:fs';
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

export default defineConfig({
  plugins: [react(), demoCorpus()],
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
