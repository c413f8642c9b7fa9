import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

export const repoRoot = fileURLToPath(new URL('../..', import.meta.url));
export const fixture = (name: string) => `${repoRoot}/tests/fixtures/cli/${name}`;

export interface CliResult {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Run the real bundled command line as a separate process, as a pipeline would. */
export function cliRun(args: string[], options: { cwd?: string } = {}): CliResult {
  const result = spawnSync(process.execPath, [`${repoRoot}/bin/slotsmith.mjs`, ...args], {
    cwd: options.cwd ?? repoRoot,
    encoding: 'utf8',
    maxBuffer: 256 * 1024 * 1024,
  });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}
