// `npm start`: install when needed, build the app, serve it on localhost and print the address.
import { execSync, spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
execSync('node scripts/ensure-node-deps.mjs', { cwd: root, stdio: 'inherit' });
// SLOTSMITH_OUT_DIR lets parallel test runs (one per port) build without overwriting each other.
// Vite allows one build/preview per project at a time; a run with its own folder may bypass that lock.
const outDir = process.env.SLOTSMITH_OUT_DIR ?? 'dist';
const lock = process.env.SLOTSMITH_OUT_DIR === undefined ? [] : ['--bypass-lock'];
execSync(['npx vite build --logLevel warn --outDir', JSON.stringify(outDir), ...lock].join(' '), { cwd: root, stdio: 'inherit' });

const port = process.env.PORT ?? '4173';
console.log(`\nSlotsmith is being served at http://127.0.0.1:${port}/ (Ctrl+C stops it; another port is used if ${port} is taken: see below)\n`);
// An explicit PORT must be honoured exactly (tests wait on it); the default may move if taken.
const strict = process.env.PORT === undefined ? [] : ['--strictPort'];
const server = spawn('npx', ['vite', 'preview', '--host', '127.0.0.1', '--port', port, '--outDir', outDir, ...lock, ...strict], { cwd: root, stdio: 'inherit' });
const stop = () => server.kill('SIGTERM');
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
server.on('exit', (code) => process.exit(code ?? 0));
