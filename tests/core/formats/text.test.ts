import { describe, expect, it } from 'vitest';
import { FormatWriteError, textRead, textWrite } from '../../../src/core/formats';

describe('textRead', () => {
  it('makes one utterance per non-blank line, words tokeniser by default, all tags O', () => {
    const doc = textRead('book a plumber, please\n\n   \ncancel 🔧 visit\r\n');
    expect(doc.errors).toEqual([]);
    expect(doc.utterances.map((u) => [u.text, u.line, u.tags.length])).toEqual([
      ['book a plumber, please', 1, 5],
      ['cancel 🔧 visit', 4, 3],
    ]);
    expect(doc.utterances[0]?.tags.every((t) => t === 'O')).toBe(true);
    expect(doc.utterances[0]?.meta).toEqual({});
  });

  it('uses the given tokeniser and records the given scheme', () => {
    const doc = textRead('fix-it now', { tokeniser: { kind: 'regex', pattern: '[a-z]+' }, scheme: 'bioes' });
    expect(doc.scheme).toBe('bioes');
    expect(doc.utterances[0]?.tokens).toEqual([
      { start: 0, end: 3 },
      { start: 4, end: 6 },
      { start: 7, end: 10 },
    ]);
  });

  it('names undecodable lines and keeps the rest', () => {
    const doc = textRead(new Uint8Array([0x61, 0x0a, 0xc3, 0x28, 0x0a, 0x62]));
    expect(doc.errors).toEqual([{ line: 2, message: expect.stringMatching(/not valid UTF-8/) }]);
    expect(doc.utterances.map((u) => [u.text, u.line])).toEqual([
      ['a', 1],
      ['b', 3],
    ]);
  });
});

describe('textWrite', () => {
  const u = (text: string) => ({ text, tokens: [], tags: [], meta: {} });

  it('writes one text per line with a final newline', () => {
    expect(textWrite([u('fix tap'), u(' padded ')])).toBe('fix tap\n padded \n');
  });

  it('refuses texts it could not read back', () => {
    expect(() => textWrite([u('a\nb')])).toThrow(FormatWriteError);
    expect(() => textWrite([u('ok'), u('  ')])).toThrow(/utterance 2.*blank/);
    expect(() => textWrite([u('\uFEFFok')])).toThrow(/byte order mark/);
  });
});
