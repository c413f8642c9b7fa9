import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { agreementCompute, layersAlign } from '../../src/core/agreement';
import { columnsRead } from '../../src/core/formats';
import { agreeJson } from '../../src/cli/commands/agree-json';
import { AGREE_THREADS_FROM_BYTES, agreeThreadsChoose } from '../../src/cli/commands/agree-workers';
import { repoRoot } from './run-cli';

const corpus = (name: string) => `${repoRoot}/sample-corpus/${name}`;

/** The bundled CLI with SLOTSMITH_WORKERS set (0 = everything on the main thread). */
function agreeWith(workers: number, args: string[]): { code: number | null; stdout: string; stderr: string } {
  const result = spawnSync(process.execPath, [`${repoRoot}/bin/slotsmith.mjs`, 'agree', ...args], {
    cwd: repoRoot,
    encoding: 'utf8',
    env: { ...process.env, SLOTSMITH_WORKERS: String(workers) },
  });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}

describe('slotsmith agree on worker threads', () => {
  const files = [corpus('ann-a.iob2'), corpus('ann-b.iob2'), corpus('truth.iob2')];

  it('prints the same figures and intervals whatever the number of threads, equal to the in-process core', () => {
    const args = ['--json', '--bootstrap', '257', '--seed', '9', ...files];
    const outputs = [0, 1, 2, 3].map((workers) => agreeWith(workers, args));
    for (const output of outputs) {
      expect(output.stderr).toBe('');
      expect(output.code).toBe(0);
      expect(output.stdout).toBe(outputs[0]?.stdout);
    }
    const layers = files.map((file) => ({ name: file, ...columnsRead(readFileSync(file, 'utf8')) }));
    const aligned = layersAlign(layers);
    if (!aligned.ok) throw new Error('sample corpus did not align');
    const core = agreementCompute(aligned.corpus, { bootstrap: 257, seed: 9 });
    expect(JSON.parse(outputs[0]?.stdout ?? '')).toEqual(JSON.parse(JSON.stringify(agreeJson(core))));
    expect(JSON.parse(outputs[2]?.stdout ?? '').ci.resamples).toBe(257);
  });

  it('reports read errors and token mismatches the same way on threads', () => {
    const work = mkdtempSync(join(tmpdir(), 'slotsmith-agree-workers-'));
    const changed = join(work, 'ann-b-changed.iob2');
    // The first utterance's first token "where" becomes "when": a token mismatch with ann-a.
    writeFileSync(changed, readFileSync(corpus('ann-b.iob2'), 'utf8').replace('\nwhere\tO\n', '\nwhen\tO\n'));
    for (const args of [[corpus('ann-a.iob2'), join(work, 'no-such-file.iob2')], [corpus('ann-a.iob2'), changed]]) {
      const [here, threads] = [0, 2].map((workers) => agreeWith(workers, args));
      expect(here?.code).toBe(2);
      expect(here?.stderr).toContain(args[1]);
      expect(threads).toEqual(here);
    }
  });
});

describe('slotsmith agree on worker threads, files big enough to share', () => {
  /** The sample pair `copies` times over with distinct ids (~6 MB each): the main thread may take a tail of a helper's file. */
  function bigPair(work: string, copies: number, change: (text: string) => string = (t) => t): string[] {
    return ['ann-a.iob2', 'ann-b.iob2'].map((name, i) => {
      const one = readFileSync(corpus(name), 'utf8').trimEnd();
      const text = Array.from({ length: copies }, (_, c) => `${one.replace(/^# id = (.*)$/gmu, `# id = $1-${String(c)}`)}\n\n`).join('');
      const path = join(work, name);
      writeFileSync(path, i === 1 ? change(text) : text);
      return path;
    });
  }

  it('prints the same figures, and the same errors, whatever the number of threads', () => {
    const work = mkdtempSync(join(tmpdir(), 'slotsmith-agree-big-'));
    const files = bigPair(work, 22);
    const outputs = [0, 1, 2, 3].map((workers) => agreeWith(workers, ['--json', '--bootstrap', '0', files[1] ?? '', files[0] ?? '']));
    expect(outputs[0]?.code).toBe(0);
    expect(JSON.parse(outputs[0]?.stdout ?? '').utterances).toBeGreaterThan(22 * 100);
    for (const output of outputs) expect(output).toEqual(outputs[0]);

    const bad = join(work, 'bad');
    mkdirSync(bad);
    // An odd tag half way through B, and a token in its last utterance that is not in its `# text`.
    const broken = bigPair(bad, 22, (text) => {
      const last = text.lastIndexOf('\tO\n');
      const middle = text.indexOf('\tO\n', text.length >> 1);
      return `${text.slice(0, middle)}\tQ-day\n${text.slice(middle + 3, last)}zz\tO\n${text.slice(last + 3)}`;
    });
    const failures = [0, 1, 2].map((workers) => agreeWith(workers, ['--json', '--bootstrap', '0', broken[1] ?? '', broken[0] ?? '']));
    expect(failures[0]?.code).toBe(2);
    expect(failures[0]?.stderr).toMatch(/:\d+: error: tag "Q-day"/u);
    expect(failures[0]?.stderr).toMatch(/:\d+: error: token\/text mismatch: token "\w*zz"/u);
    for (const output of failures) expect(output).toEqual(failures[0]);
    // The last utterance of B loses its last token: a token count mismatch found in alignment.
    const mismatch = bigPair(join(work, 'bad'), 22, (text) => `${text.trimEnd().slice(0, text.trimEnd().lastIndexOf('\n'))}\n\n`);
    const mismatches = [0, 1, 2].map((workers) => agreeWith(workers, ['--json', '--bootstrap', '0', mismatch[1] ?? '', mismatch[0] ?? '']));
    expect(mismatches[0]?.code).toBe(2);
    expect(mismatches[0]?.stderr).toMatch(/ann-b\.iob2 \(line \d+\) has \d+ tokens, .*ann-a\.iob2 \(line \d+\) has \d+/u);
    for (const output of mismatches) expect(output).toEqual(mismatches[0]);
  });
});

describe('agreeThreadsChoose', () => {
  it('starts helpers by itself only for large inputs on machines with two CPUs or more, one fewer than the CPUs (the main thread works too)', () => {
    expect(agreeThreadsChoose(undefined, 2, AGREE_THREADS_FROM_BYTES)).toBe(1);
    expect(agreeThreadsChoose(undefined, 16, AGREE_THREADS_FROM_BYTES)).toBe(3);
    expect(agreeThreadsChoose(undefined, 2, AGREE_THREADS_FROM_BYTES - 1)).toBe(0);
    expect(agreeThreadsChoose(undefined, 1, 10 * AGREE_THREADS_FROM_BYTES)).toBe(0);
  });

  it('starts none by itself when the load average already fills every CPU, but follows SLOTSMITH_WORKERS whatever the load', () => {
    expect(agreeThreadsChoose(undefined, 2, AGREE_THREADS_FROM_BYTES, 1.9)).toBe(1);
    expect(agreeThreadsChoose(undefined, 2, AGREE_THREADS_FROM_BYTES, 2)).toBe(0);
    expect(agreeThreadsChoose(undefined, 16, AGREE_THREADS_FROM_BYTES, 15)).toBe(3);
    expect(agreeThreadsChoose('1', 2, AGREE_THREADS_FROM_BYTES, 6)).toBe(1);
  });

  it('follows SLOTSMITH_WORKERS when set, within twice the CPUs; anything but digits means none', () => {
    expect(agreeThreadsChoose('0', 8, 10 * AGREE_THREADS_FROM_BYTES)).toBe(0);
    expect(agreeThreadsChoose('3', 2, 0)).toBe(3);
    expect(agreeThreadsChoose('64', 2, 0)).toBe(4);
    expect(agreeThreadsChoose('two', 2, 10 * AGREE_THREADS_FROM_BYTES)).toBe(0);
    expect(agreeThreadsChoose('', 2, AGREE_THREADS_FROM_BYTES)).toBe(1);
  });
});
