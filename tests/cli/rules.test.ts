import { describe, expect, it } from 'vitest';
import { cliRun } from './run-cli';

describe('slotsmith rules', () => {
  it('lists every IOB2 rule id that check can report, plus the schema rules', () => {
    const { code, stdout } = cliRun(['rules', '--scheme', 'iob2', '--json']);
    expect(code).toBe(0);
    const ids = (JSON.parse(stdout) as { rules: Array<{ id: string }> }).rules.map((r) => r.id);
    expect(ids).toContain('iob2/inside-after-outside');
    expect(ids).toContain('schema/unknown-slot');
    expect(ids.some((id) => id.startsWith('bioes/'))).toBe(false);
  });

  it('prints one aligned line per rule without --json', () => {
    const { code, stdout } = cliRun(['rules', '--scheme', 'bioes']);
    expect(code).toBe(0);
    expect(stdout).toMatch(/^bioes\/unclosed-at-end +The utterance ends inside a span/m);
  });

  it('prints its version and usage', () => {
    expect(cliRun(['--version']).stdout.trim()).toMatch(/^\d+\.\d+\.\d+$/);
    const help = cliRun(['--help']);
    expect(help.code).toBe(0);
    expect(help.stdout).toContain('slotsmith check FILE');
    expect(cliRun([]).code).toBe(2);
  });
});
