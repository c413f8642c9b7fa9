import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cliRun, fixture, repoRoot } from './run-cli';

const work = mkdtempSync(join(tmpdir(), 'slotsmith-convert-'));
const canonicalInputs = [fixture('clean.iob2'), `${repoRoot}/sample-corpus/truth.iob2`];

function convert(input: string, ...args: string[]) {
  const result = cliRun(['convert', input, ...args]);
  expect(result.stderr).toBe('');
  expect(result.code).toBe(0);
  return result.stdout;
}

describe('slotsmith convert', () => {
  it.each(canonicalInputs)('IOB2 → BIOES → IOB2 is byte-identical (%s)', (input) => {
    const original = readFileSync(input, 'utf8');
    const bioes = join(work, 'round.bioes');
    cliRun(['convert', input, '--to', 'bioes', '-o', bioes]);
    expect(readFileSync(bioes, 'utf8')).toMatch(/\t[ES]-/);
    expect(convert(bioes, '--to', 'iob2')).toBe(original);
  });

  it.each(canonicalInputs)('IOB2 → JSONL → IOB2 is byte-identical, ids and intents kept (%s)', (input) => {
    const original = readFileSync(input, 'utf8');
    const jsonl = join(work, 'round.jsonl');
    writeFileSync(jsonl, convert(input, '--to', 'jsonl'));
    const first = JSON.parse(readFileSync(jsonl, 'utf8').split('\n')[0] ?? '') as Record<string, unknown>;
    expect(first).toHaveProperty('id');
    expect(first).toHaveProperty('spans');
    expect(convert(jsonl, '--to', 'iob2')).toBe(original);
  });

  it('writes JSON Lines spans with code-point offsets and exclusive ends', () => {
    const out = convert(fixture('clean.iob2'), '--to', 'jsonl');
    const first = JSON.parse(out.split('\n')[0] ?? '') as { text: string; spans: Array<{ start: number; end: number; label: string }> };
    expect(first.spans.map((s) => [first.text.slice(s.start, s.end), s.label])).toEqual([
      ['plumber', 'service'],
      ['tomorrow', 'day'],
      ['morning', 'time_window'],
    ]);
  });

  it('writes nothing and exits 2 on malformed input, leaving an existing OUT untouched', () => {
    const out = join(work, 'kept.jsonl');
    writeFileSync(out, 'precious\n');
    const result = cliRun(['convert', fixture('malformed.iob2'), '--to', 'jsonl', '-o', out]);
    expect(result.code).toBe(2);
    expect(result.stdout).toBe('');
    expect(result.stderr).toContain(`${fixture('malformed.iob2')}:8:`);
    expect(readFileSync(out, 'utf8')).toBe('precious\n');
  });

  it('reads illegal transitions leniently and says so on stderr', () => {
    const result = cliRun(['convert', fixture('violations.iob2'), '--to', 'iob2']);
    expect(result.code).toBe(0);
    expect(result.stderr).toContain('4 illegal transition(s)');
    // CoNLL-2000 evaluation reading: the stray I-day becomes the start of a day span.
    expect(result.stdout).toContain('Tuesday\tB-day\n');
    expect(result.stdout).toContain('evening\tB-time_window\n');
  });

  it('needs --column for CSV input and reads it when given', () => {
    const csv = join(work, 'chat.csv');
    writeFileSync(csv, 'id,utterance\nc1,"book a plumber, please"\nc2,cancel my visit\n');
    expect(cliRun(['convert', csv, '--to', 'jsonl']).code).toBe(2);
    const out = convert(csv, '--to', 'jsonl', '--column', 'utterance');
    const texts = out.trim().split('\n').map((line) => (JSON.parse(line) as { text: string }).text);
    expect(texts).toEqual(['book a plumber, please', 'cancel my visit']);
  });

  it('rejects convert without --to', () => {
    const result = cliRun(['convert', fixture('clean.iob2')]);
    expect(result.code).toBe(2);
    expect(result.stderr).toContain('--to');
  });
});

describe('slotsmith convert --mask', () => {
  it('masks digits and e-mail addresses in text and tokens, keeping the labels aligned', () => {
    const input = join(work, 'contact.iob2');
    writeFileSync(
      input,
      '# id = m-1\n# text = call 555-0142 or ana@example.org\ncall\tO\n555-0142\tB-contact_phone\nor\tO\nana@example.org\tB-contact_email\n',
    );
    const out = convert(input, '--to', 'iob2', '--mask', 'digits,email');
    expect(out).toBe(
      '# id = m-1\n# text = call 000-0000 or ***************\ncall\tO\n000-0000\tB-contact_phone\nor\tO\n***************\tB-contact_email\n',
    );
    expect(out).not.toMatch(/555|ana@/);
  });

  it('rejects an unknown mask kind', () => {
    expect(cliRun(['convert', fixture('clean.iob2'), '--to', 'iob2', '--mask', 'names']).code).toBe(2);
  });
});
