import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

// Outside references, run by Debian's interpreter: scikit-learn (cohen_kappa_score), NLTK
// (nltk.metrics.agreement.AnnotationTask) and numpy (percentile); see tests/reference/agreement_reference.py.
const PYTHON = '/usr/bin/python3';
const SCRIPT = fileURLToPath(new URL('../../reference/agreement_reference.py', import.meta.url));
const INSTALL_HINT =
  'install Debian python3-sklearn, python3-nltk and python3-numpy (apt-get install python3-sklearn python3-nltk python3-numpy; `npm test` installs them)';

export type ReferenceRequest =
  | { op: 'cohen'; a: string[]; b: string[] }
  | { op: 'nltk'; data: [string, string, string][]; measures: string[] }
  | { op: 'percentile'; values: number[]; q: number[] };

export type NltkAnswer = Record<string, number | null | { error: string }>;

/** One Python process answers a whole batch; a missing interpreter or package fails with a hint. */
export function referenceRun(requests: readonly ReferenceRequest[]): unknown[] {
  if (!existsSync(PYTHON)) throw new Error(`${PYTHON} is missing: ${INSTALL_HINT}`);
  const run = spawnSync(PYTHON, [SCRIPT], { input: JSON.stringify(requests), encoding: 'utf8', maxBuffer: 256 << 20 });
  if (run.error !== undefined) throw new Error(`${PYTHON} could not run (${run.error.message}): ${INSTALL_HINT}`);
  if (run.status !== 0) {
    const hint = /No module named/.test(run.stderr) ? INSTALL_HINT : 'see the error above';
    throw new Error(`agreement_reference.py failed (exit ${String(run.status)}):\n${run.stderr}\n${hint}`);
  }
  const answers = JSON.parse(run.stdout) as unknown[];
  if (answers.length !== requests.length) throw new Error(`expected ${String(requests.length)} answers, got ${String(answers.length)}`);
  return answers;
}
