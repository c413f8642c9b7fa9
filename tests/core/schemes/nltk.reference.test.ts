import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { spansFromTags } from '../../../src/core/schemes';
import { iobTagSequenceArb } from './arbitraries';

// Outside reference: NLTK's `nltk.chunk.util.conlltags2tree` (Debian python3-nltk), which reads a
// stray I-X as the start of a new chunk, the CoNLL-2000 evaluation convention spansFromTags follows.
const PYTHON = '/usr/bin/python3';
const SCRIPT = fileURLToPath(new URL('../../reference/nltk_conll_spans.py', import.meta.url));
const INSTALL_HINT = 'install Debian python3-nltk (apt-get install python3-nltk; `npm test` installs it)';

function nltkSpans(sequences: readonly string[][]): [number, number, string][][] {
  if (!existsSync(PYTHON)) throw new Error(`${PYTHON} is missing: ${INSTALL_HINT}`);
  const run = spawnSync(PYTHON, [SCRIPT], { input: JSON.stringify(sequences), encoding: 'utf8', maxBuffer: 64 << 20 });
  if (run.error !== undefined) throw new Error(`${PYTHON} could not run (${run.error.message}): ${INSTALL_HINT}`);
  if (run.status !== 0) {
    const hint = /No module named .?nltk/.test(run.stderr) ? INSTALL_HINT : 'see the error above';
    throw new Error(`nltk_conll_spans.py failed (exit ${String(run.status)}):\n${run.stderr}\n${hint}`);
  }
  return JSON.parse(run.stdout) as [number, number, string][][];
}

describe('spansFromTags against NLTK conlltags2tree', () => {
  it('decodes the same spans on seeded random IOB2 sequences, legal and illegal', () => {
    const sequences = [
      [],
      ['O'],
      ['I-day'],
      ['B-day', 'I-area', 'I-area'],
      ...fc.sample(iobTagSequenceArb, { seed: 42, numRuns: 400 }),
    ];
    const expected = nltkSpans(sequences);
    expect(expected).toHaveLength(sequences.length);
    let stray = 0;
    sequences.forEach((tags, i) => {
      const ours = spansFromTags(tags).map(({ start, end, slot }) => [start, end, slot]);
      expect(ours, JSON.stringify(tags)).toEqual(expected[i]);
      if (tags.some((t, j) => t.startsWith('I-') && (j === 0 || tags[j - 1] === 'O'))) stray++;
    });
    // The batch must exercise the lenient reading, not only legal sequences.
    expect(stray).toBeGreaterThan(50);
  });
});
