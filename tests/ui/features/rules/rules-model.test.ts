import { describe, expect, it } from 'vitest';
import type { RulesScan } from '../../../../src/db/rules-repo';
import { findingRows, findingsFilter, findingsSignature, layerKeyOf, repairPreviewOf, repairTargets } from '../../../../src/ui/features/rules/rules-model';

const SCAN: RulesScan = {
  projectId: 1,
  scheme: 'iob2',
  schema: { slots: ['day', 'service'], intents: ['book_visit'], allowedSlotsByIntent: {} },
  layersScanned: 10,
  findings: 3,
  layers: [
    {
      utteranceId: 7,
      seq: 2,
      annotator: 'ann-a',
      revision: 3,
      tags: ['O', 'O', 'I-day', 'O'],
      intent: 'book_visit',
      words: ['come', 'on', 'friday', 'please'],
      findings: [{ rule: 'iob2/inside-after-outside', kind: 'transition', index: 2, message: 'I-day follows O: a span must start with B-day' }],
    },
    {
      utteranceId: 9,
      seq: 4,
      annotator: 'gold',
      revision: 1,
      tags: ['B-budget', 'O'],
      intent: 'haggle',
      words: ['fifty', 'pounds'],
      findings: [
        { rule: 'schema/unknown-intent', kind: 'schema', index: null, message: "intent haggle is not in the project's intent list" },
        { rule: 'schema/unknown-slot', kind: 'schema', index: 0, message: "slot budget (token 0) is not in the project's slot list" },
      ],
    },
  ],
};

describe('rule review model', () => {
  it('gives one row per finding with the rule in plain words, the context, and whether repair can fix it', () => {
    const rows = findingRows(SCAN);
    expect(rows.map((r) => [r.layer.seq, r.finding.rule, r.repairable])).toEqual([
      [2, 'iob2/inside-after-outside', 'always'],
      [4, 'schema/unknown-intent', 'never'],
      [4, 'schema/unknown-slot', 'schema-option'],
    ]);
    expect(rows[0]?.rule).toBe('An I- tag follows O; in IOB2 every span starts with B-.');
    expect(rows[0]?.context.map((t) => [t.word, t.tag, t.focus])).toEqual([
      ['come', 'O', false],
      ['on', 'O', false],
      ['friday', 'I-day', true],
      ['please', 'O', false],
    ]);
    expect(rows[1]?.context).toEqual([]);
    // A transition marks both of its tokens; a schema finding marks its whole span; the intent nothing.
    expect(rows.map((r) => r.marked)).toEqual([[1, 2], [], [0]]);
    expect(findingsFilter(rows, { kind: 'schema', owner: '' })).toHaveLength(2);
    expect(findingsFilter(rows, { kind: 'all', owner: 'ann-a' })).toHaveLength(1);
    expect(findingsSignature(SCAN)).toEqual(['2|ann-a|iob2/inside-after-outside|2', '4|gold|schema/unknown-intent|-', '4|gold|schema/unknown-slot|0']);
  });

  it('previews exactly the chosen layers the repair changes, with the revision each was scanned at', () => {
    const all = new Set(SCAN.layers.map(layerKeyOf));
    const plain = repairPreviewOf(SCAN, all, { strategy: 'begin-span', schemaSpans: false });
    expect(plain.layers.map((l) => [l.layer.seq, l.after, l.changedAt])).toEqual([[2, ['O', 'O', 'B-day', 'O'], [2]]]);
    expect(plain.unchanged).toBe(1);
    expect(repairTargets(plain)).toEqual([{ utteranceId: 7, annotator: 'ann-a', revision: 3 }]);
    const withSchema = repairPreviewOf(SCAN, all, { strategy: 'drop-stray', schemaSpans: true });
    expect(withSchema.layers.map((l) => l.after)).toEqual([
      ['O', 'O', 'O', 'O'],
      ['O', 'O'],
    ]);
    expect(withSchema.tagsChanged).toBe(2);
    expect(repairPreviewOf(SCAN, new Set([layerKeyOf({ utteranceId: 9, annotator: 'gold' })]), { strategy: 'begin-span', schemaSpans: false }).layers).toEqual([]);
  });
});
