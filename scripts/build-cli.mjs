// Bundles the command line into one ESM file so it starts fast (no TypeScript transpile per run).
import { build } from 'esbuild';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const { version } = JSON.parse(readFileSync(`${root}/package.json`, 'utf8'));

export async function cliBuild() {
  await build({
    entryPoints: [`${root}/src/cli/main.ts`],
    outfile: `${root}/dist-cli/slotsmith.mjs`,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    sourcemap: 'linked',
    logLevel: 'warning',
    define: { __CLI_VERSION__: JSON.stringify(version) },
    // papaparse is CommonJS; give the ESM bundle a `require` for it.
    banner: { js: "import { createRequire as __cr } from 'node:module'; const require = __cr(import.meta.url);" },
  });
}

if (process.argv[1] === fileURLToPath(import.meta.url)) await cliBuild();
