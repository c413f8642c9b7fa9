import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ByteLineDecoder } from '../../../src/core/formats/decode';
import { chunksCut, cutsArbitrary } from '../../generators/formats';

const encoder = new TextEncoder();
type Piece = { text: string } | { undecodable: string };

/** What a target receives, with adjacent text merged (how text is cut into pushes is free). */
function received(chunks: readonly Uint8Array[]): Piece[] {
  const pieces: Piece[] = [];
  const decoder = new ByteLineDecoder({
    push(text) {
      const last = pieces.at(-1);
      if (last !== undefined && 'text' in last) last.text += text;
      else pieces.push({ text });
    },
    pushUndecodable(lineText) {
      pieces.push({ undecodable: lineText });
    },
  });
  for (const chunk of chunks) decoder.push(chunk);
  decoder.end();
  return pieces;
}

/** Reference: each line (LF kept) decoded on its own, strictly, or passed on as undecodable. */
function reference(bytes: Uint8Array): Piece[] {
  const strict = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
  const lenient = new TextDecoder('utf-8', { ignoreBOM: true });
  const pieces: Piece[] = [];
  let start = 0;
  while (start < bytes.length) {
    const newline = bytes.indexOf(10, start);
    const end = newline < 0 ? bytes.length : newline + 1;
    const line = bytes.subarray(start, end);
    let text: string | null = null;
    try {
      text = strict.decode(line);
    } catch {
      pieces.push({ undecodable: lenient.decode(line) });
    }
    const last = pieces.at(-1);
    if (text !== null) {
      if (last !== undefined && 'text' in last) last.text += text;
      else pieces.push({ text });
    }
    start = end;
  }
  return pieces;
}

// Long ASCII stretches (past the 1 KiB gap that keeps mixed lines together) among lines with
// other characters, a BOM, and bytes that are not UTF-8.
const lineArb = fc.oneof(
  { weight: 6, arbitrary: fc.constantFrom('fix\tO', 'the tap\tB-problem', '', '# text = fix the tap').map((s) => encoder.encode(s)) },
  { weight: 1, arbitrary: fc.nat(3000).map((n) => encoder.encode('a'.repeat(n))) },
  { weight: 2, arbitrary: fc.constantFrom('día\tB-day', '地区 😩', '\uFEFFok', '£25').map((s) => encoder.encode(s)) },
  { weight: 1, arbitrary: fc.constantFrom([0xff], [0x61, 0xc3], [0xe2, 0x82], [0xed, 0xa0, 0x80]).map((b) => Uint8Array.from(b)) },
);

function joined(lines: readonly Uint8Array[], finalNewline: boolean): Uint8Array {
  const parts = lines.flatMap((line, i) => (i < lines.length - 1 || finalNewline ? [line, Uint8Array.of(10)] : [line]));
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const part of parts) {
    out.set(part, at);
    at += part.length;
  }
  return out;
}

describe('ByteLineDecoder, ASCII runs decoded apart', () => {
  it('passes on the same text and the same undecodable lines as a line-by-line decode', () => {
    fc.assert(
      fc.property(
        fc.array(lineArb, { minLength: 1, maxLength: 40 }),
        fc.boolean(),
        (lines, finalNewline) => {
          const bytes = joined(lines, finalNewline);
          expect(received([bytes])).toEqual(reference(bytes));
        },
      ),
      { seed: 42, numRuns: 300 },
    );
  });

  it('gives the same pieces for any chunking', () => {
    fc.assert(
      fc.property(
        fc.array(lineArb, { minLength: 1, maxLength: 30 }).chain((lines) => {
          const bytes = joined(lines, true);
          return fc.tuple(fc.constant(bytes), cutsArbitrary(bytes.length));
        }),
        ([bytes, cuts]) => {
          expect(received(chunksCut(bytes, cuts))).toEqual(reference(bytes));
        },
      ),
      { seed: 42, numRuns: 300 },
    );
  });
});
