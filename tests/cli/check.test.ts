import { describe, expect, it } from 'vitest';
import { cliRun, fixture } from './run-cli';

// The contracts below are the command line's own (README, DEVELOPERS.md); line numbers were counted by
// hand in the fixture files under tests/fixtures/cli.

function checkJson(...args: string[]) {
  const result = cliRun(['check', '--json', ...args]);
  return { ...result, report: JSON.parse(result.stdout) as { files: Array<Record<string, unknown>> } };
}

describe('slotsmith check', () => {
  it('exits 0 on a clean IOB2 file and counts utterances and tokens', () => {
    const { code, report } = checkJson(fixture('clean.iob2'));
    expect(code).toBe(0);
    expect(report.files).toEqual([
      expect.objectContaining({ file: fixture('clean.iob2'), utterances: 2, tokens: 17, violations: [], errors: [] }),
    ]);
  });

  it('exits 1 on transition violations and reports the line of the later token', () => {
    const { code, report } = checkJson(fixture('violations.iob2'));
    expect(code).toBe(1);
    const [file] = report.files;
    expect(file?.errors).toEqual([]);
    expect(file?.violations).toEqual([
      { line: 8, tag: 'I-day', previous: 'O', rule: expect.any(String) },
      { line: 13, tag: 'I-service', previous: null, rule: expect.any(String) },
      { line: 19, tag: 'I-day', previous: 'B-service', rule: expect.any(String) },
      { line: 20, tag: 'I-time_window', previous: 'I-day', rule: expect.any(String) },
    ]);
    const rules = (file?.violations as Array<{ rule: string }>).map((v) => v.rule);
    // I-X after O, at the start, and after another slot are three different rules.
    expect(new Set(rules).size).toBe(3);
    expect(rules[2]).toBe(rules[3]);
  });

  it('reports a BIOES span still open at the end of an utterance at its last token', () => {
    const { code, report } = checkJson('--scheme', 'bioes', fixture('unclosed.bioes'));
    expect(code).toBe(1);
    const violations = report.files[0]?.violations as Array<{ line: number; tag: string | null; previous: string | null }>;
    expect(violations.map((v) => v.line)).toEqual([5, 11]);
    expect(violations[0]).toMatchObject({ tag: 'B-time_window', previous: 'B-contact_phone' });
    expect(violations[1]).toMatchObject({ tag: null, previous: 'I-service' });
  });

  it('detects BIOES from the file itself when --scheme is absent', () => {
    const { report } = checkJson(fixture('unclosed.bioes'));
    expect(report.files[0]).toMatchObject({ scheme: 'bioes' });
    expect((report.files[0]?.violations as unknown[]).length).toBe(2);
  });

  it('exits 2 on malformed lines, naming each line, and keeps counting the good utterances', () => {
    const { code, report } = checkJson(fixture('malformed.iob2'));
    expect(code).toBe(2);
    const errors = report.files[0]?.errors as Array<{ line: number; message: string }>;
    expect(errors.map((e) => e.line)).toEqual([8, 12, 16]);
    expect(errors[0]?.message).toMatch(/tag/i);
    expect(errors[1]?.message).toContain('Q-problem');
    expect(errors[2]?.message).toContain('B-');
    expect(report.files[0]?.utterances).toBeGreaterThanOrEqual(1);
  });

  it('exits 2 on undecodable bytes and names the line', () => {
    const { code, report } = checkJson(fixture('bad-bytes.iob2'));
    expect(code).toBe(2);
    const errors = report.files[0]?.errors as Array<{ line: number; message: string }>;
    expect(errors).toEqual([{ line: 3, message: expect.stringMatching(/UTF-8/i) }]);
    expect(report.files[0]?.utterances).toBe(1);
  });

  it('exits 2 when a file cannot be read, and still reports the others', () => {
    const { code, report } = checkJson(fixture('clean.iob2'), fixture('no-such-file.iob2'));
    expect(code).toBe(2);
    expect(report.files).toHaveLength(2);
    expect(report.files[1]?.errors).toEqual([{ line: 0, message: expect.stringContaining('ENOENT') }]);
  });

  it('malformed input outranks violations in the exit code', () => {
    expect(cliRun(['check', fixture('violations.iob2'), fixture('malformed.iob2')]).code).toBe(2);
  });

  it('prints file:line: message lines a person can act on', () => {
    const { code, stdout } = cliRun(['check', fixture('violations.iob2')]);
    expect(code).toBe(1);
    const lines = stdout.trim().split('\n');
    expect(lines[0]).toMatch(new RegExp(`^${fixture('violations.iob2')}:8: .*I-day.*\\[[a-z0-9/-]+\\]$`));
    expect(lines.at(-1)).toContain('4 transition violation(s)');
  });

  it('rejects a bad option with exit 2 and the usage text', () => {
    const result = cliRun(['check', '--scheme', 'bilou', fixture('clean.iob2')]);
    expect(result.code).toBe(2);
    expect(result.stderr).toContain('--scheme must be one of');
  });
});
