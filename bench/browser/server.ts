import { spawn, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

export interface PreviewServer {
  url: string;
  stop: () => void;
}

/** Builds the app only when dist/ is missing (BENCH_BUILD=1 forces it), so a run can reuse a build. */
export function distEnsure(root: string): void {
  if (existsSync(`${root}/dist/index.html`) && process.env.BENCH_BUILD !== '1') return;
  console.log('building the app (npx vite build)…');
  const build = spawnSync('npx', ['vite', 'build'], { cwd: root, stdio: 'inherit' });
  if (build.status !== 0) throw new Error(`vite build failed (exit ${build.status})`);
}

/**
 * `vite preview` in its own process group, so stopping it also ends the npx wrapper's child.
 * --bypass-lock: vite refuses a second preview of one project, and an e2e run may hold the first.
 */
export async function previewStart(root: string, port = 4196): Promise<PreviewServer> {
  const url = `http://127.0.0.1:${port}`;
  const child = spawn('npx', ['vite', 'preview', '--port', String(port), '--strictPort', '--host', '127.0.0.1', '--bypass-lock'], {
    cwd: root,
    detached: true,
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  const stop = () => {
    if (child.pid !== undefined && child.exitCode === null) {
      try {
        process.kill(-child.pid, 'SIGTERM');
      } catch {
        // Already gone.
      }
    }
  };
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`vite preview exited with ${child.exitCode}`);
    try {
      if ((await fetch(url)).ok) return { url, stop };
    } catch {
      // Not listening yet.
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  stop();
  throw new Error(`vite preview did not answer at ${url} within 60 s`);
}
