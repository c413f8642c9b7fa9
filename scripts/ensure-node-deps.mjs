// Installs npm dependencies when node_modules is missing or older than package-lock.json.
import { execSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const lock = readFileSync(`${root}/package-lock.json`);
const digest = createHash('sha256').update(lock).update(readFileSync(`${root}/package.json`)).digest('hex');
const stamp = `${root}/node_modules/.slotsmith-installed`;

if (existsSync(stamp) && readFileSync(stamp, 'utf8') === digest) process.exit(0);
console.log('[deps] installing npm dependencies (npm ci)…');
execSync('npm ci --no-audit --no-fund', { cwd: root, stdio: 'inherit' });
writeFileSync(stamp, digest);
