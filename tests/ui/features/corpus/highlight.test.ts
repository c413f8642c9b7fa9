import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { tokenise } from '../../../../src/core/tokenise';
import { tokensPack } from '../../../../src/db/tokens';
import { colourTint, contrastRatio, highlightSegments, SLOT_PALETTE, slotColour } from '../../../../src/ui/features/corpus/highlight';

function segmentsOf(text: string, tags: string[] | null) {
  return highlightSegments(text, tokensPack(tokenise(text, { kind: 'words' })), tags);
}

describe('slot highlights', () => {
  it('cuts the text at token offsets, keeping spaces and punctuation as stored', () => {
    const text = 'Need a plumber in  Eastfield on Friday, 555-0142';
    const tokens = tokenise(text, { kind: 'words' });
    const tags = tokens.map(() => 'O');
    const at = (word: string) => tokens.findIndex((t) => text.slice(t.start, t.end) === word);
    tags[at('plumber')] = 'B-service';
    tags[at('Eastfield')] = 'B-area';
    tags[at('Friday')] = 'B-day';
    expect(segmentsOf(text, tags)).toEqual([
      { text: 'Need a ', slot: null },
      { text: 'plumber', slot: 'service' },
      { text: ' in  ', slot: null },
      { text: 'Eastfield', slot: 'area' },
      { text: ' on ', slot: null },
      { text: 'Friday', slot: 'day' },
      { text: ', 555-0142', slot: null },
    ]);
  });

  it('shows a stray I- tag as a span of its own (the lenient reading) and no layer as plain text', () => {
    const text = 'move it to next Monday';
    expect(segmentsOf(text, ['O', 'O', 'O', 'I-day', 'I-day'])).toEqual([
      { text: 'move it to ', slot: null },
      { text: 'next Monday', slot: 'day' },
    ]);
    expect(segmentsOf(text, null)).toEqual([{ text, slot: null }]);
    expect(segmentsOf('', [])).toEqual([{ text: '', slot: null }]);
  });

  it('pieces always join back to the text, labelled pieces match their slots (property)', () => {
    const words = fc.constantFrom('boiler', 'leak', '🔧', 'Friday', ',', 'tap', 'תקנו', '555-0199');
    fc.assert(
      fc.property(fc.array(words, { minLength: 1, maxLength: 10 }), fc.array(fc.constantFrom('O', 'B-day', 'I-day', 'B-area', 'I-area', 'junk'), { minLength: 10, maxLength: 10 }), (ws, pool) => {
        const text = ws.join(' ');
        const tokens = tokenise(text, { kind: 'words' });
        const tags = tokens.map((_, i) => pool[i % pool.length] as string);
        const segments = segmentsOf(text, tags);
        expect(segments.map((s) => s.text).join('')).toBe(text);
        for (const s of segments) if (s.slot !== null) expect(s.text.length).toBeGreaterThan(0);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('takes the schema colour, else the palette by place; tints keep dark text readable', () => {
    const schema = { slots: [{ name: 'service', colour: '#0072B2' }, { name: 'day' }, { name: 'area', colour: 'not a colour' }], intents: [] };
    expect(slotColour(schema, 'service')).toBe('#0072B2');
    expect(slotColour(schema, 'day')).toBe(SLOT_PALETTE[1]);
    expect(slotColour(schema, 'area')).toBe(SLOT_PALETTE[2]);
    expect(SLOT_PALETTE).toContain(slotColour(schema, 'budget'));
    expect(slotColour(schema, 'budget')).toBe(slotColour(schema, 'budget'));
    // WCAG 2.2 success criterion 1.4.3: at least 4.5:1 for body text; the table text is #1b2830 (app.css).
    for (const colour of SLOT_PALETTE) expect(contrastRatio(colourTint(colour), '#1b2830')).toBeGreaterThanOrEqual(4.5);
    // Sanity of the ratio itself: black on white is 21:1 by the WCAG definition.
    expect(contrastRatio('#000000', '#ffffff')).toBeCloseTo(21, 5);
    expect(colourTint('#000000', 0.5)).toBe('rgb(128, 128, 128)');
  });
});
