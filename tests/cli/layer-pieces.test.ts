import { closeSync, mkdtempSync, openSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { agreeJobAssemble, agreeJobRun, agreeJobsPlan, agreeTailsTake, agreeWordPack, agreeWordsCreate, type AgreeJob } from '../../src/cli/commands/agree-jobs';
import { layerLoad } from '../../src/cli/layer-load';
import { boundaryFind, pieceRead } from '../../src/cli/layer-pieces';
import { repoRoot } from './run-cli';

const work = mkdtempSync(join(tmpdir(), 'slotsmith-pieces-'));
let fileCount = 0;

function fileWith(bytes: Uint8Array | string): string {
  const path = join(work, `f${String(fileCount++)}.iob2`);
  writeFileSync(path, bytes);
  return path;
}

/** The first piece start at or after `from`, by the rule spelled out plainly: after LF LF or LF CR LF, before the end, not before 0xEF. */
function boundaryByRule(bytes: Uint8Array, from: number): number {
  for (let i = from; i < bytes.length; i++) {
    if (bytes[i] !== 10) continue;
    let after = -1;
    if (bytes[i + 1] === 10) after = i + 2;
    else if (bytes[i + 1] === 13 && bytes[i + 2] === 10) after = i + 3;
    if (after > 0 && after < bytes.length && bytes[after] !== 0xef) return after;
  }
  return bytes.length;
}

/**
 * The sample corpus annotators' files, `copies` times over with distinct ids: big enough for the
 * main thread to take a tail (it leaves tails under 2 MiB alone).
 */
function bigPair(copies: number, change?: (text: string) => string): [string, string] {
  return (['ann-a.iob2', 'ann-b.iob2'] as const).map((name, i) => {
    const one = readFileSync(`${repoRoot}/sample-corpus/${name}`, 'utf8');
    const text = Array.from({ length: copies }, (_, c) => `${one.replace(/^# id = (.*)$/gmu, `# id = $1-${String(c)}`).trimEnd()}\n\n`).join('');
    return fileWith(i === 1 && change !== undefined ? change(text) : text);
  }) as [string, string];
}

describe('boundaryFind', () => {
  it('finds what the rule says, also across its 64 KiB read windows', () => {
    const piece = fc.constantFrom('a', 'b\tO', '\n', '\n', '\r', '\r\n', '\n\n', '\n\r\n', '\u00ef', '\uFEFF', '\uF8FF');
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 40 }), fc.nat(70), fc.nat(20), (parts, shift, from) => {
        // Padding puts the interesting bytes near the first window's end (65536).
        const tail = new TextEncoder().encode(parts.join(''));
        const bytes = new Uint8Array(65536 - shift + tail.length);
        bytes.fill(97, 0, 65536 - shift);
        bytes.set(tail, 65536 - shift);
        const path = fileWith(bytes);
        const fd = openSync(path, 'r');
        try {
          for (const start of [from, 65536 - shift - 3 + (from % 8), 65536 - 4]) {
            if (start > bytes.length) continue;
            expect(boundaryFind(fd, start, bytes.length)).toBe(boundaryByRule(bytes, start));
          }
        } finally {
          closeSync(fd);
        }
      }),
      { seed: 42, numRuns: 150 },
    );
  });
});

describe('a helper file whose tail the main thread takes', () => {
  it('joins into the layer of a one-thread read', () => {
    const [, file] = bigPair(10);
    const size = readFileSync(file).length;
    const jobs = agreeJobsPlan([file], [size], {});
    expect(jobs[0]?.kind).toBe('columns');
    const words = agreeWordsCreate(jobs);
    // The helper has not started: the tail is the second half, cut between utterances.
    const tails = agreeTailsTake(jobs, [0], words);
    expect(tails).toHaveLength(1);
    const start = tails[0]?.start ?? 0;
    expect(start).toBeGreaterThan(size / 2 - 1);
    expect(readFileSync(file).subarray(start - 2, start).toString()).toBe('\n\n');
    expect(words[0]).toBe(agreeWordPack(0, start));
    // The helper then reads up to the cut and no further.
    const result = agreeJobRun(jobs[0] as AgreeJob, words);
    expect(result.kind === 'columns' && result.read?.end).toBe(start);
    expect(result.kind === 'columns' && result.read?.errors).toEqual([]);
    expect(tails[0]?.read?.errors).toEqual([]);
    const joined = agreeJobAssemble(jobs[0] as AgreeJob, result, tails, {});
    const whole = layerLoad(file, {}, size);
    expect(whole.ok && whole.errors).toEqual([]);
    expect(whole.ok && whole.layer.count).toBe(12000);
    expect(joined).toEqual(whole);
  });

  it('takes tail after tail from a helper that has not got far, and they join into the one-thread layer', () => {
    const [file] = bigPair(30);
    const size = readFileSync(file).length;
    const jobs = agreeJobsPlan([file], [size], {});
    const words = agreeWordsCreate(jobs);
    // The helper has claimed its first chunk only.
    words[0] = agreeWordPack(1 << 20, size);
    const tails = agreeTailsTake(jobs, [0], words);
    expect(tails.length).toBeGreaterThan(1);
    // Each tail halves what was left: later ones start earlier, and each ends where the one before starts.
    tails.forEach((tail, i) => {
      expect(tail.read?.errors).toEqual([]);
      expect(tail.read?.end).toBe(i === 0 ? size : tails[i - 1]?.start);
    });
    words[0] = agreeWordPack(0, tails[tails.length - 1]?.start ?? 0);
    const result = agreeJobRun(jobs[0] as AgreeJob, words);
    const whole = layerLoad(file, {}, size);
    expect(whole.ok && whole.errors).toEqual([]);
    expect(agreeJobAssemble(jobs[0] as AgreeJob, result, tails, {})).toEqual(whole);
  });

  it('takes nothing from a helper that has claimed all but a small rest', () => {
    const [file] = bigPair(10);
    const size = readFileSync(file).length;
    const jobs = agreeJobsPlan([file], [size], {});
    const words = agreeWordsCreate(jobs);
    words[0] = agreeWordPack(size - (1 << 20), size);
    expect(agreeTailsTake(jobs, [0], words)).toEqual([]);
    expect(words[0]).toBe(agreeWordPack(size - (1 << 20), size));
  });

  it('reports a file with errors in any part exactly as a one-thread read does', () => {
    // An odd tag near the end (in the tail) and a missing tag column near the start (helper's part).
    const [, file] = bigPair(10, (text) => {
      const late = text.lastIndexOf('\tO\n');
      const early = text.indexOf('\tO\n');
      return `${text.slice(0, early)}\n${text.slice(early + 3, late)}\tQ-day\n${text.slice(late + 3)}`;
    });
    const size = readFileSync(file).length;
    const jobs = agreeJobsPlan([file], [size], {});
    const words = agreeWordsCreate(jobs);
    const tails = agreeTailsTake(jobs, [0], words);
    const result = agreeJobRun(jobs[0] as AgreeJob, words);
    const whole = layerLoad(file, {}, size);
    expect(whole.ok && whole.errors.length).toBe(2);
    expect(agreeJobAssemble(jobs[0] as AgreeJob, result, tails, {})).toEqual(whole);
  });

  it('leaves other formats whole', () => {
    const file = `${repoRoot}/sample-corpus/ann-a.jsonl`;
    const size = readFileSync(file).length;
    const jobs = agreeJobsPlan([file], [size], {});
    expect(jobs[0]?.kind).toBe('whole');
    const words = agreeWordsCreate(jobs);
    expect(agreeTailsTake(jobs, [0], words)).toEqual([]);
    expect(agreeJobAssemble(jobs[0] as AgreeJob, agreeJobRun(jobs[0] as AgreeJob, words), [], {})).toEqual(layerLoad(file, {}, size));
  });
});

describe('pieceRead', () => {
  it('reads from a boundary to the end as the whole file reads that part', () => {
    const [file] = bigPair(1);
    const bytes = readFileSync(file);
    const fd = openSync(file, 'r');
    const cut = boundaryFind(fd, bytes.length >> 1, bytes.length);
    closeSync(fd);
    const piece = pieceRead(file, cut, undefined, bytes.length - cut, (position) => Math.min(position + 4096, bytes.length));
    const alone = layerLoad(fileWith(bytes.subarray(cut)), {});
    expect(piece.end).toBe(bytes.length);
    expect(alone.ok && { ...alone.layer, name: file }).toEqual(piece.layer);
  });
});
