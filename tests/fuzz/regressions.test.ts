/** Inputs the fuzz runs found failing, kept by name with the seed and path that found them. */
import { describe, expect, it } from 'vitest';
import { delimitedReader } from '../../src/core/formats';
import { READER_TARGETS, readerFuzzCheck } from './properties';

const encoder = new TextEncoder();
const target = (name: string) => READER_TARGETS.find((t) => t.name === name) ?? expect.unreachable(name);

describe('fuzz regressions', () => {
  // Seed 42, path 447:0:0:0:0:0:0:1:1:2:1:3:3:3:4:3:3:4 (csv): papaparse strips a U+FEFF that starts
  // the text it is given, so a record starting with U+FEFF lost it or kept it depending on where a batch began.
  it('csv: a U+FEFF starting a later record is data, wherever the chunks are cut', () => {
    const text = '\uFEFFid,text,intent\n\uFEFFid,text,intent\nhr-1," e ",book_visit\n';
    for (const name of ['csv', 'tsv', 'tsv by index, no header']) readerFuzzCheck(target(name), { bytes: encoder.encode(text), text }, [0]);
    const reader = delimitedReader({ column: 'text', idColumn: 'id', intentColumn: 'intent' });
    reader.push(new Uint8Array(0));
    reader.push(encoder.encode(text));
    expect(reader.end().utterances.map((u) => u.id)).toEqual(['\uFEFFid', 'hr-1']);
  });
});
