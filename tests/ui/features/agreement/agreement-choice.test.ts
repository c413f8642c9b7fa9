import { describe, expect, it } from 'vitest';
import { choiceFromQuery, choiceQuery, choiceRequest, layerOwners } from '../../../../src/ui/features/agreement/agreement-choice';
import { colourHex, figureText, intervalText, kappaBand, listText, timeTickText } from '../../../../src/ui/features/agreement/agreement-format';

const counts = { gold: { done: 3 }, 'ben-k': { done: 40, draft: 2 }, 'ana-p': { done: 50 }, cleo: { draft: 7 }, model: { draft: 1 } };

describe('agreement choice', () => {
  it('lists people by name, then gold and model', () => {
    expect(layerOwners(counts)).toEqual(['ana-p', 'ben-k', 'cleo', 'gold', 'model']);
  });

  it('defaults to the first two owners and keeps only known names from the URL', () => {
    const owners = layerOwners(counts);
    expect(choiceFromQuery({}, owners)).toEqual({ a: 'ana-p', b: 'ben-k', all: false, drafts: false });
    expect(choiceFromQuery({ a: 'gold', b: 'nobody', drafts: '1' }, owners)).toEqual({ a: 'gold', b: 'ana-p', all: false, drafts: true });
    expect(choiceFromQuery({}, ['ana-p'])).toBeNull();
    const choice = { a: 'ben-k', b: 'gold', all: true, drafts: false };
    expect(choiceFromQuery(choiceQuery(choice), owners)).toEqual(choice);
  });

  it('asks for A first, then B, then every other person with counted layers', () => {
    expect(choiceRequest(9, { a: 'ben-k', b: 'ana-p', all: false, drafts: false }, counts)).toEqual({
      request: { projectId: 9, annotators: ['ben-k', 'ana-p'], pair: ['ben-k', 'ana-p'], statuses: ['done'] },
    });
    // cleo has drafts only: left out until drafts count; gold and model never join "every annotator".
    expect(choiceRequest(9, { a: 'gold', b: 'ana-p', all: true, drafts: false }, counts)).toMatchObject({ request: { annotators: ['gold', 'ana-p', 'ben-k'] } });
    expect(choiceRequest(9, { a: 'gold', b: 'ana-p', all: true, drafts: true }, counts)).toMatchObject({ request: { annotators: ['gold', 'ana-p', 'ben-k', 'cleo'], statuses: ['done', 'draft'] } });
    expect(choiceRequest(9, { a: 'cleo', b: 'cleo', all: false, drafts: false }, counts)).toEqual({ problem: 'Choose two different layers to compare.' });
  });
});

describe('agreement format', () => {
  it('writes figures to three decimals and intervals with their reasons', () => {
    expect(figureText(0.9022342768958329)).toBe('0.902');
    expect(figureText(null)).toBe('—');
    expect(intervalText({ low: 0.8858658400300063, high: 0.9191130853417074, resamples: 1000 })).toBe('0.886 to 0.919');
    expect(intervalText({ low: null, high: null, resamples: 0, reason: 'the figure itself is undefined on these data' })).toBe('the figure itself is undefined on these data');
    expect(intervalText(null)).toBe('not computed');
  });

  it('reads kappas with the Landis & Koch bands (Landis & Koch 1977, Biometrics 33(1); bounds from memory)', () => {
    expect(kappaBand({ value: 0.902 })).toBe('almost perfect');
    expect(kappaBand({ value: 0.5 })).toBe('moderate');
    expect(kappaBand({ value: -0.1 })).toBe('poor');
    expect(kappaBand({ value: null })).toBeNull();
  });

  it('joins lists and writes colours and times', () => {
    expect(listText(['done'])).toBe('done');
    expect(listText(['done', 'draft'])).toBe('done and draft');
    expect(listText(['done', 'draft', 'flagged'])).toBe('done, draft and flagged');
    expect(colourHex('rgb(0, 32, 81)')).toBe('#002051');
    expect(colourHex('#abcdef')).toBe('#ABCDEF');
    const t = Date.UTC(2025, 2, 14, 9, 30);
    expect(timeTickText(t, 86_400_000)).toBe('03-14 09:30');
    expect(timeTickText(t, 30 * 86_400_000)).toBe('2025-03-14');
  });
});
