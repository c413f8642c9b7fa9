import { describe, expect, it } from 'vitest';
import { tokenise, tokeniserCreate, TokeniserError, tokeniseWhitespace, tokeniseWords } from '../../../src/core/tokenise';
import type { Token } from '../../../src/core/types';

/** Each token as [text, start, end], so expectations show both the text and the exact offsets. */
function pieces(text: string, tokens: readonly Token[]): [string, number, number][] {
  return tokens.map(({ start, end }) => [text.slice(start, end), start, end]);
}

// Expected tokens below are worked out by hand from the UAX #29 word-boundary rules (rule numbers
// cited); offsets are UTF-16 code units counted by hand.
describe('words tokeniser on home-repair requests', () => {
  it('splits a booking request, keeping punctuation and number-letter runs', () => {
    const text = 'Can a plumber come Tuesday 9–11am? Budget $120, call 555-0142.';
    // WB10 keeps "11am" whole; hyphen-minus and en dash are not MidNum, so "555-0142" and "9–11" break (WB999).
    expect(pieces(text, tokeniseWords(text))).toEqual([
      ['Can', 0, 3], ['a', 4, 5], ['plumber', 6, 13], ['come', 14, 18], ['Tuesday', 19, 26],
      ['9', 27, 28], ['–', 28, 29], ['11am', 29, 33], ['?', 33, 34],
      ['Budget', 35, 41], ['$', 42, 43], ['120', 43, 46], [',', 46, 47],
      ['call', 48, 52], ['555', 53, 56], ['-', 56, 57], ['0142', 57, 61], ['.', 61, 62],
    ]);
  });

  it('keeps emoji whole: ZWJ sequences, skin tones and flags', () => {
    const text = 'Leak 💧💧 under sink 🚰 — send 👨‍🔧 👍🏽 🇬🇧';
    // WB3c joins ZWJ + pictograph, WB4 absorbs the skin-tone modifier, WB15 pairs regional indicators;
    // two pictographs in a row still break (WB999).
    expect(pieces(text, tokeniseWords(text))).toEqual([
      ['Leak', 0, 4], ['💧', 5, 7], ['💧', 7, 9], ['under', 10, 15], ['sink', 16, 20], ['🚰', 21, 23],
      ['—', 24, 25], ['send', 26, 30], ['👨‍🔧', 31, 36], ['👍🏽', 37, 41], ['🇬🇧', 42, 46],
    ]);
  });

  it('keeps combining marks with their letters', () => {
    const text = 'cafe\u0301 re\u0301sume\u0301';
    expect(pieces(text, tokeniseWords(text))).toEqual([['cafe\u0301', 0, 5], ['re\u0301sume\u0301', 6, 14]]);
  });

  it('tokenises Hebrew, including a quote inside an abbreviation', () => {
    const text = 'אינסטלטור ביום שלישי, בבקשה';
    expect(pieces(text, tokeniseWords(text))).toEqual([
      ['אינסטלטור', 0, 9], ['ביום', 10, 14], ['שלישי', 15, 20], [',', 20, 21], ['בבקשה', 22, 27],
    ]);
    const budget = 'תקציב 300 ש"ח';
    // WB7b/WB7c: Hebrew_Letter × Double_Quote Hebrew_Letter.
    expect(pieces(budget, tokeniseWords(budget))).toEqual([['תקציב', 0, 5], ['300', 6, 9], ['ש"ח', 10, 13]]);
  });

  it('tokenises Arabic with shadda and tanween marks, and the Arabic comma', () => {
    const text = 'أريد سب\u0651اكا\u064B يوم الثلاثاء، شكرا\u064B';
    expect(pieces(text, tokeniseWords(text))).toEqual([
      ['أريد', 0, 4], ['سب\u0651اكا\u064B', 5, 12], ['يوم', 13, 16], ['الثلاثاء', 17, 25], ['،', 25, 26], ['شكرا\u064B', 27, 32],
    ]);
  });

  it('drops a right-to-left mark that sits beside a space', () => {
    const text = 'שלום \u200Fעולם';
    expect(pieces(text, tokeniseWords(text))).toEqual([['שלום', 0, 4], ['עולם', 6, 10]]);
  });

  it('tokenises Katakana runs and Korean words', () => {
    const japanese = 'エアコン、トイレ。';
    // WB13: Katakana × Katakana; the ideographic comma and full stop are separate tokens.
    expect(pieces(japanese, tokeniseWords(japanese))).toEqual([['エアコン', 0, 4], ['、', 4, 5], ['トイレ', 5, 8], ['。', 8, 9]]);
    const korean = '내일 오전에 수리 가능한가요?';
    expect(pieces(korean, tokeniseWords(korean))).toEqual([
      ['내일', 0, 2], ['오전에', 3, 6], ['수리', 7, 9], ['가능한가요', 10, 15], ['?', 15, 16],
    ]);
  });

  it('keeps a number grouped by narrow no-break spaces, but trims one at a token edge', () => {
    const text = '10\u202F000 a \u202Fb';
    // WB13a/WB13b: U+202F is ExtendNumLet, so it joins "10 000" and also glues onto "b".
    expect(pieces(text, tokeniseWords(text))).toEqual([['10\u202F000', 0, 6], ['a', 7, 8], ['b', 10, 11]]);
  });

  it('keeps a combining mark on a space with its space rather than orphaning it', () => {
    const text = 'tap \u0301x';
    expect(pieces(text, tokeniseWords(text))).toEqual([['tap', 0, 3], [' \u0301', 3, 5], ['x', 5, 6]]);
  });

  it('gives no tokens for empty or blank text', () => {
    expect(tokeniseWords('')).toEqual([]);
    expect(tokeniseWords(' \t\u00A0\u3000\n\u200B\u200E ')).toEqual([]);
  });
});

describe('whitespace tokeniser', () => {
  it('splits on Unicode white space only, keeping punctuation attached', () => {
    const text = 'Fix the tap\u00A0today,\tplease';
    expect(pieces(text, tokeniseWhitespace(text))).toEqual([
      ['Fix', 0, 3], ['the', 4, 7], ['tap', 8, 11], ['today,', 12, 18], ['please', 19, 25],
    ]);
  });

  it('splits CJK on the ideographic space', () => {
    const text = '预约\u3000周二\u3000上午';
    expect(pieces(text, tokeniseWhitespace(text))).toEqual([['预约', 0, 2], ['周二', 3, 5], ['上午', 6, 8]]);
  });

  it('treats U+0085 as white space and U+FEFF as not (PropList.txt, unlike JavaScript \\s)', () => {
    expect(pieces('a\u0085b', tokeniseWhitespace('a\u0085b'))).toEqual([['a', 0, 1], ['b', 2, 3]]);
    expect(pieces('a\uFEFFb', tokeniseWhitespace('a\uFEFFb'))).toEqual([['a\uFEFFb', 0, 3]]);
    // A lone zero-width space between spaces is invisible, so it is no token.
    expect(pieces('a \u200B b', tokeniseWhitespace('a \u200B b'))).toEqual([['a', 0, 1], ['b', 4, 5]]);
  });
});

describe('regex tokeniser', () => {
  it('takes each match of the pattern as a token', () => {
    const text = 'Call 555-0142 after 5';
    const tokens = tokenise(text, { kind: 'regex', pattern: '\\d{3}-\\d{4}|\\p{L}+' });
    expect(pieces(text, tokens)).toEqual([['Call', 0, 4], ['555-0142', 5, 13], ['after', 14, 19]]);
  });

  it('honours user flags, ignores sticky and accepts the v flag', () => {
    expect(tokenise('FIX fix', { kind: 'regex', pattern: 'fix', flags: 'i' })).toEqual([{ start: 0, end: 3 }, { start: 4, end: 7 }]);
    // Sticky matching would stop at the first gap; it is dropped so both words are found.
    expect(tokenise('leak tap', { kind: 'regex', pattern: '\\p{L}+', flags: 'y' })).toHaveLength(2);
    expect(pieces('banana', tokenise('banana', { kind: 'regex', pattern: '[\\p{L}--[a]]+', flags: 'v' }))).toEqual([
      ['b', 0, 1], ['n', 2, 3], ['n', 4, 5],
    ]);
  });

  it('matches by code point, so "." takes a whole emoji', () => {
    const text = '🔧a';
    expect(pieces(text, tokenise(text, { kind: 'regex', pattern: '.' }))).toEqual([['🔧', 0, 2], ['a', 2, 3]]);
  });

  it('trims whitespace from matches and drops blank ones', () => {
    const text = 'fix  the tap ';
    expect(pieces(text, tokenise(text, { kind: 'regex', pattern: '\\s*\\S+\\s*' }))).toEqual([
      ['fix', 0, 3], ['the', 5, 8], ['tap', 9, 12],
    ]);
    expect(tokenise('a  b', { kind: 'regex', pattern: '\\s+' })).toEqual([]);
  });

  it.each([
    ['(', 'Unterminated group'],
    ['[z-a]', 'Range out of order'],
    ['a{2,1}', 'numbers out of order'],
  ])('rejects the invalid pattern %s with a TokeniserError naming it', (pattern, reason) => {
    const create = () => tokeniserCreate({ kind: 'regex', pattern });
    expect(create).toThrow(TokeniserError);
    expect(create).toThrow(`Token pattern /${pattern}/ is not a valid regular expression: ${reason}`);
  });

  it.each(['q', 'uv', 'gx'])('rejects the invalid flags %s', (flags) => {
    expect(() => tokeniserCreate({ kind: 'regex', pattern: 'x', flags })).toThrow(`Token pattern flags "${flags}" are not valid`);
  });

  it('rejects an empty pattern and an unknown kind', () => {
    expect(() => tokeniserCreate({ kind: 'regex', pattern: '' })).toThrow(/Token pattern is empty/);
    const unknown = JSON.parse('{"kind":"sentences"}') as { kind: 'words' };
    expect(() => tokeniserCreate(unknown)).toThrow(/Unknown tokeniser kind "sentences"/);
    const error = (() => {
      try {
        tokeniserCreate({ kind: 'regex', pattern: '(' });
        return null;
      } catch (thrown) {
        return thrown;
      }
    })();
    expect(error).toBeInstanceOf(TokeniserError);
    expect((error as Error).name).toBe('TokeniserError');
  });

  it.each(['x*', '\\b', '(?=a)', '(?<=a)', '$', '(?:)*', 'a|'])('finishes on the empty-matching pattern %s over a long text', (pattern) => {
    const text = 'a🔧 '.repeat(50_000);
    // A pattern that loops on empty matches would hang here and hit the test timeout; speed is not asserted.
    const tokens = tokenise(text, { kind: 'regex', pattern, flags: 'm' });
    expect(tokens.every(({ start, end }) => end > start)).toBe(true);
    expect(tokens).toHaveLength(pattern === 'a|' ? 50_000 : 0);
  });
});

describe('tokenise', () => {
  it('defaults to the words tokeniser', () => {
    const text = 'Reschedule, please!';
    expect(tokenise(text)).toEqual(tokeniseWords(text));
    expect(pieces(text, tokenise(text))).toEqual([['Reschedule', 0, 10], [',', 10, 11], ['please', 12, 18], ['!', 18, 19]]);
  });

  it('returns the built-in tokenisers from tokeniserCreate', () => {
    expect(tokeniserCreate({ kind: 'words' })).toBe(tokeniseWords);
    expect(tokeniserCreate({ kind: 'whitespace' })).toBe(tokeniseWhitespace);
  });
});
