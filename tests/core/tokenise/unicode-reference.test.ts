import { existsSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { codePointIsNumeric, tokeniseWhitespace, tokeniseWords, wordSegments } from '../../../src/core/tokenise';

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

/** Word_Break value of every code point listed in auxiliary/WordBreakProperty.txt (absent: Other). */
function wordBreakClasses(): Map<number, string> {
  const out = new Map<number, string>();
  for (const line of unicodeFile('auxiliary/WordBreakProperty.txt').split('\n')) {
    const [range, name] = (line.split('#')[0] ?? '').split(';').map((field) => field.trim());
    if (name === undefined || name === '' || range === undefined) continue;
    const [first, last] = range.split('..').map((h) => parseInt(h, 16));
    if (first === undefined) continue;
    for (let cp = first; cp <= (last ?? first); cp++) out.set(cp, name);
  }
  return out;
}

// Our rule (src/core/tokenise/stops.ts, DEVELOPERS.md "Tokenisation"): U+002E, U+003A, U+FE55, U+FF0E
// and U+FF1A always break from what comes before and never join following letters (no WB6/WB7), unless
// the character before them (past WB4's Extend, Format and ZWJ) is Numeric. Listed here by hand, not imported, so the test does not take the rule from the code.
const STOPS = new Set([0x2e, 0x3a, 0xfe55, 0xff0e, 0xff1a]);
const WB4_ATTACHED = new Set(['Extend', 'Format', 'ZWJ']);

/**
 * The file's breaks with our rule applied: a break before each such stop, and after it (past the marks
 * WB4 attaches) where WB7 would join it to a following ALetter or Hebrew_Letter.
 */
function breaksWithStopRule(codePoints: number[], breaks: Set<number>, classes: Map<number, string>): Set<number> {
  const out = new Set(breaks);
  const at: number[] = [0];
  for (const cp of codePoints) at.push((at[at.length - 1] ?? 0) + String.fromCodePoint(cp).length);
  codePoints.forEach((cp, i) => {
    if (!STOPS.has(cp) || i === 0) return;
    let before = i - 1;
    while (before > 0 && WB4_ATTACHED.has(classes.get(codePoints[before] ?? 0) ?? '')) before--;
    if (classes.get(codePoints[before] ?? 0) === 'Numeric') return;
    out.add(at[i] ?? 0);
    let after = i + 1;
    while (after < codePoints.length && WB4_ATTACHED.has(classes.get(codePoints[after] ?? 0) ?? '')) after++;
    const next = classes.get(codePoints[after] ?? -1);
    if (next === 'ALetter' || next === 'Hebrew_Letter') out.add(at[after] ?? 0);
  });
  return out;
}

describe('word segmentation against WordBreakTest.txt', () => {
  // Unicode Standard Annex #29 "Unicode Text Segmentation", its conformance file
  // auxiliary/WordBreakTest.txt: each line lists code points with ÷ (break) or × (no break) between them.
  // Intl.Segmenter (ICU) may follow a newer Unicode than the file, and ICU tailors a few rules, so we
  // require 99% agreement rather than all. Lines where our stop rule (above) knowingly departs from
  // WB6/WB7 are excluded from that count and checked against the rule's breaks instead.
  it('agrees on at least 99% of the cases and lists the rest; the stop-rule lines follow the rule', () => {
    const file = unicodeFile('auxiliary/WordBreakTest.txt');
    const classes = wordBreakClasses();
    const header = file.split('\n', 1)[0] ?? '';
    let cases = 0;
    const disagreements: string[] = [];
    const departures: string[] = [];
    const ruleMisses: string[] = [];
    for (const line of file.split('\n')) {
      const body = (line.split('#')[0] ?? '').trim();
      if (body === '') continue;
      let text = '';
      const expected: number[] = [];
      const codePoints: number[] = [];
      for (const field of body.split(/\s+/)) {
        if (field === '÷') expected.push(text.length);
        else if (field !== '×') {
          text += String.fromCodePoint(parseInt(field, 16));
          codePoints.push(parseInt(field, 16));
        }
      }
      const actual = [0, ...wordSegments(text).map((segment) => segment.end)];
      const name = codePoints.map(hex).join(' ');
      const ruled = [...breaksWithStopRule(codePoints, new Set(expected), classes)].sort((a, b) => a - b);
      if (ruled.join() !== expected.join()) {
        departures.push(name);
        if (actual.join() !== ruled.join()) ruleMisses.push(`${name}: the stop rule gives ${ruled.join(',')}, got ${actual.join(',')}`);
        continue;
      }
      cases++;
      if (actual.join() !== expected.join()) disagreements.push(`${name}: expected breaks at ${expected.join(',')}, got ${actual.join(',')}`);
    }
    const agreed = cases - disagreements.length;
    console.log(
      `${header.replace(/^#\s*/, '')} vs Intl.Segmenter (ICU ${process.versions.icu}, Unicode ${process.versions.unicode}): ` +
        `${agreed}/${cases} cases agree, ${disagreements.length} disagree (UTF-16 break offsets); ` +
        `${departures.length} lines left out for the stop rule` +
        disagreements.slice(0, 20).map((d) => `\n  ${d}`).join(''),
    );
    expect(cases).toBeGreaterThan(1000);
    expect(agreed / cases).toBeGreaterThanOrEqual(0.99);
    // The file does test letters across a colon (WB6/WB7), so the rule has lines to depart on.
    expect(departures.length).toBeGreaterThan(0);
    expect(departures).toContain('0061 003A 0061 0027');
    expect(ruleMisses).toEqual([]);
  });

  it('counts as digits exactly the Numeric code points of WordBreakProperty.txt', () => {
    // The stop rule's digit test (stops.ts) against the file, over every code point assigned in the
    // file's Unicode version (UnicodeData.txt); newer engines may know more digits.
    const classes = wordBreakClasses();
    const assigned = new Set<number>();
    for (const line of unicodeFile('UnicodeData.txt').split('\n')) {
      const cp = parseInt(line.split(';')[0] ?? '', 16);
      if (!Number.isNaN(cp)) assigned.add(cp);
    }
    expect([...classes.values()].filter((name) => name === 'Numeric').length).toBeGreaterThan(600);
    const wrong: string[] = [];
    for (let cp = 0; cp <= 0x10ffff; cp++) {
      if (!assigned.has(cp) || (cp >= 0xd800 && cp <= 0xdfff)) continue;
      if (codePointIsNumeric(String.fromCodePoint(cp)) !== (classes.get(cp) === 'Numeric')) wrong.push(hex(cp));
    }
    expect(wrong).toEqual([]);
    // And in use: a full stop between two such digits stays inside the token (WB11/WB12).
    expect(tokeniseWords('\u0661.\u0662')).toHaveLength(1);
    expect(tokeniseWords('49.99')).toHaveLength(1);
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
