/** CRF training on real Node worker threads (src/cli/crf-threads.ts) and through the bundled `train`: the same model with or without them. */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { crfThreadsChoose, crfWithHelpers, CRF_THREADS_FROM_TOKENS } from '../../src/cli/crf-threads';
import { columnsWrite } from '../../src/core/formats';
import { CRF_SHARDS, crfModelToJson, type CrfSequence, crfTrain } from '../../src/core/crf';
import { corpusGenerate } from '../../scripts/corpus/generate';
import { repoRoot } from './run-cli';

const corpus = corpusGenerate({ seed: 77, count: 700 }).truth;
const sequences: CrfSequence[] = corpus.map((u) => ({ words: u.tokens.map((t) => u.text.slice(t.start, t.end)), tags: u.tags }));

describe('crfThreadsChoose', () => {
  it('one fewer than the CPUs, at most CRF_SHARDS − 1, only for training sets worth a thread', () => {
    expect(crfThreadsChoose(undefined, 2, CRF_THREADS_FROM_TOKENS)).toBe(1);
    expect(crfThreadsChoose(undefined, 16, 1e6)).toBe(CRF_SHARDS - 1);
    expect(crfThreadsChoose(undefined, 1, 1e6)).toBe(0);
    expect(crfThreadsChoose(undefined, 8, CRF_THREADS_FROM_TOKENS - 1)).toBe(0);
  });

  it('SLOTSMITH_WORKERS decides when set (0 = none); nonsense means none', () => {
    expect(crfThreadsChoose('0', 8, 1e6)).toBe(0);
    expect(crfThreadsChoose('2', 1, 10)).toBe(2);
    expect(crfThreadsChoose('99', 2, 1e6)).toBe(CRF_SHARDS - 1);
    expect(crfThreadsChoose('two', 8, 1e6)).toBe(0);
  });
});

describe('crfTrain on Node worker threads', () => {
  it('one or three helper threads give the weights and model file of one thread, bit for bit', async () => {
    const options = { maxIterations: 20, seed: 6 };
    const alone = await crfTrain(sequences, options);
    for (const count of [1, 3]) {
      const { shared, answered } = await crfWithHelpers(
        count,
        async (helpers) => ({ shared: await crfTrain(sequences, { ...options, shardHelpers: helpers }), answered: helpers.map((h) => h.answered) }),
      );
      // Each thread answered every evaluation: the work really was shared.
      expect(answered).toEqual(Array.from({ length: count }, () => alone.training.evaluations));
      expect(Array.from(shared.weights)).toEqual(Array.from(alone.weights));
      expect(crfModelToJson(shared)).toBe(crfModelToJson(alone));
    }
  }, 120_000);

  it('a thread that cannot load its module leaves the work to this thread, same weights', async () => {
    const options = { maxIterations: 8 };
    const alone = await crfTrain(sequences, options);
    // A module that is not there: the worker fails to start, its requests fail, the shards are computed here.
    const { shared, answered } = await crfWithHelpers(
      1,
      async (helpers) => ({ shared: await crfTrain(sequences, { ...options, shardHelpers: helpers }), answered: helpers.map((h) => h.answered) }),
      new URL('./no-such-module.mjs', import.meta.url),
    );
    expect(answered).toEqual([0]);
    expect(Array.from(shared.weights)).toEqual(Array.from(alone.weights));
  }, 120_000);
});

describe('slotsmith train with helper threads', () => {
  it('writes the same model file with SLOTSMITH_WORKERS=0 and =1 (one thread, then two)', () => {
    const work = mkdtempSync(join(tmpdir(), 'slotsmith-crf-threads-'));
    const input = join(work, 'train.iob2');
    writeFileSync(input, columnsWrite(corpus.map((u) => ({ ...u, meta: {} }))));
    const tokens = sequences.reduce((n, s) => n + s.words.length, 0);
    expect(tokens).toBeGreaterThanOrEqual(CRF_THREADS_FROM_TOKENS);
    const files = ['0', '1'].map((workers, i) => {
      const out = join(work, `model-${workers}.json`);
      const run = spawnSync(process.execPath, [`${repoRoot}/bin/slotsmith.mjs`, 'train', input, '-o', out, '--iterations', '15'], {
        encoding: 'utf8',
        env: { ...process.env, SLOTSMITH_WORKERS: workers },
      });
      expect(run.stderr).toMatch(/trained on 700 utterance/);
      expect(run.stderr).toMatch(new RegExp(`on ${i + 1} thread\\(s\\)`));
      expect(run.status).toBe(0);
      return readFileSync(out, 'utf8');
    });
    expect(files[1]).toBe(files[0]);
  }, 120_000);
});
