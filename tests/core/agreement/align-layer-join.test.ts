import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { AlignLayerData } from '../../../src/core/agreement';
import { AlignColumnsTarget } from '../../../src/core/agreement/align-columns';
import { alignLayersJoin, type AlignLayerPart } from '../../../src/core/agreement/align-layer-join';
import { columnsReaderTo } from '../../../src/core/formats';
import type { ReadError } from '../../../src/core/types';
import { cleanColumnsFileArb, columnsFileArb, textBoundaries } from './columns-files';

function read(text: string, room = 16): { layer: AlignLayerData; errors: ReadError[]; lines: number } {
  // `room` sizes the arrays: small, the join must copy the first part; large, it grows it in place.
  const target = new AlignColumnsTarget('f', { utterances: room, tokens: room });
  const reader = columnsReaderTo(target);
  reader.push(text);
  const { errors } = reader.end();
  return { layer: target.done(), errors, lines: target.lineCount };
}

/** Read `text` in pieces cut at `cuts` (sorted boundaries), each piece on its own, then join. */
function readInPieces(text: string, cuts: readonly number[], room = 16): { layer: AlignLayerData; errors: ReadError[] } {
  const parts: AlignLayerPart[] = [];
  const errors: ReadError[] = [];
  let lineOffset = 0;
  [0, ...cuts].forEach((start, i) => {
    const piece = read(text.slice(start, cuts[i] ?? text.length), room);
    parts.push({ layer: piece.layer, lineOffset });
    errors.push(...piece.errors.map((e) => ({ ...e, line: e.line + lineOffset })));
    lineOffset += piece.lines;
  });
  return { layer: alignLayersJoin('f', parts), errors };
}

/** The layer's typed arrays as plain arrays (what they hold, not how big a buffer they view). */
function typedAsArrays(layer: AlignLayerData): Record<string, number[]> {
  const { lines, tokenStart, ranges, tokenLines, tagCounts, tags, intents } = layer;
  return Object.fromEntries(Object.entries({ lines, tokenStart, ranges, tokenLines, tagCounts, tags, intents }).map(([k, a]) => [k, Array.from(a)]));
}

/** Some of the boundaries, chosen by the flags (cycled). */
function someOf(boundaries: readonly number[], flags: readonly boolean[]): number[] {
  return boundaries.filter((_, i) => flags.length > 0 && flags[i % flags.length] === true);
}

describe('a layer read in pieces and joined', () => {
  it('equals the layer read in one go, for any cut between utterances', () => {
    fc.assert(
      fc.property(cleanColumnsFileArb, fc.array(fc.boolean(), { maxLength: 9 }), fc.constantFrom(1, 16, 1024), (text, flags, room) => {
        const whole = read(text);
        expect(whole.errors).toEqual([]);
        const joined = readInPieces(text, someOf(textBoundaries(text), flags), room).layer;
        // Equal as values: a grown first part is a longer view of a bigger buffer.
        expect({ ...joined, ...typedAsArrays(joined) }).toEqual({ ...whole.layer, ...typedAsArrays(whole.layer) });
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('on files with faults too: the kept utterances join the same, and errors shifted by the lines before them fall on the same lines', () => {
    fc.assert(
      fc.property(columnsFileArb, fc.array(fc.boolean(), { maxLength: 9 }), (text, flags) => {
        const whole = read(text);
        const pieces = readInPieces(text, someOf(textBoundaries(text), flags));
        expect({ ...pieces.layer, ...typedAsArrays(pieces.layer) }).toEqual({ ...whole.layer, ...typedAsArrays(whole.layer) });
        expect(pieces.errors.map((e) => e.line)).toEqual(whole.errors.map((e) => e.line));
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('renumbers slots and intents in order of first sight across the pieces', () => {
    const text = '# intent = cancel\nfix\tB-day\n\n# intent = book_visit\ntap\tB-service\nx\tI-service\n\n# intent = cancel\ny\tI-day\n';
    const cuts = textBoundaries(text);
    expect(cuts).toHaveLength(2);
    const joined = readInPieces(text, cuts).layer;
    expect(joined.slotNames).toEqual(['day', 'service']);
    expect(joined.intentNames).toEqual(['cancel', 'book_visit']);
    expect(Array.from(joined.tags)).toEqual([1, 3, 4, 1]);
    expect(Array.from(joined.intents)).toEqual([0, 1, 0]);
    expect(Array.from(joined.lines)).toEqual([1, 4, 8]);
    expect(Array.from(joined.tokenLines)).toEqual([2, 5, 6, 9]);
  });
});
