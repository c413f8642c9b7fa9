#!/usr/bin/env node
// Runs the bundled command line, rebuilding the bundle first when a source file is newer.
import { existsSync, readdirSync, statSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const bundle = `${root}/dist-cli/slotsmith.mjs`;

function newestMtime(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = `${dir}/${entry.name}`;
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(path) : statSync(path).mtimeMs);
  }
  return newest;
}

const stale =
  !existsSync(bundle) ||
  statSync(bundle).mtimeMs < Math.max(newestMtime(`${root}/src/core`), newestMtime(`${root}/src/cli`));
if (stale && existsSync(`${root}/scripts/build-cli.mjs`)) {
  const { cliBuild } = await import(pathToFileURL(`${root}/scripts/build-cli.mjs`).href);
  await cliBuild();
}
const { main } = await import(pathToFileURL(bundle).href);
process.exitCode = await main(process.argv.slice(2));
