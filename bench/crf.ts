/**
 * The CRF part of `npm run bench` (BENCH_ONLY=crf): training on 5k seeded corpus utterances
 * (target ≤ 15 s, checked on two threads, the main one and one helper, as `train` and the Model
 * screen's worker run it on two cores; the one-thread figure beside it, and a check that both give
 * the same weights bit for bit), tagging 100k (target ≤ 5 s), and our training time against CRFsuite's native
 * training (npm `crfsuite`, the C library) on the same utterances, the same attribute strings, the
 * same c2, L-BFGS memory and stopping rules (target ≤ 3×). Figures are printed, never asserted,
 * each with the 1-minute load average beside it, since the machine is shared.
 */
import { mkdirSync } from 'node:fs';
import { loadavg } from 'node:os';
import { createRequire } from 'node:module';
import { crfWithHelpers } from '../src/cli/crf-threads';
import { attributesOfWords, CRF_DEFAULTS, type CrfModel, crfSequenceFromUtterance, crfTagger, crfTrain, type CrfSequence } from '../src/core/crf';
import { corpusGenerate } from '../scripts/corpus/generate';

interface CrfsuiteBinding {
  Trainer: new (options?: { debug?: boolean }) => {
    append(xseq: string[][], yseq: string[]): void;
    set_params(params: Record<string, string | number>): void;
    train(path: string): number;
  };
}

export interface CrfBenchOptions {
  out: string;
  seed: number;
  /** Default 5000. */
  trainCount?: number;
  /** Default 100000. */
  tagCount?: number;
  /** Default CRF_DEFAULTS.maxIterations, with CRFsuite's stopping rules (ε = δ = 1e-5, period 10) and CRF_DEFAULTS.memory on both sides. */
  maxIterations?: number;
}

const seconds = (ms: number) => (ms / 1000).toFixed(2).padStart(7);

/** Wall and CPU time of `run` (CPU time is what the process's threads used: far steadier than wall time on a busy machine). */
async function timed<T>(run: () => T | Promise<T>): Promise<{ value: T; wallMs: number; cpuMs: number; load: number }> {
  const cpu = process.cpuUsage();
  const started = performance.now();
  const value = await run();
  const wallMs = performance.now() - started;
  const used = process.cpuUsage(cpu);
  return { value, wallMs, cpuMs: (used.user + used.system) / 1000, load: loadavg()[0] ?? Number.NaN };
}

const both = (t: { wallMs: number; cpuMs: number; load: number }) => `${seconds(t.wallMs)} s wall, ${seconds(t.cpuMs)} s CPU (load ${t.load.toFixed(1)})`;
const verdict = (ok: boolean) => (ok ? 'met' : 'NOT met');

function weightsIdentical(a: CrfModel, b: CrfModel): boolean {
  return a.weights.length === b.weights.length && a.weights.every((w, i) => Object.is(w, b.weights[i]));
}

function sequencesMake(seed: number, count: number): CrfSequence[] {
  return corpusGenerate({ seed, count }).truth.map(crfSequenceFromUtterance);
}

export async function crfBench(options: CrfBenchOptions): Promise<void> {
  const trainCount = options.trainCount ?? 5000;
  const tagCount = options.tagCount ?? 100_000;
  const maxIterations = options.maxIterations ?? CRF_DEFAULTS.maxIterations;
  const memory = CRF_DEFAULTS.memory;
  mkdirSync(options.out, { recursive: true });
  const training = sequencesMake(options.seed, trainCount);
  const tokens = training.reduce((n, s) => n + s.words.length, 0);
  console.log(`\n== CRF tagger: ${trainCount} training utterances (${tokens} tokens), c2 = 1, at most ${maxIterations} iterations, L-BFGS memory ${memory}`);

  const single = await timed(() => crfTrain(training, { c2: 1, maxIterations, memory }));
  // The helper thread's start (~50 ms) is inside the timing, as it is for `train` and the Model screen.
  const trained = await timed(() =>
    crfWithHelpers(1, async (helpers) => ({
      model: await crfTrain(training, { c2: 1, maxIterations, memory, shardHelpers: helpers }),
      answered: helpers[0]?.answered ?? 0,
    })),
  );
  const model = trained.value.model;
  const t = model.training;
  const perEvaluation = (m: { cpuMs: number; wallMs: number }) => `${(m.wallMs / t.evaluations).toFixed(1)} ms wall, ${(m.cpuMs / t.evaluations).toFixed(1)} ms CPU`;
  console.log(
    `  ours, 2 threads: ${both(trained)}, ${t.iterations} iterations, ${t.evaluations} evaluations (${perEvaluation(trained)} each), ` +
      `${model.featureLabels.length} state features, stopped: ${t.stopped}  (target ≤ 15 s: ${verdict(trained.wallMs <= 15_000)} by wall time)`,
  );
  console.log(`  ours, 1 thread:  ${both(single)}, ${single.value.training.evaluations} evaluations (${perEvaluation(single)} each)`);
  if (trained.value.answered !== t.evaluations) {
    console.log(`  the helper thread answered ${trained.value.answered} of ${t.evaluations} evaluations: the "2 threads" figure is NOT a two-thread run`);
    process.exitCode = 1;
  }
  const same = weightsIdentical(single.value, model);
  console.log(`  1 thread and 2 threads give bit-identical weights: ${same ? 'yes' : 'NO'}`);
  if (!same) process.exitCode = 1;

  let crfsuite: CrfsuiteBinding | null = null;
  try {
    crfsuite = createRequire(import.meta.url)('crfsuite') as CrfsuiteBinding;
  } catch (error) {
    console.log(`  CRFsuite: not available (${(error as Error).message.split('\n')[0]}); no ratio`);
  }
  if (crfsuite !== null) {
    const trainer = new crfsuite.Trainer();
    const appended = await timed(() => {
      for (const s of training) trainer.append(attributesOfWords(s.words), [...s.tags]);
    });
    trainer.set_params({ c2: 1, max_iterations: maxIterations, num_memories: memory, epsilon: 1e-5, delta: 1e-5, period: 10, 'feature.possible_transitions': 1 });
    const native = await timed(() => trainer.train(`${options.out}/crf-bench.crfsuite`));
    console.log(`  CRFsuite: ${both(native)} in train() (native), plus ${seconds(appended.wallMs)} s handing it the attribute strings`);
    // CRFsuite trains on one thread, so the like-for-like ratio is our one-thread run's.
    const ratio = (ours: { wallMs: number; cpuMs: number }) => `${(ours.wallMs / native.wallMs).toFixed(2)}× wall, ${(ours.cpuMs / native.cpuMs).toFixed(2)}× CPU`;
    const cpuRatio = single.cpuMs / native.cpuMs;
    console.log(`  ratio ours (1 thread) / CRFsuite native training: ${ratio(single)}  (target ≤ 3×: ${verdict(cpuRatio <= 3)} by CPU time)`);
    console.log(`  ratio ours (2 threads) / CRFsuite native training: ${ratio(trained)}`);
  }

  const tagging = sequencesMake(options.seed + 1, tagCount);
  const tagTokens = tagging.reduce((n, s) => n + s.words.length, 0);
  const tagger = crfTagger(model);
  // First pass also fills the tagger's per-word attribute cache; the second shows the steady rate.
  const first = await timed(() => {
    for (const s of tagging) tagger.tags(s.words);
  });
  const again = await timed(() => {
    for (const s of tagging) tagger.tags(s.words);
  });
  const confident = await timed(() => {
    let uncertain = 0;
    for (const s of tagging) if (tagger.tag(s.words).leastConfidence > 0.5) uncertain++;
    return uncertain;
  });
  console.log(`  tagging ${tagCount} utterances (${tagTokens} tokens), tags only: ${both(first)}  (target ≤ 5 s: ${verdict(first.wallMs <= 5000)} by wall time, ${verdict(first.cpuMs <= 5000)} by CPU time)`);
  console.log(`  the same again (word cache warm): ${both(again)}`);
  console.log(`  with confidences and least-confidence scores: ${both(confident)} (${confident.value} utterances with least confidence > 0.5)`);
}

if (process.argv[1] !== undefined && import.meta.url.endsWith(process.argv[1].split('/').pop() ?? '\0')) {
  await crfBench({ out: new URL('out', import.meta.url).pathname, seed: 424242 });
}
