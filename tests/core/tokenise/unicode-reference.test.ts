import { existsSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { tokeniseWhitespace, wordSegments } from '../../../src/core/tokenise';

// Outside references: Debian's unicode-data package, which installs the Unicode Character Database
// under /usr/share/unicode/. The version each file states in its header is printed with the results.
const UNICODE_DIR = '/usr/share/unicode';

function unicodeFile(relative: string): string {
  const path = `${UNICODE_DIR}/${relative}`;
  expect(existsSync(path), `${path} is missing: install the Debian package unicode-data (npm test installs it)`).toBe(true);
  return readFileSync(path, 'utf8');
}

const hex = (cp: number) => cp.toString(16).toUpperCase().padStart(4, '0');

/** Code points listed with `property` in a UCD property file ("0009..000D ; White_Space # ..."). */
function propertyCodePoints(file: string, property: string): Set<number> {
  const out = new Set<number>();
  for (const line of file.split('\n')) {
    const [range, name] = (line.split('#')[0] ?? '').split(';').map((field) => field.trim());
    if (name !== property || range === undefined) continue;
    const [first, last] = range.split('..').map((h) => parseInt(h, 16));
    if (first === undefined) continue;
    for (let cp = first; cp <= (last ?? first); cp++) out.add(cp);
  }
  return out;
}

/** Every code point of the Basic Multilingual Plane except the surrogates, which cannot stand alone in a test string. */
const bmp = Array.from({ length: 0x10000 }, (_, cp) => cp).filter((cp) => cp < 0xd800 || cp > 0xdfff);

describe('word segmentation against WordBreakTest.txt', () => {
  // Unicode Standard Annex #29 "Unicode Text Segmentation", its conformance file
  // auxiliary/WordBreakTest.txt: each line lists code points with ÷ (break) or × (no break) between them.
  // Intl.Segmenter (ICU) may follow a newer Unicode than the file, and ICU tailors a few rules, so we
  // require 99% agreement rather than all.
  it('agrees on at least 99% of the cases and lists the rest', () => {
    const file = unicodeFile('auxiliary/WordBreakTest.txt');
    const header = file.split('\n', 1)[0] ?? '';
    let cases = 0;
    const disagreements: string[] = [];
    for (const line of file.split('\n')) {
      const body = (line.split('#')[0] ?? '').trim();
      if (body === '') continue;
      cases++;
      let text = '';
      const expected: number[] = [];
      const codePoints: string[] = [];
      for (const field of body.split(/\s+/)) {
        if (field === '÷') expected.push(text.length);
        else if (field !== '×') {
          text += String.fromCodePoint(parseInt(field, 16));
          codePoints.push(field);
        }
      }
      const actual = [0, ...wordSegments(text).map((segment) => segment.end)];
      if (actual.join() !== expected.join()) {
        disagreements.push(`${codePoints.join(' ')}: expected breaks at ${expected.join(',')}, got ${actual.join(',')}`);
      }
    }
    const agreed = cases - disagreements.length;
    console.log(
      `${header.replace(/^#\s*/, '')} vs Intl.Segmenter (ICU ${process.versions.icu}, Unicode ${process.versions.unicode}): ` +
        `${agreed}/${cases} cases agree, ${disagreements.length} disagree (UTF-16 break offsets)` +
        disagreements.slice(0, 20).map((d) => `\n  ${d}`).join(''),
    );
    expect(cases).toBeGreaterThan(1000);
    expect(agreed / cases).toBeGreaterThanOrEqual(0.99);
  });
});

describe('white space and invisible characters against the Unicode Character Database', () => {
  it('splits on exactly the White_Space code points of PropList.txt', () => {
    const whiteSpace = propertyCodePoints(unicodeFile('PropList.txt'), 'White_Space');
    expect(whiteSpace.size).toBeGreaterThan(20);
    // No White_Space character lies outside the BMP, so checking the BMP covers them all.
    expect([...whiteSpace].every((cp) => cp < 0x10000)).toBe(true);
    const splitting = bmp.filter((cp) => tokeniseWhitespace(`a${String.fromCodePoint(cp)}b`).length === 2);
    expect(splitting.map(hex)).toEqual([...whiteSpace].sort((a, b) => a - b).map(hex));
  });

  it('drops a lone character exactly when it is White_Space or Default_Ignorable_Code_Point (DerivedCoreProperties.txt)', () => {
    const ignorable = propertyCodePoints(unicodeFile('DerivedCoreProperties.txt'), 'Default_Ignorable_Code_Point');
    const whiteSpace = propertyCodePoints(unicodeFile('PropList.txt'), 'White_Space');
    expect(ignorable.has(0x200f) && ignorable.has(0x200d)).toBe(true);
    const dropped = bmp.filter((cp) => tokeniseWhitespace(`a ${String.fromCodePoint(cp)} b`).length === 2);
    const expected = bmp.filter((cp) => ignorable.has(cp) || whiteSpace.has(cp));
    expect(dropped.map(hex)).toEqual(expected.map(hex));
  });
});
