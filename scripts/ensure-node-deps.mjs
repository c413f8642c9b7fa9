// Installs npm dependencies when node_modules is missing or older than package-lock.json.
import { execSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const stamp = `${root}/node_modules/.slotsmith-installed`;
// Two runs starting at once (parallel test runs) must not both wipe node_modules with `npm ci`.
const lockDir = `${root}/.deps-install.lock`;
const LOCK_STALE_MS = 10 * 60 * 1000;

function digestNow() {
  const lock = readFileSync(`${root}/package-lock.json`);
  return createHash('sha256').update(lock).update(readFileSync(`${root}/package.json`)).digest('hex');
}

function current() {
  return existsSync(stamp) && readFileSync(stamp, 'utf8') === digestNow();
}

function lockTake() {
  for (;;) {
    try {
      mkdirSync(lockDir);
      return;
    } catch (error) {
      if (error.code !== 'EEXIST') throw error;
      try {
        if (Date.now() - statSync(lockDir).mtimeMs > LOCK_STALE_MS) rmSync(lockDir, { recursive: true, force: true });
      } catch {
        // Removed by its owner meanwhile.
      }
      execSync('sleep 1');
    }
  }
}

if (current()) process.exit(0);
lockTake();
try {
  // Another run may have installed while this one waited.
  if (!current()) {
    console.log('[deps] installing npm dependencies (npm ci)…');
    execSync('npm ci --no-audit --no-fund', { cwd: root, stdio: 'inherit' });
    writeFileSync(stamp, digestNow());
  }
} finally {
  rmSync(lockDir, { recursive: true, force: true });
}
