import { describe, expect, it } from 'vitest';
import { columnsRead, columnsReader, columnsWrite, FormatWriteError } from '../../../src/core/formats';
import type { Utterance } from '../../../src/core/types';

const CLEAN = [
  '# id = hr-1',
  '# intent = book_visit',
  '# text = book a plumber  for tomorrow',
  '# template = book-01',
  'book\tO',
  'a\tO',
  'plumber\tB-service',
  'for\tO',
  'tomorrow\tB-day',
  '',
  '# id = hr-2',
  '# text = leaking tap',
  'leaking\tB-problem',
  'tap\tI-problem',
  '',
].join('\n');

describe('columnsRead, well-formed files', () => {
  it('reads tokens, tags, ids, intents, meta, text offsets and file lines', () => {
    const doc = columnsRead(CLEAN);
    expect(doc.errors).toEqual([]);
    expect(doc.scheme).toBe('iob2');
    expect(doc.utterances).toHaveLength(2);
    const [first, second] = doc.utterances as [Utterance, Utterance];
    expect(first).toMatchObject({ id: 'hr-1', intent: 'book_visit', text: 'book a plumber  for tomorrow', meta: { template: 'book-01' } });
    expect(first.tags).toEqual(['O', 'O', 'B-service', 'O', 'B-day']);
    // "for" sits after two spaces in the text: offsets come from # text, not from joining tokens.
    expect(first.tokens.map((t) => first.text.slice(t.start, t.end))).toEqual(['book', 'a', 'plumber', 'for', 'tomorrow']);
    expect(first.tokens[3]).toEqual({ start: 16, end: 19 });
    expect(first.line).toBe(1);
    expect(first.tokenLines).toEqual([5, 6, 7, 8, 9]);
    expect(second).toMatchObject({ id: 'hr-2', line: 11, tokenLines: [13, 14], meta: {} });
    expect(second.intent).toBeUndefined();
  });

  it('joins tokens with single spaces when there is no # text', () => {
    const doc = columnsRead('call\tO\n555-0142\tB-contact_phone\n');
    expect(doc.utterances[0]?.text).toBe('call 555-0142');
    expect(doc.utterances[0]?.tokens).toEqual([
      { start: 0, end: 4 },
      { start: 5, end: 13 },
    ]);
  });

  it('takes the tag from the last column of tab or space runs and ignores the middle ones', () => {
    const doc = columnsRead('  fix   VB  B-VP\tO\nthe  DT I-NP  B-problem   \n');
    expect(doc.errors).toEqual([]);
    expect(doc.utterances[0]?.tags).toEqual(['O', 'B-problem']);
    expect(doc.utterances[0]?.text).toBe('fix the');
  });

  it('skips -DOCSTART- lines and comments that are not key = value', () => {
    const doc = columnsRead('-DOCSTART- -X- O\n\n# plain remark\n#\n# id = z\nok\tO\n');
    expect(doc.errors).toEqual([]);
    expect(doc.utterances).toEqual([expect.objectContaining({ id: 'z', text: 'ok', line: 3, meta: {} })]);
  });

  it('keeps hashtag tokens: only "#" alone or "# " starts a comment', () => {
    const doc = columnsRead('#\tO\n#leak\tB-problem\n');
    expect(doc.errors).toEqual([]);
    expect(doc.utterances[0]?.text).toBe('# #leak');
  });

  it('keeps the value after "= " exactly, spaces included, and parses "key=value"', () => {
    const doc = columnsRead('# id =  spaced \n# note=tight\nok\tO\n');
    expect(doc.utterances[0]).toMatchObject({ id: ' spaced ', meta: { note: 'tight' } });
  });

  it('detects BIOES from E-/S- tags and IOB1 from spans opened by I-', () => {
    expect(columnsRead('a\tS-day\nb\tO\n').scheme).toBe('bioes');
    expect(columnsRead('a\tI-day\nb\tO\n\nc\tI-day\nd\tB-day\n').scheme).toBe('iob1');
    expect(columnsRead('a\tB-day\nb\tI-day\n').scheme).toBe('iob2');
    expect(columnsRead('a\tO\n').scheme).toBe('iob2');
  });

  it('keeps the given scheme and tags as written', () => {
    const doc = columnsRead('a\tI-day\nb\tI-day\n', { scheme: 'iob2' });
    expect(doc.scheme).toBe('iob2');
    expect(doc.utterances[0]?.tags).toEqual(['I-day', 'I-day']);
  });

  it('keeps a meta key called __proto__ as plain data', () => {
    const doc = columnsRead('# __proto__ = x\nok\tO\n');
    const meta = doc.utterances[0]?.meta ?? {};
    expect(Object.keys(meta)).toEqual(['__proto__']);
    expect(Object.getPrototypeOf(meta)).toBe(Object.prototype);
  });
});

describe('columnsRead, malformed input', () => {
  function errorsOf(text: string, scheme?: 'iob2' | 'bioes') {
    const doc = scheme === undefined ? columnsRead(text) : columnsRead(text, { scheme });
    return { doc, errors: doc.errors, ids: doc.utterances.map((u) => u.id) };
  }

  it('names a token line without a tag column and keeps the other utterances', () => {
    const { errors, ids } = errorsOf('# id = a\nfix\nmy\tO\n\n# id = b\nok\tO\n');
    expect(errors).toEqual([{ line: 2, message: expect.stringMatching(/missing tag column.*"fix"/) }]);
    expect(ids).toEqual(['b']);
  });

  it('names tags outside every grammar', () => {
    const { errors, ids } = errorsOf('# id = a\nx\tB-\n\n# id = b\ny\tQ-day\nz\tb-day\n\n# id = c\nok\tO\n');
    expect(errors.map((e) => e.line)).toEqual([2, 5, 6]);
    expect(errors[0]?.message).toContain('"B-"');
    expect(errors[1]?.message).toContain('"Q-day"');
    expect(errors[2]?.message).toContain('"b-day"');
    expect(ids).toEqual(['c']);
  });

  it('names a tag the given scheme does not allow', () => {
    const { errors, ids } = errorsOf('# id = a\nx\tB-day\ny\tE-day\n\n# id = b\nok\tO\n', 'iob2');
    expect(errors).toEqual([{ line: 3, message: expect.stringMatching(/"E-day" is not in the IOB2 scheme/) }]);
    expect(ids).toEqual(['b']);
  });

  it('names a token missing from # text', () => {
    const { errors, ids } = errorsOf('# id = a\n# text = fix the tap\nfix\tO\nsink\tO\n\n# id = b\nok\tO\n');
    expect(errors).toEqual([{ line: 4, message: expect.stringMatching(/token\/text mismatch: token "sink".*line 2/) }]);
    expect(ids).toEqual(['b']);
  });

  it('names tokens out of order against # text', () => {
    const { errors } = errorsOf('# text = tap fix\nfix\tO\ntap\tO\n');
    expect(errors).toEqual([{ line: 3, message: expect.stringContaining('"tap"') }]);
  });

  it('names a comment line between token lines', () => {
    const { errors, ids } = errorsOf('# id = a\nfix\tO\n# id = b\nok\tO\n\n# id = c\nok\tO\n');
    expect(errors).toEqual([{ line: 3, message: expect.stringMatching(/comment line inside an utterance/) }]);
    expect(ids).toEqual(['c']);
  });

  it('names a # text with no token lines after it', () => {
    const { errors, doc } = errorsOf('# text = lonely\n\nok\tO\n');
    expect(errors).toEqual([{ line: 1, message: expect.stringContaining('no token lines') }]);
    expect(doc.utterances).toHaveLength(1);
  });

  it('names undecodable bytes by line and keeps the rest', () => {
    const bytes = new Uint8Array([...new TextEncoder().encode('# id = a\nfix\tO\ncaf'), 0xe9, ...new TextEncoder().encode('\tO\n\n# id = b\nok\tO\n')]);
    const doc = columnsRead(bytes);
    expect(doc.errors).toEqual([{ line: 3, message: expect.stringMatching(/not valid UTF-8/) }]);
    expect(doc.utterances.map((u) => u.id)).toEqual(['b']);
    expect(doc.utterances[0]?.line).toBe(5);
  });

  it('reports several errors in file order', () => {
    const { errors } = errorsOf('a\tB-\n\nb\n\nc\tQ-x\n');
    expect(errors.map((e) => e.line)).toEqual([1, 3, 5]);
  });
});

describe('columnsWrite', () => {
  const utterance: Utterance = {
    id: 'hr-9',
    intent: 'ask_price',
    text: 'price  for 🔧?',
    tokens: [
      { start: 0, end: 5 },
      { start: 7, end: 10 },
      { start: 11, end: 13 },
      { start: 13, end: 14 },
    ],
    tags: ['O', 'O', 'B-service', 'O'],
    meta: { zeta: '1', '10': 'ten', '9': 'nine', alpha: ' a ' },
  };

  it('writes the canonical form: id, intent, text, meta by code unit, token<TAB>tag, one final newline', () => {
    expect(columnsWrite([utterance, withoutId(utterance)])).toBe(
      [
        '# id = hr-9',
        '# intent = ask_price',
        '# text = price  for 🔧?',
        '# 10 = ten',
        '# 9 = nine',
        '# alpha =  a ',
        '# zeta = 1',
        'price\tO',
        'for\tO',
        '🔧\tB-service',
        '?\tO',
        '',
        '# intent = ask_price',
        '# text = price  for 🔧?',
        '# 10 = ten',
        '# 9 = nine',
        '# alpha =  a ',
        '# zeta = 1',
        'price\tO',
        'for\tO',
        '🔧\tB-service',
        '?\tO',
        '',
      ].join('\n'),
    );
    expect(columnsWrite([])).toBe('');
  });

  function withoutId(u: Utterance): Utterance {
    const { id: _id, ...rest } = u;
    return rest;
  }

  function writeFails(change: Partial<Utterance>): FormatWriteError {
    try {
      columnsWrite([{ ...utterance, id: 'ok' }, { ...utterance, ...change }]);
    } catch (error) {
      expect(error).toBeInstanceOf(FormatWriteError);
      return error as FormatWriteError;
    }
    throw new Error('expected a FormatWriteError');
  }

  it('refuses tokens with white space, naming the utterance by position and id', () => {
    const error = writeFails({ text: 'a b', tokens: [{ start: 0, end: 3 }], tags: ['O'] });
    expect(error.index).toBe(1);
    expect(error.id).toBe('hr-9');
    expect(error.message).toMatch(/utterance 2 \(id "hr-9"\).*white space/);
  });

  it('refuses line breaks in text, id, intent or meta, and unwritable meta keys', () => {
    expect(writeFails({ text: 'a\nb', tokens: [{ start: 0, end: 1 }], tags: ['O'] }).message).toContain('line break');
    expect(writeFails({ id: 'x\ry' }).message).toContain('id contains a line break');
    expect(writeFails({ intent: 'x\ny' }).message).toContain('intent');
    expect(writeFails({ meta: { note: 'a\nb' } }).message).toContain('meta value');
    expect(writeFails({ meta: { 'two words': 'x' } }).message).toContain('meta key');
    expect(writeFails({ meta: { text: 'x' } }).message).toContain('meta key');
  });

  it('refuses utterances it could not read back: no tokens, tag count, -DOCSTART-, shadowed tokens', () => {
    expect(writeFails({ tokens: [], tags: [] }).message).toContain('no tokens');
    expect(writeFails({ tags: ['O'] }).message).toContain('4 tokens but 1 tags');
    expect(writeFails({ text: '-DOCSTART-', tokens: [{ start: 0, end: 10 }], tags: ['O'] }).message).toContain('-DOCSTART-');
    expect(writeFails({ text: 'tap-tap', tokens: [{ start: 4, end: 7 }], tags: ['O'] }).message).toContain('found earlier');
    expect(writeFails({ tags: ['O', 'O', 'B service', 'O'] }).message).toContain('white space');
  });

  it('reads back what it wrote, with file lines', () => {
    const doc = columnsReader();
    doc.push(columnsWrite([utterance]));
    const read = doc.end();
    expect(read.utterances[0]).toEqual({ ...utterance, line: 1, tokenLines: [8, 9, 10, 11] });
  });
});
