import { describe, expect, it } from 'vitest';
import { ExportRefusedError, exportCheck, exportSelect, exportWrite } from '../../../src/core/export';
import { FormatWriteError } from '../../../src/core/formats';
import { itemMake, layerMake } from './items';

// "move it to friday morning" → 5 tokens; ann-a's layer opens a span with I- after O (illegal in IOB2).
const TEXT = 'move it to friday morning';
const items = [
  itemMake('hr-11', TEXT, [layerMake('gold', 'done', ['O', 'O', 'O', 'B-day', 'B-time_window'], 'reschedule')]),
  itemMake('hr-12', TEXT, [layerMake('ann-a', 'done', ['O', 'O', 'O', 'I-day', 'I-time_window'], 'reschedule')]),
];
const selection = exportSelect(items, { policy: { kind: 'gold-else', annotator: 'ann-a' } });

describe('exportCheck and refusal', () => {
  it('lists each illegal transition of the chosen layers with utterance, annotator, token and rule', () => {
    // IOB2 (Ramshaw & Marcus 1995, as Tjong Kim Sang & Veenstra 1999 name it): every span starts with B-.
    expect(exportCheck(selection)).toMatchObject([
      { position: 1, id: 'hr-12', annotator: 'ann-a', index: 3, rule: 'iob2/inside-after-outside' },
      { position: 1, id: 'hr-12', annotator: 'ann-a', index: 4, rule: 'iob2/inside-after-other-slot' },
    ]);
    expect(exportCheck(selection)[0]?.message).toMatch(/I-day/);
  });

  it('judges under the stored scheme when told: the same tags are legal IOB1', () => {
    // IOB1 (Tjong Kim Sang & Veenstra 1999): I- may open a span, B- only separates same-slot neighbours.
    const annA = exportSelect(items, { policy: { kind: 'annotator', annotator: 'ann-a' } });
    expect(exportCheck(annA, 'iob1')).toEqual([]);
    expect(exportWrite(annA, { format: 'bioes', scheme: 'iob1' })[0]?.content).toMatch(/friday\tS-day\nmorning\tS-time_window\n$/);
    expect(exportCheck(selection, 'iob1').map((v) => [v.id, v.rule])).toEqual([
      ['hr-11', 'iob1/begin-after-outside'],
      ['hr-11', 'iob1/begin-after-other-slot'],
    ]);
  });

  it('refuses every format with the list, saying how many utterances are affected', () => {
    for (const format of ['iob2', 'bioes', 'jsonl'] as const) {
      expect(() => exportWrite(selection, { format })).toThrow(ExportRefusedError);
      expect(() => exportWrite(selection, { format })).toThrow('2 illegal transition(s) in 1 utterance(s)');
    }
  });

  it('as-is IOB2 keeps the stored tags; as-is BIOES and JSON Lines read them leniently (stray I- opens a span)', () => {
    const iob2 = exportWrite(selection, { format: 'iob2', asIs: true })[0]?.content ?? '';
    expect(iob2.split('\n\n')[1]).toMatch(/friday\tI-day\nmorning\tI-time_window\n$/);
    const bioes = exportWrite(selection, { format: 'bioes', asIs: true })[0]?.content ?? '';
    expect(bioes.split('\n\n')[1]).toMatch(/friday\tS-day\nmorning\tS-time_window\n$/);
    const jsonl = exportWrite(selection, { format: 'jsonl', asIs: true })[0]?.content.split('\n')[1] ?? '';
    expect((JSON.parse(jsonl) as { spans: unknown }).spans).toEqual([
      { start: 11, end: 17, label: 'day' },
      { start: 18, end: 25, label: 'time_window' },
    ]);
  });

  it('as-is refuses a malformed tag in BIOES and JSON Lines rather than dropping the label; IOB2 keeps it', () => {
    const odd = exportSelect([itemMake('hr-13', 'fix tap', [layerMake('ann-b', 'done', ['O', 'b-problem'])])], {
      policy: { kind: 'annotator', annotator: 'ann-b' },
    });
    expect(exportCheck(odd).map((v) => v.rule)).toEqual(['iob2/malformed-tag']);
    expect(() => exportWrite(odd, { format: 'bioes', asIs: true })).toThrow(FormatWriteError);
    expect(() => exportWrite(odd, { format: 'bioes', asIs: true })).toThrow('tag 1 "b-problem" is not a valid tag');
    expect(() => exportWrite(odd, { format: 'jsonl', asIs: true })).toThrow(FormatWriteError);
    expect(exportWrite(odd, { format: 'iob2', asIs: true })[0]?.content).toMatch(/tap\tb-problem\n$/);
  });

  it('with a legal selection, asIs changes nothing', () => {
    const legal = exportSelect(items, { policy: { kind: 'gold' } });
    for (const format of ['iob2', 'bioes', 'jsonl'] as const) {
      expect(exportWrite(legal, { format, asIs: true })).toEqual(exportWrite(legal, { format }));
    }
  });
});
