import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AlignLayerGatherer, type AlignLayerData } from '../../../src/core/agreement';
import { AlignColumnsTarget } from '../../../src/core/agreement/align-columns';
import { columnsRead, columnsReaderTo } from '../../../src/core/formats';
import type { Document, Scheme } from '../../../src/core/types';
import { columnsFileArb } from './columns-files';

/** The layer as the command line made it before: Utterance objects through the gatherer. */
function gathered(text: string, scheme: Scheme | undefined): { layer: AlignLayerData; document: Document } {
  const document = columnsRead(text, scheme === undefined ? {} : { scheme });
  const gatherer = new AlignLayerGatherer('f');
  for (const utterance of document.utterances) gatherer.utteranceAdd(utterance);
  return { layer: gatherer.done(), document };
}

function direct(text: string, scheme: Scheme | undefined, chunk: number): { layer: AlignLayerData; document: Document; lines: number } {
  const target = new AlignColumnsTarget('f', { utterances: 2, tokens: 3 });
  const reader = columnsReaderTo(target, scheme === undefined ? {} : { scheme });
  for (let at = 0; at < text.length; at += chunk) reader.push(text.slice(at, at + chunk));
  const document = reader.end();
  return { layer: target.done(), document, lines: target.lineCount };
}

/** Lines as the reader counts them: each LF ends one, and text after the last LF is one more. */
function lineCount(text: string): number {
  const feeds = text.split('\n').length - 1;
  return text.endsWith('\n') || text.length === 0 ? feeds : feeds + 1;
}

describe('column reader straight into alignment data', () => {
  for (const scheme of [undefined, 'iob2', 'bioes'] as const) {
    it(`equals the gatherer over the reader's utterances, with the same errors and scheme (scheme ${scheme ?? 'detected'})`, () => {
      fc.assert(
        fc.property(columnsFileArb, fc.integer({ min: 1, max: 64 }), (text, chunk) => {
          const before = gathered(text, scheme);
          const now = direct(text, scheme, chunk);
          expect(now.document.errors).toEqual(before.document.errors);
          expect(now.document.scheme).toBe(before.document.scheme);
          expect(now.document.utterances).toEqual([]);
          expect(now.layer).toEqual(before.layer);
          expect(now.lines).toBe(lineCount(text.startsWith('\uFEFF') ? text.slice(1) : text));
        }),
        { seed: 42, numRuns: 400 },
      );
    });
  }

  it('reads UTF-8 bytes as it reads text', () => {
    fc.assert(
      fc.property(columnsFileArb, (text) => {
        const target = new AlignColumnsTarget('f');
        const reader = columnsReaderTo(target);
        reader.push(new TextEncoder().encode(text));
        expect(reader.end().errors).toEqual(gathered(text, undefined).document.errors);
        expect(target.done()).toEqual(gathered(text, undefined).layer);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('keeps nothing of an utterance with an error: its slot and intent never appear', () => {
    const target = new AlignColumnsTarget('f');
    const reader = columnsReaderTo(target, { scheme: 'iob2' });
    reader.push('# intent = cancel\nfix\tB-budget\ntap\tS-day\n\n# intent = book_visit\nfix\tB-service\n');
    expect(reader.end().errors.map((e) => e.line)).toEqual([3]);
    const layer = target.done();
    expect(layer.count).toBe(1);
    expect(layer.slotNames).toEqual(['service']);
    expect(layer.intentNames).toEqual(['book_visit']);
    expect(Array.from(layer.tags)).toEqual([1]);
    expect(Array.from(layer.tokenLines)).toEqual([6]);
  });
});
