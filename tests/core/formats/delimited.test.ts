import { describe, expect, it } from 'vitest';
import { delimitedRead, delimitedReader, delimitedWrite, FormatWriteError } from '../../../src/core/formats';

const WS = { tokeniser: { kind: 'whitespace' } } as const;

// RFC 4180 ("Common Format and MIME Type for CSV Files"), section 2, rules 1-7 and their examples,
// restated from memory: CRLF records, optional final line break, optional header, spaces kept,
// optional quotes, quotes required around commas/quotes/line breaks, "" escaping a quote.
describe('delimitedRead, RFC 4180 section 2 examples', () => {
  it('rule 1-2: records on separate lines ending in CRLF, the last line break optional', () => {
    const a = delimitedRead('aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n', { column: 1, header: false, ...WS });
    const b = delimitedRead('aaa,bbb,ccc\r\nzzz,yyy,xxx', { column: 1, header: false, ...WS });
    expect(a.errors).toEqual([]);
    expect(a.utterances.map((u) => u.text)).toEqual(['bbb', 'yyy']);
    expect(b).toEqual(a);
  });

  it('rule 3: an optional header line naming the fields', () => {
    const doc = delimitedRead('field_name,field_name2,text\r\naaa,bbb,ccc\r\n', { column: 'text', ...WS });
    expect(doc.utterances.map((u) => [u.text, u.meta, u.line])).toEqual([['ccc', { field_name: 'aaa', field_name2: 'bbb' }, 2]]);
  });

  it('rule 4: spaces are part of a field', () => {
    const doc = delimitedRead('id,text\n1, fix the tap \n', { column: 'text', ...WS });
    expect(doc.utterances[0]?.text).toBe(' fix the tap ');
  });

  it('rules 5-7: quoted fields may hold commas, line breaks and doubled quotes', () => {
    const doc = delimitedRead('"aaa","b\r\nbb","ccc"\r\nzzz,"y""yy",xxx\r\n"a,b",c,d\r\n', { column: 1, header: false, ...WS });
    expect(doc.errors).toEqual([]);
    // Line breaks inside quotes are normalised to LF, like the ones between records.
    expect(doc.utterances.map((u) => [u.text, u.line])).toEqual([
      ['b\nbb', 1],
      ['y"yy', 3],
      ['c', 4],
    ]);
  });
});

describe('delimitedRead', () => {
  it('sniffs tab or comma from the first line, or takes the option', () => {
    expect(delimitedRead('id\ttext\n1\tfix, now\n', { column: 'text' }).utterances[0]?.text).toBe('fix, now');
    expect(delimitedRead('id,text\n1,fix\tnow\n', { column: 'text' }).utterances[0]?.text).toBe('fix\tnow');
    expect(delimitedRead('a\tb,c\n', { column: 0, header: false, delimiter: ',' }).utterances[0]?.text).toBe('a\tb');
  });

  it('reads ids and intents from their columns; empty cells are absent', () => {
    const doc = delimitedRead('id,utterance,intent\nhr-1,book a plumber,book_visit\n,cancel it,\n', {
      column: 'utterance',
      idColumn: 'id',
      intentColumn: 2,
      ...WS,
    });
    expect(doc.errors).toEqual([]);
    expect(doc.utterances.map((u) => [u.id, u.intent, u.text, u.tags])).toEqual([
      ['hr-1', 'book_visit', 'book a plumber', ['O', 'O', 'O']],
      [undefined, undefined, 'cancel it', ['O', 'O']],
    ]);
  });

  it('names a missing column once, at the header, and reads nothing', () => {
    const doc = delimitedRead('id,utterance\n1,fix\n2,tap\n', { column: 'text' });
    expect(doc.utterances).toEqual([]);
    expect(doc.errors).toEqual([{ line: 1, message: 'missing column "text": the header has "id", "utterance"' }]);
    expect(delimitedRead('a,b\n', { column: 5, header: false }).errors[0]?.message).toMatch(/missing column number 5 \(0-based\): the first row has 2 fields/);
    expect(delimitedRead('a,b\n', { column: 'text', header: false }).errors[0]?.message).toMatch(/without a header row/);
  });

  it('names ragged rows and empty texts by line, counting quoted line breaks, and keeps the rest', () => {
    const file = ['id,text', '1,"fix', 'the tap"', '2,tap,extra', '3,  ', '4', '5,ok', ''].join('\n');
    const doc = delimitedRead(file, { column: 'text', idColumn: 'id', ...WS });
    expect(doc.errors).toEqual([
      { line: 4, message: 'ragged row: 3 fields where the header (line 1) has 2' },
      { line: 5, message: 'empty text in column "text"' },
      { line: 6, message: 'ragged row: 1 fields where the header (line 1) has 2' },
    ]);
    expect(doc.utterances.map((u) => [u.id, u.line])).toEqual([
      ['1', 2],
      ['5', 7],
    ]);
  });

  it('names an unterminated quote at the row where it starts', () => {
    const doc = delimitedRead('id,text\n1,ok\n2,"never closed\n3,lost\n', { column: 'text' });
    expect(doc.utterances.map((u) => u.id ?? u.text)).toEqual(['ok']);
    expect(doc.errors).toEqual([{ line: 3, message: expect.stringMatching(/^CSV quoting: .*unterminated/i) }]);
  });

  it('names undecodable lines inside a quoted record', () => {
    const enc = new TextEncoder();
    const bytes = new Uint8Array([...enc.encode('id,text\n1,"first\nline '), 0xff, ...enc.encode('"\n2,fine\n')]);
    const doc = delimitedRead(bytes, { column: 'text', idColumn: 'id' });
    expect(doc.errors).toEqual([{ line: 3, message: expect.stringMatching(/not valid UTF-8/) }]);
    expect(doc.utterances.map((u) => [u.id, u.line])).toEqual([['2', 4]]);
  });

  it('streams: records are read as soon as they are complete', () => {
    const reader = delimitedReader({ column: 'text' });
    reader.push('text\nfirst\n"sec');
    reader.push('ond\nline"\nthird');
    const doc = reader.end();
    expect(doc.utterances.map((u) => [u.text, u.line])).toEqual([
      ['first', 2],
      ['second\nline', 3],
      ['third', 5],
    ]);
  });
});

describe('delimitedWrite', () => {
  it('writes a header, quotes where RFC 4180 requires, and ends with a newline', () => {
    const out = delimitedWrite([
      { id: 'hr-1', text: 'fix, "now"', intent: 'book_visit', tokens: [], tags: [], meta: { note: 'two\nlines' } },
      { text: 'plain', tokens: [], tags: [], meta: {} },
    ]);
    expect(out).toBe('id,text,intent,note\nhr-1,"fix, ""now""",book_visit,"two\nlines"\n,plain,,\n');
  });

  it('refuses blank texts and meta keys that clash with its columns', () => {
    expect(() => delimitedWrite([{ text: ' ', tokens: [], tags: [], meta: {} }])).toThrow(FormatWriteError);
    expect(() => delimitedWrite([{ text: 'a', tokens: [], tags: [], meta: { text: 'x' } }])).toThrow(/meta key "text"/);
  });
});
