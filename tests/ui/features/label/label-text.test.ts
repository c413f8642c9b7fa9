import { describe, expect, it } from 'vitest';
import { tokeniseWhitespace } from '../../../../src/core/tokenise';
import { colourTint, layerDescribe, OKABE_ITO, slotColour, slotsMatching, spansDescribe, tokenName } from '../../../../src/ui/features/label/label-text';

const TEXT = 'plumber on Friday morning please';
const TOKENS = tokeniseWhitespace(TEXT);
const TAGS = ['B-service', 'O', 'B-day', 'I-day', 'O'];

/** WCAG 2.2 relative luminance and contrast ratio (definitions in the WCAG 2.2 glossary). */
function luminance(rgb: [number, number, number]): number {
  const [r, g, b] = rgb.map((c) => {
    const s = c / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  }) as [number, number, number];
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}
const contrast = (a: number, b: number) => (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);

describe('label text', () => {
  it('describes spans by their covered text, and a whole layer in words', () => {
    expect(spansDescribe(TEXT, TOKENS, TAGS)).toEqual(['service: “plumber”', 'day: “Friday morning”']);
    expect(layerDescribe(TEXT, TOKENS, { tags: TAGS, intent: 'book_visit', status: 'done', note: '' })).toEqual([
      'Slots: service: “plumber”; day: “Friday morning”',
      'Intent: book_visit',
      'Status: done',
    ]);
    expect(layerDescribe(TEXT, TOKENS, { tags: ['O', 'O', 'O', 'O', 'O'], intent: null, status: 'draft', note: 'odd' })).toEqual([
      'No slots labelled',
      'Intent: none chosen',
      'Status: draft',
      'Note: odd',
    ]);
  });

  it('names tokens with their slot for screen readers', () => {
    expect(tokenName('Friday', TAGS, 2)).toBe('Friday, day (starts)');
    expect(tokenName('morning', TAGS, 3)).toBe('morning, day');
    expect(tokenName('on', TAGS, 1)).toBe('on');
  });

  it('takes the schema colour, else an Okabe–Ito colour; tints keep dark text above AA contrast (4.5:1)', () => {
    const slots = [{ name: 'day', colour: '#123456' }, { name: 'area' }, { name: 'budget', colour: 'red' }];
    expect(slotColour(slots, 'day')).toBe('#123456');
    expect(slotColour(slots, 'area')).toBe(OKABE_ITO[1]);
    expect(slotColour(slots, 'budget')).toBe(OKABE_ITO[2]);
    expect(OKABE_ITO).toContain(slotColour(slots, 'not_in_schema'));
    // The darkest text colour of the app (#1b2830, app.css) on every tint.
    const text = luminance([0x1b, 0x28, 0x30]);
    for (const colour of [...OKABE_ITO, '#000000', '#123456']) {
      const rgb = /rgb\((\d+), (\d+), (\d+)\)/.exec(colourTint(colour))?.slice(1).map(Number) as [number, number, number];
      expect(contrast(luminance(rgb), text)).toBeGreaterThanOrEqual(4.5);
    }
    expect(colourTint('#000000')).toBe('rgb(184, 184, 184)');
  });

  it('filters the slot list: prefix matches first, then names or guidelines containing the text', () => {
    const slots = [{ name: 'time_window' }, { name: 'day' }, { name: 'budget', description: 'what they want to spend per day' }, { name: 'daytime_phone' }];
    expect(slotsMatching(slots, 'da').map((s) => s.name)).toEqual(['day', 'daytime_phone', 'budget']);
    expect(slotsMatching(slots, ' ').map((s) => s.name)).toHaveLength(4);
    expect(slotsMatching(slots, 'zzz')).toEqual([]);
  });
});
