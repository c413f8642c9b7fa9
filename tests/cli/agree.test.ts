import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cliRun, repoRoot } from './run-cli';

const corpus = (name: string) => `${repoRoot}/sample-corpus/${name}`;
const work = mkdtempSync(join(tmpdir(), 'slotsmith-agree-'));

function agreeJson(...args: string[]) {
  const result = cliRun(['agree', '--json', ...args]);
  expect(result.stderr).toBe('');
  expect(result.code).toBe(0);
  return JSON.parse(result.stdout) as Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any
}

describe('slotsmith agree', () => {
  it('prints the documented JSON shape for two layers, with full-precision numbers', () => {
    const report = agreeJson('--bootstrap', '200', corpus('ann-a.iob2'), corpus('ann-b.iob2'));
    expect(report.utterances).toBe(400);
    expect(report.tokens).toBeGreaterThan(4000);
    for (const key of ['tag', 'slot', 'slotAnnotated']) expect(typeof report.kappa[key]).toBe('number');
    expect(typeof report.intent.kappa).toBe('number');
    expect(typeof report.spans.exactF1).toBe('number');
    expect(report.spans.overlapF1).toBeGreaterThanOrEqual(report.spans.exactF1);
    expect(Object.keys(report.perSlot)).toContain('day');
    expect(report.perSlot.day).toEqual(expect.objectContaining({ kappa: expect.any(Number), exactF1: expect.any(Number), a: expect.any(Number), b: expect.any(Number) }));
    expect(report.ci.resamples).toBe(200);
    expect(report.ci.kappa.slot.low).toBeLessThanOrEqual(report.kappa.slot);
    expect(report.ci.kappa.slot.high).toBeGreaterThanOrEqual(report.kappa.slot);
    expect(report).not.toHaveProperty('fleissKappa');
    // Full precision: JSON numbers are not rounded for display.
    expect(String(report.kappa.slot).length).toBeGreaterThan(10);
  });

  it('agrees with scikit-learn on the slot-type kappa of the sample pair', () => {
    // Outside reference: scikit-learn's cohen_kappa_score (Debian python3-sklearn) through the
    // benchmark's Python pipeline. Slot types are unaffected by reading illegal transitions leniently.
    const python = spawnSync('/usr/bin/python3', [`${repoRoot}/bench/python/agree_baseline.py`, corpus('ann-a.iob2'), corpus('ann-b.iob2')], { encoding: 'utf8' });
    expect(python.status, `scikit-learn reference failed (install python3-sklearn; npm test does): ${python.stderr}`).toBe(0);
    const sklearn = JSON.parse(python.stdout) as { tokens: number; slot: number };
    const report = agreeJson('--bootstrap', '0', corpus('ann-a.iob2'), corpus('ann-b.iob2'));
    expect(report.tokens).toBe(sklearn.tokens);
    expect(Math.abs(report.kappa.slot - sklearn.slot)).toBeLessThan(1e-12);
  });

  it("adds Fleiss' kappa, Krippendorff's alpha and pairwise kappas for three layers", () => {
    const report = agreeJson('--bootstrap', '0', corpus('ann-a.iob2'), corpus('ann-b.iob2'), corpus('truth.iob2'));
    expect(typeof report.fleissKappa.slot).toBe('number');
    expect(typeof report.alpha.slot).toBe('number');
    expect(report.pairwise.layers).toHaveLength(3);
    expect(report.pairwise.kappa[0][1]).toBe(report.kappa.slot);
    expect(report.ci).toBeNull();
  });

  it('gives intent null when the files carry no intents, and null figures with a reason when undefined', () => {
    const a = join(work, 'plain-a.iob2');
    const b = join(work, 'plain-b.iob2');
    writeFileSync(a, '# id = p1\nfix\tO\nit\tO\n');
    writeFileSync(b, '# id = p1\nfix\tO\nit\tO\n');
    const report = agreeJson('--bootstrap', '0', a, b);
    expect(report.intent).toBeNull();
    expect(report.kappa.slot).toBeNull();
    expect(report.reasons['kappa.slot']).toMatch(/expected agreement is 1/);
  });

  it('exits 2 naming the utterance and both files and lines when tokens differ', () => {
    const a = join(work, 'mismatch-a.iob2');
    const b = join(work, 'mismatch-b.iob2');
    writeFileSync(a, '# id = m1\nfix\tO\nsink\tB-problem\n\n# id = m2\nok\tO\n');
    writeFileSync(b, '# id = m1\nfix\tO\nthe\tO\nsink\tB-problem\n\n# id = m2\nok\tO\n');
    const result = cliRun(['agree', a, b]);
    expect(result.code).toBe(2);
    expect(result.stdout).toBe('');
    expect(result.stderr).toContain('m1');
    expect(result.stderr).toContain(`${a} (line 1)`);
    expect(result.stderr).toContain(`${b} (line 1)`);
  });

  it('exits 2 on malformed input with file:line messages', () => {
    const result = cliRun(['agree', `${repoRoot}/tests/fixtures/cli/malformed.iob2`, corpus('ann-a.iob2')]);
    expect(result.code).toBe(2);
    expect(result.stderr).toContain('malformed.iob2:8: error:');
  });

  it('prints a readable table with the Landis & Koch caution', () => {
    const result = cliRun(['agree', '--bootstrap', '100', corpus('ann-a.iob2'), corpus('ann-b.iob2')]);
    expect(result.code).toBe(0);
    expect(result.stdout).toMatch(/Cohen's kappa, slot types +0\.\d{3} +\w+/);
    expect(result.stdout).toContain('not thresholds');
    expect(result.stdout).toContain('most differing utterances');
  });

  it('needs two files', () => {
    expect(cliRun(['agree', corpus('ann-a.iob2')]).code).toBe(2);
  });
});
