import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { crfModelFromJson } from '../../src/core/crf';
import { cliRun } from './run-cli';

const work = mkdtempSync(join(tmpdir(), 'slotsmith-train-'));

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


describe('slotsmith train', () => {
  it('writes a versioned model file and reports what it learnt', () => {
    const input = join(work, 'small.iob2');
    smallFileWrite(input);
    const model = join(work, 'small.model.json');
    const result = cliRun(['train', input, input, '-o', model, '--iterations', '15', '--c2', '0.5', '--seed', '9']);
    expect(result.code).toBe(0);
    // The stray I-service is read the CoNLL-2000 way (it starts a span) and reported.
    expect(result.stderr).toMatch(/1 illegal transition/);
    expect(result.stderr).toMatch(/trained on 4 utterance\(s\), 20 token\(s\): 6 labels/);
    const loaded = crfModelFromJson(readFileSync(model, 'utf8'));
    expect(loaded.labels).toEqual(['O', 'B-area', 'I-area', 'B-day', 'B-problem', 'B-service']);
    expect(loaded.training).toMatchObject({ c2: 0.5, seed: 9, maxIterations: 15, utterances: 4 });
  });

  it('gives the same file for the same input and seed', () => {
    const input = join(work, 'small.iob2');
    smallFileWrite(input);
    const a = join(work, 'a.json');
    const b = join(work, 'b.json');
    expect(cliRun(['train', input, '-o', a, '--iterations', '10']).code).toBe(0);
    expect(cliRun(['train', input, '-o', b, '--iterations', '10']).code).toBe(0);
    expect(readFileSync(a, 'utf8')).toBe(readFileSync(b, 'utf8'));
  });

  it('refuses bad usage and unreadable input with exit 2', () => {
    expect(cliRun(['train', join(work, 'small.iob2')]).stderr).toMatch(/needs -o MODEL/);
    expect(cliRun(['train', join(work, 'missing.iob2'), '-o', join(work, 'x.json')]).code).toBe(2);
    expect(cliRun(['train', join(work, 'small.iob2'), '-o', join(work, 'x.json'), '--c2', 'lots']).code).toBe(2);
  });
});
