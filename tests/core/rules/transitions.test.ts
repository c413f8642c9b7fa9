import { describe, expect, it } from 'vitest';
import { RULE_TABLE, rulesOfScheme, transitionsAreLegal, transitionsValidate } from '../../../src/core/rules';
import type { Violation } from '../../../src/core/rules';
import { SCHEMES, type Scheme } from '../../../src/core/types';

type Case = [scheme: Scheme, tags: string[], expected: Violation[]];

const v = (index: number, previous: string | null, tag: string | null, rule: Violation['rule'], message: string): Violation => ({
  index,
  previous,
  tag,
  rule,
  message,
});

// Expected violations derived by hand from each scheme's grammar as the task states it.
const CASES: Case[] = [
  ['iob2', [], []],
  ['iob2', ['B-day', 'I-day', 'O', 'B-area', 'B-area', 'I-area'], []],
  ['iob2', ['I-day', 'I-day'], [v(0, null, 'I-day', 'iob2/inside-at-start', 'I-day at utterance start: a span must start with B-day')]],
  ['iob2', ['O', 'I-day'], [v(1, 'O', 'I-day', 'iob2/inside-after-outside', 'I-day follows O: a span must start with B-day')]],
  [
    'iob2',
    ['B-time_window', 'I-day'],
    [v(1, 'B-time_window', 'I-day', 'iob2/inside-after-other-slot', 'I-day follows B-time_window: I-day only continues an open day span; start a new one with B-day')],
  ],
  [
    'iob2',
    ['B-area', 'I-area', 'I-day'],
    [v(2, 'I-area', 'I-day', 'iob2/inside-after-other-slot', 'I-day follows I-area: I-day only continues an open day span; start a new one with B-day')],
  ],
  ['iob2', ['B-day', 'E-day', 'O'], [v(1, 'B-day', 'E-day', 'iob2/tag-outside-scheme', 'E-day is not an IOB2 tag: use O, B-day or I-day')]],
  ['iob2', ['S-day'], [v(0, null, 'S-day', 'iob2/tag-outside-scheme', 'S-day is not an IOB2 tag: use O, B-day or I-day')]],
  // The I-day after the malformed tag is not judged: what the malformed tag should be is unknown.
  ['iob2', ['O', 'b-day', 'I-day'], [v(1, 'O', 'b-day', 'iob2/malformed-tag', '"b-day" is not a tag: expected O, or B- or I- followed by a slot name')]],
  [
    'iob2',
    ['I-day', 'O', 'I-area', 'B-day', 'I-area'],
    [
      v(0, null, 'I-day', 'iob2/inside-at-start', 'I-day at utterance start: a span must start with B-day'),
      v(2, 'O', 'I-area', 'iob2/inside-after-outside', 'I-area follows O: a span must start with B-area'),
      v(4, 'B-day', 'I-area', 'iob2/inside-after-other-slot', 'I-area follows B-day: I-area only continues an open area span; start a new one with B-area'),
    ],
  ],
  ['iob1', ['I-day', 'B-day', 'B-day', 'I-area', 'O', 'I-day', 'I-area'], []],
  [
    'iob1',
    ['B-day'],
    [v(0, null, 'B-day', 'iob1/begin-at-start', 'B-day at utterance start: in IOB1 a span starts with I-day; B-day only directly follows another day span')],
  ],
  [
    'iob1',
    ['O', 'B-day', 'I-day'],
    [v(1, 'O', 'B-day', 'iob1/begin-after-outside', 'B-day follows O: in IOB1 a span starts with I-day; B-day only directly follows another day span')],
  ],
  [
    'iob1',
    ['I-area', 'B-day'],
    [v(1, 'I-area', 'B-day', 'iob1/begin-after-other-slot', 'B-day follows I-area: in IOB1 a span starts with I-day; B-day only directly follows another day span')],
  ],
  ['iob1', ['I-day', 'S-day'], [v(1, 'I-day', 'S-day', 'iob1/tag-outside-scheme', 'S-day is not an IOB1 tag: use O, B-day or I-day')]],
  ['iob1', ['I-day', 'Q-day'], [v(1, 'I-day', 'Q-day', 'iob1/malformed-tag', '"Q-day" is not a tag: expected O, or B- or I- followed by a slot name')]],
  ['bioes', ['S-day', 'B-area', 'I-area', 'E-area', 'O', 'B-day', 'E-day', 'S-day'], []],
  ['bioes', [], []],
  ['bioes', ['I-day', 'E-day'], [v(0, null, 'I-day', 'bioes/continue-at-start', 'I-day at utterance start: a span must start with B-day (or be a single S-day)')]],
  ['bioes', ['E-day'], [v(0, null, 'E-day', 'bioes/continue-at-start', 'E-day at utterance start: a span must start with B-day (or be a single S-day)')]],
  [
    'bioes',
    ['O', 'I-day', 'E-day'],
    [v(1, 'O', 'I-day', 'bioes/continue-after-outside', 'I-day follows O: a span must start with B-day (or be a single S-day)')],
  ],
  [
    'bioes',
    ['S-day', 'E-day'],
    [v(1, 'S-day', 'E-day', 'bioes/continue-after-closed', 'E-day follows S-day: that span is already closed; start a new one with B-day or S-day')],
  ],
  [
    'bioes',
    ['B-day', 'E-day', 'I-day', 'E-day'],
    [v(2, 'E-day', 'I-day', 'bioes/continue-after-closed', 'I-day follows E-day: that span is already closed; start a new one with B-day or S-day')],
  ],
  [
    'bioes',
    ['B-day', 'I-area', 'E-area'],
    [
      v(1, 'B-day', 'I-area', 'bioes/continue-other-slot', 'I-area follows B-day: close the day span with E-day first; a new area span starts with B-area or S-area'),
    ],
  ],
  [
    'bioes',
    ['B-day', 'O'],
    [v(1, 'B-day', 'O', 'bioes/unclosed-before-outside', 'O follows B-day: the day span must end with E-day first (a one-token span is S-day)')],
  ],
  [
    'bioes',
    ['B-day', 'S-area'],
    [v(1, 'B-day', 'S-area', 'bioes/unclosed-before-begin', 'S-area follows B-day: the day span must end with E-day first (a one-token span is S-day)')],
  ],
  [
    'bioes',
    ['B-day', 'I-day', 'B-day', 'E-day'],
    [v(2, 'I-day', 'B-day', 'bioes/unclosed-before-begin', 'B-day follows I-day: the day span must end with E-day first (a one-token span is S-day)')],
  ],
  [
    'bioes',
    ['O', 'B-day', 'I-day'],
    [v(2, 'I-day', null, 'bioes/unclosed-at-end', 'the utterance ends after I-day: the day span must end with E-day (a one-token span is S-day)')],
  ],
  ['bioes', ['B-day'], [v(0, 'B-day', null, 'bioes/unclosed-at-end', 'the utterance ends after B-day: the day span must end with E-day (a one-token span is S-day)')]],
  // One violation per transition: the malformed tag, not also the B-day span it leaves open.
  [
    'bioes',
    ['B-day', 'x'],
    [v(1, 'B-day', 'x', 'bioes/malformed-tag', '"x" is not a tag: expected O, or B-, I-, E- or S- followed by a slot name')],
  ],
  ['bioes', [''], [v(0, null, '', 'bioes/malformed-tag', '"" is not a tag: expected O, or B-, I-, E- or S- followed by a slot name')]],
];

describe('transitionsValidate, one case per rule', () => {
  it.each(CASES)('%s %j', (scheme, tags, expected) => {
    expect(transitionsValidate(tags, scheme)).toEqual(expected);
    expect(transitionsAreLegal(tags, scheme)).toBe(expected.length === 0);
  });

  it('covers every transition rule of every scheme', () => {
    const covered = new Set(CASES.flatMap(([, , expected]) => expected.map((e) => e.rule)));
    for (const scheme of SCHEMES) {
      for (const rule of rulesOfScheme(scheme)) expect(covered, rule.id).toContain(rule.id);
    }
  });

  it('reads the same tags differently per scheme', () => {
    const tags = ['I-day', 'B-day'];
    expect(transitionsValidate(tags, 'iob1')).toEqual([]);
    expect(transitionsValidate(tags, 'iob2').map((x) => x.rule)).toEqual(['iob2/inside-at-start']);
    expect(transitionsValidate(tags, 'bioes').map((x) => x.rule)).toEqual([
      'bioes/continue-at-start',
      'bioes/unclosed-before-begin',
      'bioes/unclosed-at-end',
    ]);
  });
});

describe('RULE_TABLE', () => {
  it('has unique ids, each prefixed by its scheme (or schema) with a one-line description', () => {
    const ids = RULE_TABLE.map((r) => r.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const rule of RULE_TABLE) {
      expect(rule.id.startsWith(`${rule.scheme ?? 'schema'}/`), rule.id).toBe(true);
      expect(rule.id).toMatch(/^[a-z0-9]+\/[a-z]+(-[a-z]+)*$/);
      expect(rule.description.length).toBeGreaterThan(10);
      expect(rule.description).not.toContain('\n');
    }
  });
});
