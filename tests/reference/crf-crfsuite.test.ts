/**
 * Outside reference: CRFsuite (Okazaki 2007), the C library, through its Node binding (npm package
 * `crfsuite` 1.0.1, a dev dependency built from source). Both sides get the same attribute strings
 * for every token (attributesOfWords), the same seeded 80/20 split of the sample corpus, the same
 * L2 weight (c2 = 1, same c2·‖w‖² form) and the same stopping rules (CRFsuite's L-BFGS defaults:
 * ε = 1e-5, δ = 1e-5 over 10 iterations; 100 iterations at most). The L-BFGS memory differs: ours
 * keeps 20 correction pairs (CRF_DEFAULTS.memory), CRFsuite its default 6 — the path to the optimum
 * differs, the optimum does not, and the tags still agree on every test token. CRFsuite is told to generate all
 * label-pair transition features, as our model has. The objective is strictly convex, so both
 * should reach nearly the same optimum and the same span F1 (exact match, CoNLL-2000 reading).
 */
import { mkdtempSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { documentLoad } from '../../src/cli/load';
import { attributesOfWords, crfSequenceFromUtterance, crfTagger, crfTrain, foldsAssign, spansEvaluate } from '../../src/core/crf';

interface CrfsuiteBinding {
  Trainer: new (options?: { debug?: boolean }) => {
    append(xseq: string[][], yseq: string[]): void;
    set_params(params: Record<string, string | number>): void;
    train(path: string): number;
  };
  Tagger: new () => { open(path: string): boolean; tag(xseq: string[][]): string[] };
}

const crfsuite = createRequire(import.meta.url)('crfsuite') as CrfsuiteBinding;
const repo = new URL('../..', import.meta.url).pathname;

describe('CRF tagger against CRFsuite', () => {
  it('span F1 on a seeded sample-corpus split is within 1 point of CRFsuite’s', async () => {
    const loaded = documentLoad(`${repo}sample-corpus/truth.iob2`, {});
    if (!loaded.ok) throw new Error(loaded.message);
    const sequences = loaded.document.utterances.map(crfSequenceFromUtterance);
    const fold = foldsAssign(sequences.length, 5, 20417);
    const train = sequences.filter((_, i) => fold[i] !== 0);
    const test = sequences.filter((_, i) => fold[i] === 0);
    const gold = test.map((s) => s.tags);

    const trainer = new crfsuite.Trainer();
    for (const s of train) trainer.append(attributesOfWords(s.words), [...s.tags]);
    trainer.set_params({ c2: 1, max_iterations: 100, epsilon: 1e-5, delta: 1e-5, period: 10, 'feature.possible_transitions': 1 });
    const modelPath = join(mkdtempSync(join(tmpdir(), 'slotsmith-crfsuite-')), 'reference.crfsuite');
    expect(trainer.train(modelPath)).toBe(0);
    const tagger = new crfsuite.Tagger();
    expect(tagger.open(modelPath)).toBe(true);
    const theirTags = test.map((s) => tagger.tag(attributesOfWords(s.words)));
    const theirs = spansEvaluate(gold, theirTags);

    const model = await crfTrain(train, { c2: 1, maxIterations: 100 });
    const ours = crfTagger(model);
    const myTags = test.map((s) => ours.tags(s.words));
    const mine = spansEvaluate(gold, myTags);
    // Near the same optimum the two taggers should also agree token by token, not just score alike.
    let same = 0;
    let tokens = 0;
    myTags.forEach((tags, u) => tags.forEach((tag, t) => ((tokens += 1), (same += tag === theirTags[u]?.[t] ? 1 : 0))));

    console.log(
      `span F1 (micro) on ${test.length} utterances: ours ${(100 * mine.overall.f1).toFixed(2)}, CRFsuite ${(100 * theirs.overall.f1).toFixed(2)}; ` +
        `same tag on ${same} of ${tokens} tokens`,
    );
    expect(theirs.overall.f1).toBeGreaterThan(0.8);
    expect(Math.abs(mine.overall.f1 - theirs.overall.f1)).toBeLessThanOrEqual(0.01);
    expect(same / tokens).toBeGreaterThanOrEqual(0.99);
  }, 300_000);
});
