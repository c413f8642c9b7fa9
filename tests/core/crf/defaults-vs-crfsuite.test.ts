/**
 * Outside reference: CRFsuite (Okazaki 2007) through its Node binding (npm `crfsuite`, a dev
 * dependency), as in tests/reference/crf-crfsuite.test.ts, but with our tagger at its shipped
 * defaults (CRF_DEFAULTS: at most 50 iterations, 20 L-BFGS correction pairs) against CRFsuite at
 * its own L-BFGS defaults (6 correction pairs, ε = δ = 1e-5 over 10 iterations) and 100 iterations
 * at most: the shorter default run must lose nothing that matters against a fully converged one.
 * Same attribute strings (attributesOfWords), same seeded 80/20 split, same c2 = 1, all label-pair
 * transition features on both sides.
 */
import { mkdtempSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { documentLoad } from '../../../src/cli/load';
import { attributesOfWords, CRF_DEFAULTS, crfSequenceFromUtterance, crfTagger, crfTrain, foldsAssign, spansEvaluate } from '../../../src/core/crf';

interface CrfsuiteBinding {
  Trainer: new (options?: { debug?: boolean }) => {
    append(xseq: string[][], yseq: string[]): void;
    set_params(params: Record<string, string | number>): void;
    train(path: string): number;
  };
  Tagger: new () => { open(path: string): boolean; tag(xseq: string[][]): string[] };
}

const crfsuite = createRequire(import.meta.url)('crfsuite') as CrfsuiteBinding;
const repo = new URL('../../..', import.meta.url).pathname;

describe('CRF tagger at its defaults against CRFsuite run to convergence', () => {
  it('span F1 within 1 point and tags agree on 99% of tokens', async () => {
    const loaded = documentLoad(`${repo}sample-corpus/truth.iob2`, {});
    if (!loaded.ok) throw new Error(loaded.message);
    const sequences = loaded.document.utterances.map(crfSequenceFromUtterance);
    // A split other than the reference test's, so the two tests do not share their one sample.
    const fold = foldsAssign(sequences.length, 5, 8128);
    const train = sequences.filter((_, i) => fold[i] !== 0);
    const test = sequences.filter((_, i) => fold[i] === 0);
    const gold = test.map((s) => s.tags);

    const trainer = new crfsuite.Trainer();
    for (const s of train) trainer.append(attributesOfWords(s.words), [...s.tags]);
    trainer.set_params({ c2: 1, max_iterations: 100, num_memories: 6, epsilon: 1e-5, delta: 1e-5, period: 10, 'feature.possible_transitions': 1 });
    const modelPath = join(mkdtempSync(join(tmpdir(), 'slotsmith-crfsuite-')), 'reference.crfsuite');
    expect(trainer.train(modelPath)).toBe(0);
    const tagger = new crfsuite.Tagger();
    expect(tagger.open(modelPath)).toBe(true);
    const theirTags = test.map((s) => tagger.tag(attributesOfWords(s.words)));
    const theirs = spansEvaluate(gold, theirTags);

    const model = await crfTrain(train);
    expect(model.training.maxIterations).toBe(CRF_DEFAULTS.maxIterations);
    const ours = crfTagger(model);
    const myTags = test.map((s) => ours.tags(s.words));
    const mine = spansEvaluate(gold, myTags);
    let same = 0;
    let tokens = 0;
    myTags.forEach((tags, u) => tags.forEach((tag, t) => ((tokens += 1), (same += tag === theirTags[u]?.[t] ? 1 : 0))));

    console.log(
      `defaults (${model.training.iterations} iterations, stopped: ${model.training.stopped}): span F1 on ${test.length} utterances ours ${(100 * mine.overall.f1).toFixed(2)}, ` +
        `CRFsuite ${(100 * theirs.overall.f1).toFixed(2)}; same tag on ${same} of ${tokens} tokens`,
    );
    expect(theirs.overall.f1).toBeGreaterThan(0.8);
    expect(Math.abs(mine.overall.f1 - theirs.overall.f1)).toBeLessThanOrEqual(0.01);
    expect(same / tokens).toBeGreaterThanOrEqual(0.99);
  }, 300_000);
});
