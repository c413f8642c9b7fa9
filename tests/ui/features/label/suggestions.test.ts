import { describe, expect, it } from 'vitest';
import { editApply, layerEditBlank } from '../../../../src/core/editing';
import { transitionsValidate } from '../../../../src/core/rules';
import { spansFromTags } from '../../../../src/core/schemes';
import { tokeniseWhitespace } from '../../../../src/core/tokenise';
import {
  suggestionAcceptOp,
  suggestionAtSelection,
  suggestionKey,
  suggestionName,
  suggestionsFor,
  suggestionsRejectedCount,
  suggestionTokenName,
} from '../../../../src/ui/features/label/suggestions';

// "need a plumber in north end on friday morning": 0 need, 1 a, 2 plumber, 3 in, 4 north, 5 end, 6 on, 7 friday, 8 morning
const TEXT = 'need a plumber in north end on friday morning';
const TOKENS = tokeniseWhitespace(TEXT);
const MODEL = ['O', 'O', 'B-service', 'O', 'B-area', 'I-area', 'O', 'B-day', 'B-time_window'];
const BLANK = TOKENS.map(() => 'O');
const NONE = new Set<string>();
const where = (list: readonly { slot: string; start: number; end: number }[]) => list.map((s) => `${s.slot}:${s.start}-${s.end}`);

describe('suggestionsFor', () => {
  it('offers every model span while the labeller has labelled nothing', () => {
    expect(where(suggestionsFor(MODEL, BLANK, NONE))).toEqual(['service:2-3', 'area:4-6', 'day:7-8', 'time_window:8-9']);
  });

  it('drops a model span as soon as any of its tokens is in one of the labeller’s spans', () => {
    // The labeller took "end on" as area (4 excluded): the model's area 4-6 overlaps and goes.
    const own = ['O', 'O', 'O', 'O', 'O', 'B-area', 'I-area', 'O', 'O'];
    expect(where(suggestionsFor(MODEL, own, NONE))).toEqual(['service:2-3', 'day:7-8', 'time_window:8-9']);
  });

  it('hides rejected spans by content key and counts them', () => {
    const rejected = new Set([suggestionKey({ start: 4, end: 6, slot: 'area' }), '7:8:day']);
    expect(where(suggestionsFor(MODEL, BLANK, rejected))).toEqual(['service:2-3', 'time_window:8-9']);
    expect(suggestionsRejectedCount(MODEL, BLANK, rejected)).toBe(2);
    // A rejection of a span the model no longer offers hides nothing and counts nothing.
    expect(suggestionsRejectedCount(MODEL, BLANK, new Set(['0:1:area']))).toBe(0);
  });

  it('offers nothing without a model layer or when its token count differs (a stale layer)', () => {
    expect(suggestionsFor(undefined, BLANK, NONE)).toEqual([]);
    expect(suggestionsFor(MODEL.slice(1), BLANK, NONE)).toEqual([]);
  });

  it('leaves out slots the schema no longer has', () => {
    expect(where(suggestionsFor(MODEL, BLANK, NONE, new Set(['area', 'day'])))).toEqual(['area:4-6', 'day:7-8']);
  });

  it('reads model layers stored in BIOES or IOB1 as the same spans', () => {
    const bioes = ['O', 'O', 'S-service', 'O', 'B-area', 'E-area', 'O', 'S-day', 'S-time_window'];
    expect(where(suggestionsFor(bioes, BLANK, NONE))).toEqual(where(suggestionsFor(MODEL, BLANK, NONE)));
    const iob1 = ['O', 'O', 'I-service', 'O', 'I-area', 'I-area', 'O', 'I-day', 'I-time_window'];
    expect(where(suggestionsFor(iob1, BLANK, NONE))).toEqual(where(suggestionsFor(MODEL, BLANK, NONE)));
  });
});

describe('suggestionAtSelection', () => {
  const list = suggestionsFor(MODEL, BLANK, NONE);
  it('takes the suggestion under the selection, else the next one after it, else the first', () => {
    expect(suggestionAtSelection(list, { anchor: 5, focus: 5 }, TOKENS.length)?.slot).toBe('area');
    expect(suggestionAtSelection(list, { anchor: 3, focus: 3 }, TOKENS.length)?.slot).toBe('area');
    expect(suggestionAtSelection(list, { anchor: 0, focus: 1 }, TOKENS.length)?.slot).toBe('service');
    // A backwards selection over 6..3 overlaps "north end".
    expect(suggestionAtSelection(list, { anchor: 6, focus: 3 }, TOKENS.length)?.slot).toBe('area');
    expect(suggestionAtSelection(list.slice(0, 2), { anchor: 8, focus: 8 }, TOKENS.length)?.slot).toBe('service');
    expect(suggestionAtSelection([], { anchor: 0, focus: 0 }, TOKENS.length)).toBeNull();
  });
});

describe('suggestionAcceptOp', () => {
  it('is the ordinary label edit: accepting every suggestion gives the model’s spans as legal IOB2', () => {
    const list = suggestionsFor(MODEL, BLANK, NONE);
    const after = list.map(suggestionAcceptOp).reduce((edit, op) => editApply(edit, op), layerEditBlank(TOKENS.length));
    expect(after.tags).toEqual(MODEL);
    expect(after.status).toBe('draft');
    expect(transitionsValidate(after.tags, 'iob2')).toEqual([]);
    expect(suggestionsFor(MODEL, after.tags, NONE)).toEqual([]);
  });

  it('replaces an overlapping illegal run of the labeller’s tags with the accepted span', () => {
    // I-area after O (illegal, kept as imported) reads as a span 5-6 by CoNLL-2000; accepting day 7-8 keeps it, legalised.
    const own = ['O', 'O', 'O', 'O', 'O', 'I-area', 'O', 'O', 'O'];
    const day = suggestionsFor(MODEL, own, NONE).find((s) => s.slot === 'day');
    expect(day).toBeDefined();
    const after = editApply({ ...layerEditBlank(TOKENS.length), tags: own }, suggestionAcceptOp(day as NonNullable<typeof day>));
    expect(spansFromTags(after.tags)).toEqual([
      { start: 5, end: 6, slot: 'area' },
      { start: 7, end: 8, slot: 'day' },
    ]);
    expect(transitionsValidate(after.tags, 'iob2')).toEqual([]);
  });
});

describe('suggestion words', () => {
  it('name the slot, the words and that it is only suggested', () => {
    expect(suggestionName(TEXT, TOKENS, { start: 4, end: 6, slot: 'area' })).toBe('area “north end”');
    expect(suggestionTokenName('north', { start: 4, end: 6, slot: 'area' }, 4)).toBe('north, suggested area (starts), not accepted');
    expect(suggestionTokenName('end', { start: 4, end: 6, slot: 'area' }, 5)).toBe('end, suggested area, not accepted');
  });
});
