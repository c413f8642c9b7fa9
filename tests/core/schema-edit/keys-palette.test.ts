import { describe, expect, it } from 'vitest';
import { colourProblem, EDITOR_RESERVED_KEYS, keyIsReserved, keyLabel, keyProblem, OKABE_ITO, paletteColourOf, paletteTextOn } from '../../../src/core/schema-edit';

describe('shortcut keys', () => {
  it('reserves the editor keys the brief names, in KeyboardEvent.key spelling (UI Events key values, W3C)', () => {
    const named = ['ArrowLeft', 'ArrowRight', 'ArrowUp', 'ArrowDown', 'Escape', 'Enter', 'Backspace', 'Delete', ' ', '?', 'z', 'y', 'n', 'p', 'u'];
    for (const key of [...named, ...'0123456789']) expect(EDITOR_RESERVED_KEYS).toContain(key);
    // Upper case letters are the same keys with Shift.
    for (const key of ['Z', 'Y', 'N', 'P', 'U', 'z']) expect(keyIsReserved(key)).toBe(true);
    expect(keyIsReserved('a')).toBe(false);
    // The labelling screen's own keys (src/ui/features/label/label-keys.ts): Shift+D marks done, but d stays free.
    for (const key of ['[', ']', 'Home', 'End', '/', 'D', 'S', 'F', 'I', 'T']) expect(keyIsReserved(key)).toBe(true);
    for (const key of ['d', 's', 'f', 'i', 't']) expect(keyIsReserved(key)).toBe(false);
  });

  it('accepts one visible character, refuses the rest with a reason', () => {
    for (const key of ['a', 'Q', 'ä', 'ß', '€', '=', 'ж', '😀']) expect(keyProblem(key)).toBeNull();
    expect(keyProblem('')).toBeNull();
    for (const key of ['ab', ' ', '\t', '\u0301', '\u200b', 'e\u0301', 'F1']) expect(keyProblem(key)).toMatch(/one visible character/);
    expect(keyProblem('7')).toMatch(/kept for the labelling screen/);
    expect(keyLabel(' ')).toBe('Space');
  });
});

describe('palette', () => {
  it('holds the eight Okabe–Ito colours (Okabe & Ito 2008, values from memory), each once with a name', () => {
    expect(OKABE_ITO.map((c) => c.hex).sort()).toEqual(['#000000', '#0072B2', '#009E73', '#56B4E9', '#CC79A7', '#D55E00', '#E69F00', '#F0E442']);
    expect(new Set(OKABE_ITO.map((c) => c.name)).size).toBe(8);
    expect(paletteColourOf('#0072b2')?.name).toBe('blue');
    expect(colourProblem('#FF0000')).toMatch(/not one of the eight/);
    expect(colourProblem('')).toBeNull();
  });

  it('puts readable text on each colour: contrast at least 4.5 (WCAG 2.2, 1.4.3 AA)', () => {
    // Relative luminance and contrast ratio as WCAG 2.2 defines them (constants from memory).
    const luminance = (hex: string) => {
      const [r, g, b] = [1, 3, 5].map((i) => {
        const c = parseInt(hex.slice(i, i + 2), 16) / 255;
        return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
      }) as [number, number, number];
      return 0.2126 * r + 0.7152 * g + 0.0722 * b;
    };
    const contrast = (a: string, b: string) => {
      const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x) as [number, number];
      return (hi + 0.05) / (lo + 0.05);
    };
    for (const { hex } of OKABE_ITO) expect(contrast(hex, paletteTextOn(hex))).toBeGreaterThanOrEqual(4.5);
    expect(paletteTextOn('#000000')).toBe('#FFFFFF');
    expect(paletteTextOn('#F0E442')).toBe('#000000');
  });
});
