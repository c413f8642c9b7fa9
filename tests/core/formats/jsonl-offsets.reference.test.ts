import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { jsonlWrite } from '../../../src/core/formats';
import { spansFromTags } from '../../../src/core/schemes';
import type { Utterance } from '../../../src/core/types';
import { corpusArbitrary } from '../../generators/formats';

const PYTHON = '/usr/bin/python3';

interface Record {
  text: string;
  tokens: { start: number; end: number }[];
  spans: { start: number; end: number; label: string }[];
}

/** What each written token and span should read as: the in-memory (UTF-16) slices. */
function expectedSlices(u: Utterance): { tokens: string[]; spans: string[] } {
  const tokens = u.tokens.map((t) => u.text.slice(t.start, t.end));
  const spans = spansFromTags(u.tags).map((s) => u.text.slice(u.tokens[s.start]?.start, u.tokens[s.end - 1]?.end));
  return { tokens, spans };
}

describe('JSON Lines offsets are code points', () => {
  it('match [...text] indices (what Python slicing sees) for every token and span', () => {
    fc.assert(
      fc.property(corpusArbitrary('iob2'), (utterances) => {
        const records = jsonlWrite(utterances).trimEnd().split('\n').map((l) => JSON.parse(l) as Record);
        records.forEach((record, i) => {
          const codePoints = [...record.text];
          const slice = (r: { start: number; end: number }) => codePoints.slice(r.start, r.end).join('');
          const expected = expectedSlices(utterances[i] as Utterance);
          expect(record.tokens.map(slice)).toEqual(expected.tokens);
          expect(record.spans.map(slice)).toEqual(expected.spans);
        });
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('match /usr/bin/python3 slicing a written file', () => {
    if (!existsSync(PYTHON)) throw new Error(`${PYTHON} is missing: apt-get install python3 (npm test installs it)`);
    const utterances = fc.sample(corpusArbitrary('bioes', 8), { seed: 42, numRuns: 40 }).flat();
    const dir = mkdtempSync(join(tmpdir(), 'slotsmith-jsonl-'));
    try {
      const file = join(dir, 'corpus.jsonl');
      writeFileSync(file, jsonlWrite(utterances));
      // Python str slicing indexes code points (Python language reference, from memory).
      const script = [
        'import json, sys',
        'for line in open(sys.argv[1], encoding="utf-8"):',
        '    r = json.loads(line)',
        '    t = r["text"]',
        '    print(json.dumps({"tokens": [t[x["start"]:x["end"]] for x in r["tokens"]], "spans": [t[x["start"]:x["end"]] for x in r["spans"]]}))',
      ].join('\n');
      const run = spawnSync(PYTHON, ['-c', script, file], { encoding: 'utf8' });
      expect(run.stderr).toBe('');
      expect(run.status).toBe(0);
      const fromPython = run.stdout.trimEnd().split('\n').map((l) => JSON.parse(l) as unknown);
      expect(fromPython).toEqual(utterances.map(expectedSlices));
      // Not vacuous: the sample holds characters outside the BMP, where code points and UTF-16 differ.
      expect(utterances.some((u) => [...u.text].length !== u.text.length)).toBe(true);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
