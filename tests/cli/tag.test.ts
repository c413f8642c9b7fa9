import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { cliRun } from './run-cli';

const work = mkdtempSync(join(tmpdir(), 'slotsmith-tag-'));

/** Invented utterances (home-repair scenario) in IOB2, with one illegal transition (line 4). */
function smallFileWrite(path: string): void {
  writeFileSync(
    path,
    [
      '# id = t-1',
      'book\tO',
      'a\tO',
      'plumber\tI-service',
      'for\tO',
      'monday\tB-day',
      '',
      '# id = t-2',
      'my\tO',
      'kitchen\tB-area',
      'sink\tI-area',
      'is\tO',
      'blocked\tB-problem',
      '',
    ].join('\n'),
  );
}

const model = join(work, 'model.json');
const training = join(work, 'small.iob2');

beforeAll(() => {
  smallFileWrite(training);
  expect(cliRun(['train', training, '-o', model, '--iterations', '60', '--c2', '0.01']).code).toBe(0);
});

describe('slotsmith tag', () => {
  it('tags plain text into IOB2 with legal transitions', () => {
    const input = join(work, 'plain.txt');
    writeFileSync(input, 'book a plumber for monday\nmy kitchen sink is blocked\n');
    const result = cliRun(['tag', model, input, '--from', 'text']);
    expect(result.code).toBe(0);
    expect(result.stdout).toContain('# text = book a plumber for monday\nbook\tO\na\tO\nplumber\tB-service\nfor\tO\nmonday\tB-day\n');
    expect(result.stdout).toContain('kitchen\tB-area\nsink\tI-area\n');
  });

  it('replaces tags of a labelled file, keeps ids, writes other schemes and JSON Lines', () => {
    const out = join(work, 'tagged.bioes');
    expect(cliRun(['tag', model, training, '--to', 'bioes', '-o', out]).code).toBe(0);
    const written = readFileSync(out, 'utf8');
    expect(written).toContain('# id = t-2');
    expect(written).toContain('kitchen\tB-area\nsink\tE-area\n');
    const jsonl = cliRun(['tag', model, training, '--to', 'jsonl']).stdout.trim().split('\n');
    expect(jsonl).toHaveLength(2);
    expect((JSON.parse(jsonl[1] as string) as { spans: unknown[] }).spans).toHaveLength(2);
  });

  it('refuses a file that is not a model', () => {
    const result = cliRun(['tag', training, training]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/not JSON/);
  });
});
