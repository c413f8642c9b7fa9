import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { cliRun } from './run-cli';

const work = mkdtempSync(join(tmpdir(), 'slotsmith-evaluate-'));

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

describe('slotsmith evaluate', () => {
  it('scores spans per slot against a gold file, worked by hand', () => {
    // The model tags "book a plumber for monday" / "my kitchen sink is blocked" as trained
    // (service, day / area, problem). Gold below differs: day spans two tokens, area is absent.
    const gold = join(work, 'gold.iob2');
    writeFileSync(gold, 'book\tO\na\tO\nplumber\tB-service\nfor\tB-day\nmonday\tI-day\n\nmy\tO\nkitchen\tO\nsink\tO\nis\tO\nblocked\tB-problem\n');
    const result = cliRun(['evaluate', model, gold, '--json']);
    expect(result.code).toBe(0);
    const report = JSON.parse(result.stdout) as {
      slots: Record<string, { truePositives: number; falsePositives: number; falseNegatives: number; f1: number }>;
      overall: { precision: number; recall: number; f1: number };
      exactUtterances: number;
    };
    expect(report.slots.service).toMatchObject({ truePositives: 1, falsePositives: 0, falseNegatives: 0, f1: 1 });
    expect(report.slots.day).toMatchObject({ truePositives: 0, falsePositives: 1, falseNegatives: 1 });
    expect(report.slots.area).toMatchObject({ truePositives: 0, falsePositives: 1, falseNegatives: 0 });
    expect(report.slots.problem?.f1).toBe(1);
    // Overall: tp 2 (service, problem), fp 2 (day, area), fn 1 (day) → P = 2/4, R = 2/3, F1 = 4/7.
    expect(report.overall.precision).toBeCloseTo(0.5, 12);
    expect(report.overall.recall).toBeCloseTo(2 / 3, 12);
    expect(report.overall.f1).toBeCloseTo(4 / 7, 12);
    expect(report.exactUtterances).toBe(0);
  });

  it('prints a table with an overall row', () => {
    const result = cliRun(['evaluate', model, training]);
    expect(result.code).toBe(0);
    expect(result.stdout).toMatch(/^overall +100\.00 +100\.00 +100\.00 +4 +4$/m);
    expect(result.stdout).toContain('utterances with every span right: 2 of 2');
  });
});
