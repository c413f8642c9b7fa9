import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { linesEncode } from '../../../src/core/exchange/lines';
import { layersRead } from '../../../src/core/exchange/layers';
import { packRead } from '../../../src/core/exchange/pack';
import { lineEdit, packText, PROJECT, SETUP, UTTERANCES } from './fixtures';

async function refusal(text: string) {
  const read = await packRead(text);
  if (read.ok) throw new Error('expected a refusal');
  return read.errors;
}

describe('pack files', () => {
  it('round-trip: what is written is read back exactly, as the same bytes', async () => {
    const text = await packText();
    const read = await packRead(text);
    expect(read.ok).toBe(true);
    if (!read.ok) return;
    expect(read.warnings).toEqual([]);
    expect(read.file.utterances).toEqual(UTTERANCES);
    expect(read.file.header).toMatchObject({ format: 'slotsmith-pack', version: 1, project: PROJECT, annotator: { id: 'ana', name: 'Ana' }, setup: SETUP, suggestionsFrom: 'model', count: 3 });
    expect(read.file.header.bodySha256).toMatch(/^[0-9a-f]{64}$/);
    expect(await packText()).toBe(text);
    // A header line, then one record per line, each ending in its check.
    expect(text.split('\n').filter((l) => l !== '')).toHaveLength(4);
    expect(text.split('\n')[1]).toMatch(/,"check":"[0-9a-f]{16}"\}$/);
  });

  it('reads a file whose line endings became CRLF', async () => {
    const read = await packRead((await packText()).replace(/\n/g, '\r\n'));
    expect(read.ok).toBe(true);
  });

  it('refuses an edited line with its number', async () => {
    const text = lineEdit(await packText(), 3, (l) => l.replace('cancel the visit', 'cancel the trip!'));
    expect(await refusal(text)).toEqual([{ line: 3, message: 'this line was changed after the file was written (its check does not match)' }]);
  });

  it('refuses an edited header, a cut line and a line without its check', async () => {
    expect(await refusal(lineEdit(await packText(), 1, (l) => l.replace('"Ana"', '"Anna"')))).toEqual([
      { line: 1, message: 'the header was changed after the file was written (its check does not match)' },
    ]);
    const cut = await refusal(lineEdit(await packText(), 2, (l) => l.slice(0, 40)));
    expect(cut[0]?.line).toBe(2);
    expect(cut[0]?.message).toMatch(/no check at its end/);
  });

  it('refuses removed, added or reordered lines through the count and the SHA-256 of the body', async () => {
    const lines = (await packText()).split('\n');
    const removed = [lines[0], lines[1], lines[3], ''].join('\n');
    expect((await refusal(removed))[0]?.message).toMatch(/lists 3 records, the file holds 2/);
    const swapped = [lines[0], lines[2], lines[1], lines[3], ''].join('\n');
    expect(await refusal(swapped)).toEqual([{ line: 1, message: expect.stringMatching(/SHA-256 checksum does not match/) as unknown as string }]);
    const blank = [lines[0], lines[1], '', lines[2], lines[3], ''].join('\n');
    expect((await refusal(blank))[0]).toEqual({ line: 3, message: expect.stringMatching(/empty line/) as unknown as string });
  });

  it('refuses other files: not JSON, another format, a layer file, a newer version', async () => {
    expect(await refusal('hello\nworld')).toEqual([{ line: 1, message: 'not a Slotsmith pack: the first line must be a "slotsmith-pack" header' }]);
    expect(await refusal('')).toEqual([{ line: 1, message: 'not a Slotsmith pack: the first line must be a "slotsmith-pack" header' }]);
    expect((await refusal('{"format":"slotsmith-backup","formatVersion":1}'))[0]?.message).toMatch(/names the format "slotsmith-backup"/);
    const newer = await linesEncode({ format: 'slotsmith-pack', version: 2 }, []);
    expect((await refusal(newer))[0]).toEqual({ line: 1, message: expect.stringMatching(/newer Slotsmith \(format version 2\); this version reads up to 1/) as unknown as string });
    // A pack given where a layer file is expected, and the other way round.
    const asLayers = await layersRead(await packText());
    expect(asLayers.ok ? null : asLayers.errors).toEqual([{ line: 1, message: 'this is a Slotsmith pack, not a Slotsmith layer file' }]);
  });

  it('refuses signed records with missing or wrong fields, naming the line', async () => {
    const header = { format: 'slotsmith-pack', version: 1, created: 'x', project: PROJECT, annotator: { id: 'ana', name: 'Ana' }, setup: SETUP };
    const text = await linesEncode(header, [
      { type: 'utterance', seq: 1, text: 'book a plumber', tokens: [0, 4, 5, 6, 7, 14], meta: {} },
      { type: 'utterance', text: 'no seq here', tokens: [0, 2], meta: {} },
      { type: 'utterance', seq: 3, text: 'bad tokens', tokens: [0, 40], meta: {} },
      { type: 'utterance', seq: 4, text: 'two tokens', tokens: [0, 3, 4, 10], meta: {}, suggestion: { tags: ['O'], intent: null } },
      { type: 'layer', seq: 5 },
      { type: 'utterance', seq: 1, text: 'again', tokens: [0, 5], meta: {} },
    ]);
    const errors = await refusal(text);
    expect(errors.map((e) => e.line)).toEqual([3, 4, 5, 6, 7]);
    expect(errors[0]?.message).toMatch(/"seq" must be a whole number/);
    expect(errors[1]?.message).toMatch(/token 1 \[0, 40\) is not inside the text/);
    expect(errors[2]?.message).toMatch(/1 tags for 2 tokens/);
    expect(errors[3]?.message).toMatch(/unknown record type "layer"/);
    expect(errors[4]?.message).toMatch(/seq 1 appears twice/);
  });

  it('refuses a header without a valid project fingerprint or annotator', async () => {
    const text = await linesEncode({ format: 'slotsmith-pack', version: 1, created: 'x', project: { uid: 'nope', name: 'x' }, annotator: { id: 'model' }, setup: SETUP }, []);
    const errors = await refusal(text);
    expect(errors.map((e) => e.message)).toEqual([expect.stringMatching(/"uid" must be 32 hex digits/), expect.stringMatching(/"model" cannot own a layer/)]);
    expect(errors.every((e) => e.line === 1)).toBe(true);
  });
});

describe('readers never throw', () => {
  it('answer every damaged file with line-numbered problems (property)', async () => {
    const packed = await packText();
    const lines = packed.split('\n');
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 0, max: lines.length - 1 }),
        fc.integer({ min: 0, max: 400 }),
        fc.integer({ min: 0, max: 20 }),
        fc.string({ maxLength: 4 }),
        async (lineIndex, at, cut, insert) => {
          const copy = [...lines];
          const line = copy[lineIndex] as string;
          const from = Math.min(at, line.length);
          copy[lineIndex] = line.slice(0, from) + insert + line.slice(from + cut);
          const text = copy.join('\n');
          const pack = await packRead(text);
          const layers = await layersRead(text);
          expect(layers.ok).toBe(false);
          if (text === packed) expect(pack.ok).toBe(true);
          else if (!pack.ok) expect(pack.errors.every((e) => Number.isSafeInteger(e.line) && e.line >= 1 && e.message !== '')).toBe(true);
        },
      ),
      { seed: 42, numRuns: 300 },
    );
  });
});
