import { describe, expect, it } from 'vitest';
import { FormatWriteError, jsonlRead, jsonlWrite } from '../../../src/core/formats';
import type { Utterance } from '../../../src/core/types';

const line = (record: unknown) => JSON.stringify(record);

describe('jsonlRead', () => {
  it('reads code-point offsets into UTF-16 tokens and spans into tags', () => {
    // "🔧" is one code point but two UTF-16 units, so every later offset shifts by one in memory.
    const text = '🔧 fix tap Tuesday';
    const doc = jsonlRead(
      line({
        id: 'hr-1',
        text,
        intent: 'book_visit',
        tokens: [
          { start: 0, end: 1 },
          { start: 2, end: 5 },
          { start: 6, end: 9 },
          { start: 10, end: 17 },
        ],
        spans: [
          { start: 10, end: 17, label: 'day' },
          { start: 2, end: 9, label: 'problem' },
        ],
        meta: { annotator: 'b' },
      }),
    );
    expect(doc.errors).toEqual([]);
    expect(doc.scheme).toBe('iob2');
    const u = doc.utterances[0] as Utterance;
    expect(u.tokens.map((t) => text.slice(t.start, t.end))).toEqual(['🔧', 'fix', 'tap', 'Tuesday']);
    expect(u.tags).toEqual(['O', 'B-problem', 'I-problem', 'B-day']);
    expect(u).toMatchObject({ id: 'hr-1', intent: 'book_visit', meta: { annotator: 'b' }, line: 1 });
    expect(u.tokenLines).toBeUndefined();
  });

  it('produces tags in the requested scheme', () => {
    const record = line({ text: 'fix tap now', tokens: [{ start: 0, end: 3 }, { start: 4, end: 7 }, { start: 8, end: 11 }], spans: [{ start: 0, end: 7, label: 'problem' }, { start: 8, end: 11, label: 'day' }] });
    expect(jsonlRead(record, { scheme: 'bioes' }).utterances[0]?.tags).toEqual(['B-problem', 'E-problem', 'S-day']);
    expect(jsonlRead(record, { scheme: 'iob1' }).utterances[0]?.tags).toEqual(['I-problem', 'I-problem', 'I-day']);
  });

  it('tokenises records without tokens (words by default) and aligns spans to those tokens', () => {
    const doc = jsonlRead(line({ text: 'fix the tap, today', spans: [{ start: 8, end: 11, label: 'problem' }] }));
    expect(doc.errors).toEqual([]);
    const u = doc.utterances[0] as Utterance;
    expect(u.tokens.map((t) => u.text.slice(t.start, t.end))).toEqual(['fix', 'the', 'tap', ',', 'today']);
    expect(u.tags).toEqual(['O', 'O', 'B-problem', 'O', 'O']);
    const ws = jsonlRead(line({ text: 'fix the tap, today' }), { tokeniser: { kind: 'whitespace' } }).utterances[0];
    expect(ws?.tokens).toHaveLength(4);
  });

  it('treats null id, intent, spans and meta as absent and skips blank lines', () => {
    const doc = jsonlRead(`\n${line({ id: null, text: 'ok', intent: null, spans: null, meta: null })}\n  \n`);
    expect(doc.errors).toEqual([]);
    expect(doc.utterances).toEqual([{ text: 'ok', tokens: [{ start: 0, end: 2 }], tags: ['O'], meta: {}, line: 2 }]);
  });

  it('accepts a token "text" that matches its offsets', () => {
    const doc = jsonlRead(line({ text: 'née 🔧', tokens: [{ start: 0, end: 3, text: 'née' }, { start: 4, end: 5, text: '🔧' }] }));
    expect(doc.errors).toEqual([]);
  });
});

describe('jsonlRead, malformed records', () => {
  const good = line({ id: 'ok', text: 'fine' });
  const cases: [string, unknown, RegExp][] = [
    ['invalid JSON', '{"text": "a"', /^invalid JSON/],
    ['not an object', [1, 2], /JSON object/],
    ['missing text', { id: 'x' }, /missing "text"/],
    ['non-string text', { text: 42 }, /"text" must be a string/],
    ['non-string id', { text: 'a', id: 7 }, /"id" must be a string/],
    ['tokens not an array', { text: 'a', tokens: {} }, /"tokens" must be an array/],
    ['token offset not an integer', { text: 'ab', tokens: [{ start: 0.5, end: 2 }] }, /tokens\[0\]\.start must be an integer/],
    ['token out of range', { text: 'ab', tokens: [{ start: 0, end: 3 }] }, /tokens\[0\]\.end = 3 is out of range: the text has 2 code points/],
    ['empty token', { text: 'ab', tokens: [{ start: 1, end: 1 }] }, /tokens\[0\] is empty/],
    ['overlapping tokens', { text: 'abcd', tokens: [{ start: 0, end: 2 }, { start: 1, end: 3 }] }, /tokens\[1\] overlaps tokens\[0\]/],
    ['unsorted tokens', { text: 'abcd', tokens: [{ start: 2, end: 3 }, { start: 0, end: 1 }] }, /tokens must be sorted/],
    ['token/offset mismatch', { text: 'fix tap', tokens: [{ start: 0, end: 3, text: 'fox' }] }, /token\/offset mismatch: tokens\[0\]\.text is "fox".*"fix"/],
    ['span not on token boundaries', { text: 'fix tap', tokens: [{ start: 0, end: 3 }, { start: 4, end: 7 }], spans: [{ start: 1, end: 3, label: 'problem' }] }, /spans\[0\] \[1, 3\) is not on token boundaries/],
    ['span across a gap only', { text: 'fix tap', tokens: [{ start: 0, end: 3 }, { start: 4, end: 7 }], spans: [{ start: 4, end: 3, label: 'x' }] }, /spans\[0\] is empty or reversed/],
    ['overlapping spans', { text: 'fix tap', tokens: [{ start: 0, end: 3 }, { start: 4, end: 7 }], spans: [{ start: 4, end: 7, label: 'b' }, { start: 0, end: 7, label: 'a' }] }, /spans\[1\] and spans\[0\] overlap/],
    ['bad label', { text: 'fix', tokens: [{ start: 0, end: 3 }], spans: [{ start: 0, end: 3, label: 'two words' }] }, /spans\[0\]\.label must be a non-empty slot name/],
    ['missing label', { text: 'fix', tokens: [{ start: 0, end: 3 }], spans: [{ start: 0, end: 3 }] }, /spans\[0\]\.label/],
    ['meta value not a string', { text: 'fix', meta: { n: 1 } }, /meta "n" must be a string/],
  ];

  it.each(cases)('%s: error on its line, the other records kept', (_name, record, message) => {
    const bad = typeof record === 'string' ? record : line(record);
    const doc = jsonlRead([good, good, bad, good].join('\n'));
    expect(doc.errors).toEqual([{ line: 3, message: expect.stringMatching(message) }]);
    expect(doc.utterances.map((u) => u.line)).toEqual([1, 2, 4]);
  });

  it('names undecodable bytes', () => {
    const bytes = new Uint8Array([...new TextEncoder().encode(`${good}\n{"text":"`), 0xff, ...new TextEncoder().encode(`"}\n${good}\n`)]);
    const doc = jsonlRead(bytes);
    expect(doc.errors).toEqual([{ line: 2, message: expect.stringMatching(/not valid UTF-8/) }]);
    expect(doc.utterances).toHaveLength(2);
  });
});

describe('jsonlWrite', () => {
  const utterance: Utterance = {
    id: 'hr-3',
    text: 'מחר 🔧 fix',
    intent: 'reschedule',
    tokens: [
      { start: 0, end: 3 },
      { start: 4, end: 6 },
      { start: 7, end: 10 },
    ],
    tags: ['B-day', 'O', 'B-problem'],
    meta: { b: '2', '10': 'x', a: '1', '9': 'y' },
  };

  it('writes keys in canonical order, code-point offsets, meta keys by code unit, no spaces', () => {
    expect(jsonlWrite([utterance])).toBe(
      '{"id":"hr-3","text":"מחר 🔧 fix","intent":"reschedule","tokens":[{"start":0,"end":3},{"start":4,"end":5},{"start":6,"end":9}],' +
        '"spans":[{"start":0,"end":3,"label":"day"},{"start":6,"end":9,"label":"problem"}],"meta":{"10":"x","9":"y","a":"1","b":"2"}}\n',
    );
  });

  it('omits absent id and intent and empty meta, keeps empty tokens and spans', () => {
    expect(jsonlWrite([{ text: '', tokens: [], tags: [], meta: {} }])).toBe('{"text":"","tokens":[],"spans":[]}\n');
    expect(jsonlWrite([])).toBe('');
  });

  it('writes illegal tag sequences as the lenient decoder reads them', () => {
    const out = jsonlWrite([{ ...utterance, tags: ['I-day', 'I-problem', 'I-problem'] }]);
    expect(out).toContain('"spans":[{"start":0,"end":3,"label":"day"},{"start":4,"end":9,"label":"problem"}]');
  });

  it('refuses unparseable tags, tag count mismatches and bad token offsets', () => {
    expect(() => jsonlWrite([{ ...utterance, tags: ['Q-day', 'O', 'O'] }])).toThrow(FormatWriteError);
    expect(() => jsonlWrite([{ ...utterance, tags: ['O'] }])).toThrow(/3 tokens but 1 tags/);
    expect(() => jsonlWrite([{ ...utterance, tokens: [{ start: 0, end: 3 }, { start: 5, end: 6 }, { start: 7, end: 10 }] }])).toThrow(/surrogate pair/);
    expect(() => jsonlWrite([{ ...utterance, tokens: [{ start: 4, end: 6 }, { start: 0, end: 3 }, { start: 7, end: 10 }] }])).toThrow(/out of order/);
  });
});
