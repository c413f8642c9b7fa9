import { describe, expect, it } from 'vitest';
import { AttributeEncoder, attributesOfWords, IntBuffer, wordShape, wordShapeShort, wordTemplates } from '../../../src/core/crf';

describe('word attributes', () => {
  it('shapes words', () => {
    expect(wordShape('Drain-42')).toBe('Xxxxx-dd');
    expect(wordShapeShort('Xxxxx-dd')).toBe('Xx-d');
    expect(wordShape('Über')).toBe('Xxxx');
  });

  it('lists templates with prefixes, suffixes and true flags only', () => {
    expect(wordTemplates('Monday')).toEqual(['w=Monday', 'l=monday', 'sh=Xxxxxx', 'ss=Xx', 'p1=m', 's1=y', 'p2=mo', 's2=ay', 'p3=mon', 's3=day', 'title']);
    expect(wordTemplates('555')).toContain('digits');
    expect(wordTemplates('Q1')).toContain('hasdigit');
    expect(wordTemplates('?')).toEqual(['l=?', 'sh=?', 'ss=?', 'p1=?', 's1=?', 'punct']);
    expect(wordTemplates('ASAP')).toContain('upper');
  });

  it('puts the window of ±2 and the sentence edges on each token', () => {
    const [first, second] = attributesOfWords(['fix', 'roof']);
    expect(first).toContain('bias');
    expect(first).toContain('BOS@-2');
    expect(first).toContain('BOS@-1');
    expect(first).toContain('l=fix@0');
    expect(first).toContain('l=roof@+1');
    expect(first).toContain('EOS@+2');
    expect(second).toContain('l=fix@-1');
    expect(second).toContain('EOS@+1');
    expect(second).toContain('BOS@-2');
  });

  it('the encoder gives the same attributes as the readable form, and drops unknown ones once frozen', () => {
    const words = ['my', 'Boiler', 'broke', 'on', '12', 'May', '!'];
    const encoder = new AttributeEncoder();
    const ids = new IntBuffer();
    const ends = new IntBuffer();
    encoder.encode(words, ids, ends);
    const readable = attributesOfWords(words);
    let k = 0;
    readable.forEach((names, t) => {
      const got = Array.from(ids.data.subarray(k, ends.data[t]), (id) => encoder.names[id]);
      expect(got).toEqual(names);
      k = ends.data[t] as number;
    });
    const frozen = new AttributeEncoder(encoder.names, false);
    const ids2 = new IntBuffer();
    const ends2 = new IntBuffer();
    frozen.encode(['unseen'], ids2, ends2);
    const names = Array.from(ids2.toArray(), (id) => frozen.names[id]);
    expect(names).toEqual(attributesOfWords(['unseen'])[0]?.filter((n) => encoder.names.includes(n)));
    expect(frozen.size).toBe(encoder.size);
  });
});
