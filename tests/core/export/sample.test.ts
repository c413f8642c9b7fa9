import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { convertRun, type OutputFormat } from '../../../src/cli/commands/convert';
import { violationsLocate } from '../../../src/cli/commands/check';
import {
  type ExportItem,
  ExportRefusedError,
  exportCheck,
  exportSelect,
  exportWrite,
  splitAssign,
} from '../../../src/core/export';
import { columnsRead, columnsWrite } from '../../../src/core/formats';
import type { MaskKind } from '../../../src/core/privacy';
import { transitionsAreLegal } from '../../../src/core/rules';
import type { Utterance } from '../../../src/core/types';

// The committed sample corpus (invented home-repair messages); ann-a keeps 9 illegal transitions on purpose.
const SAMPLE = new URL('../../../sample-corpus/ann-a.iob2', import.meta.url);
const source = readFileSync(SAMPLE, 'utf8');
const document = columnsRead(source);
const work = mkdtempSync(join(tmpdir(), 'slotsmith-export-'));

/** What the storage layer would hand over: each read utterance as ann-a's layer with `status`. */
function itemsOf(utterances: readonly Utterance[], status: (u: Utterance) => 'done' | 'draft'): ExportItem[] {
  return utterances.map((u) => ({
    id: u.id,
    text: u.text,
    tokens: u.tokens,
    meta: u.meta,
    layers: [{ annotator: 'ann-a', tags: u.tags, intent: u.intent, status: status(u) }],
  }));
}

/** The command line's `convert` on a file holding `utterances`, run in-process with captured output. */
function cliConvert(utterances: readonly Utterance[], to: OutputFormat, mask: readonly MaskKind[] = []): string {
  const input = join(work, `in-${to}-${mask.join('-')}.iob2`);
  writeFileSync(input, columnsWrite(utterances));
  let out = '';
  const code = convertRun(input, { from: 'iob2', to, mask }, { out: (t) => (out += t), err: () => undefined });
  expect(code).toBe(0);
  return out;
}

const selectAnnA = (items: ExportItem[]) => exportSelect(items, { policy: { kind: 'annotator', annotator: 'ann-a' } });

describe('export of the sample corpus', () => {
  it('reads the sample cleanly; its column file is already canonical', () => {
    expect(document.errors).toEqual([]);
    expect(document.utterances).toHaveLength(1200);
    expect(columnsWrite(document.utterances)).toBe(source);
  });

  const all = selectAnnA(itemsOf(document.utterances, () => 'done'));

  it('lists the same illegal transitions as the command line `check`, and refuses to export', () => {
    const violations = exportCheck(all);
    const fromCli = violationsLocate(document.utterances, 'iob2');
    expect(violations.length).toBeGreaterThan(0);
    expect(violations.map((v) => [v.rule, v.message])).toEqual(fromCli.map((v) => [v.rule, v.message]));
    // Each entry points at its utterance and token: the token's file line is the one `check` reports.
    violations.forEach((v, k) => {
      const u = document.utterances[v.position];
      expect(v.id).toBe(u?.id);
      expect(v.annotator).toBe('ann-a');
      expect(u?.tokenLines?.[v.index]).toBe(fromCli[k]?.line);
    });
    for (const format of ['iob2', 'bioes', 'jsonl'] as const) {
      let refused: unknown;
      try {
        exportWrite(all, { format });
      } catch (error) {
        refused = error;
      }
      expect(refused).toBeInstanceOf(ExportRefusedError);
      expect((refused as ExportRefusedError).violations).toEqual(violations);
    }
  });

  it('as-is IOB2 writes the stored tags untouched: the canonical writer on the read file, i.e. the file itself', () => {
    const [file] = exportWrite(all, { format: 'iob2', asIs: true });
    expect(file).toMatchObject({ part: 'all', count: 1200 });
    expect(file?.content).toBe(source);
    // `convert` would have re-encoded the illegal sequences leniently, so it differs exactly there.
    expect(file?.content).not.toBe(cliConvert(document.utterances, 'iob2'));
  });

  it('as-is BIOES and JSON Lines equal `convert` (both read illegal tags leniently)', () => {
    for (const format of ['bioes', 'jsonl'] as const) {
      expect(exportWrite(all, { format, asIs: true })[0]?.content).toBe(cliConvert(document.utterances, format));
    }
  });

  // Utterances still holding illegal transitions stay drafts; the default filter (done only) leaves them out.
  const clean = document.utterances.filter((u) => transitionsAreLegal(u.tags, 'iob2'));
  const doneOnly = selectAnnA(itemsOf(document.utterances, (u) => (transitionsAreLegal(u.tags, 'iob2') ? 'done' : 'draft')));

  it('leaves drafts out by default, and then exports without refusal', () => {
    expect(doneOnly.report).toMatchObject({ total: 1200, kept: clean.length, missingLayer: 0 });
    expect(doneOnly.report.filteredByStatus.draft).toBe(1200 - clean.length);
    expect(exportCheck(doneOnly)).toEqual([]);
  });

  it.each([
    ['iob2', []],
    ['bioes', []],
    ['jsonl', []],
    ['iob2', ['digits', 'email']],
    ['bioes', ['digits']],
    ['jsonl', ['digits', 'email']],
  ] as const)('%s with mask %j is byte-identical to `convert` of the same utterances', (format, mask) => {
    const files = exportWrite(doneOnly, { format, mask });
    expect(files).toHaveLength(1);
    expect(files[0]?.content).toBe(cliConvert(clean, format, mask));
  });

  it('each split part is byte-identical to `convert` of that part, in corpus order', () => {
    const split = { ratios: { train: 0.8, dev: 0.1, test: 0.1 }, seed: 20417 };
    const files = exportWrite(doneOnly, { format: 'bioes', split, mask: ['digits'] });
    const assignment = splitAssign(clean.map((u) => u.intent), split);
    expect(files.map((f) => [f.part, f.count])).toEqual([
      ['train', assignment.train.length],
      ['dev', assignment.dev.length],
      ['test', assignment.test.length],
    ]);
    for (const file of files) {
      const part = file.part as 'train' | 'dev' | 'test';
      const utterances = assignment[part].map((i) => clean[i] as Utterance);
      expect(file.content).toBe(cliConvert(utterances, 'bioes', ['digits']));
    }
  });
});
