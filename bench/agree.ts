/**
 * The agreement part of `npm run bench`: `slotsmith agree` on a seeded pair of ~100k-utterance files
 * as a whole process, against a Python pipeline (parse both files, scikit-learn's cohen_kappa_score on
 * tags and slot types), plus in-process timings of the computation after parsing.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { agreementCompute, agreementPrepare, bootstrapPatchRange, bootstrapTotalsRange, layersAlign, type AlignedCorpus, type BootstrapPatchPlan } from '../src/core/agreement';
import { bootstrapWasmAvailable, type BootstrapEngine } from '../src/core/agreement/bootstrap-wasm';
import { columnsRead, columnsWrite } from '../src/core/formats';
import { tagsConvert } from '../src/core/schemes';
import type { Utterance } from '../src/core/types';
import { corpusGenerate } from '../scripts/corpus/generate';
import { measureInterleaved, runCapture } from './measure';

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[sorted.length >> 1] ?? 0;
}

function timeMs(run: () => void): number {
  const started = performance.now();
  run();
  return performance.now() - started;
}

export function agreeBench(options: { root: string; out: string; count: number; repeats: number; seed: number }): void {
  const { root, out, count, repeats, seed } = options;
  // Both simulated annotators label every utterance, so the pair covers the whole corpus.
  const corpus = corpusGenerate({ seed, count, overlapShare: 1 });
  // Legal IOB2 only, so scikit-learn on the raw file tags and slotsmith (which reads illegal
  // transitions the CoNLL-2000 way before comparing) must give identical figures.
  const plain = (u: Utterance): Utterance => ({ ...u, tags: tagsConvert(u.tags, 'iob2'), meta: {} });
  const [a, b] = corpus.layers.slice(0, 2).map((layer, i) => {
    const file = `${out}/pair-${i === 0 ? 'a' : 'b'}.iob2`;
    writeFileSync(file, columnsWrite(layer.utterances.map(plain)));
    return file;
  }) as [string, string];

  const python = ['/usr/bin/python3', `${root}/bench/python/agree_baseline.py`, a, b];
  const cli = ['node', `${root}/bin/slotsmith.mjs`, 'agree', '--json', a, b];
  const theirs = JSON.parse(runCapture(python).stdout) as { tokens: number; tag: number; slot: number };
  const oursRun = runCapture(cli);
  const ours = JSON.parse(oursRun.stdout) as { tokens: number; kappa: { tag: number; slot: number } };
  console.log(`\n== agree vs Python + scikit-learn on two files of ${count} utterances, ${theirs.tokens} tokens, ${repeats} interleaved runs, medians`);
  console.log(
    `  kappa tag: slotsmith ${ours.kappa.tag} / scikit-learn ${theirs.tag}; ` +
      `slot: ${ours.kappa.slot} / ${theirs.slot} (|Δ| ≤ ${Math.max(Math.abs(ours.kappa.tag - theirs.tag), Math.abs(ours.kappa.slot - theirs.slot)).toExponential(1)})`,
  );
  const oneThread = ['/usr/bin/env', 'SLOTSMITH_WORKERS=0', ...cli];
  const m = measureInterleaved(
    {
      python,
      agree: cli,
      'agree --bootstrap 0': [...cli, '--bootstrap', '0'],
      'agree, one thread': oneThread,
      'agree --bootstrap 0, one thread': [...oneThread, '--bootstrap', '0'],
    },
    repeats,
  );
  for (const [label, r] of Object.entries(m)) {
    console.log(`  ${label.padEnd(34)} ${r.medianSeconds.toFixed(3).padStart(8)} s ${r.peakRssMb?.toFixed(0).padStart(6) ?? ''} MB`);
  }
  const pythonSeconds = m.python?.medianSeconds ?? 1;
  const verdict = (ratio: number): string => (ratio <= 0.1 ? 'met' : 'NOT met');
  // Like for like: the Python pipeline computes two point kappas and no intervals.
  const plainRatio = (m['agree --bootstrap 0']?.medianSeconds ?? 0) / pythonSeconds;
  const full = (m.agree?.medianSeconds ?? 0) / pythonSeconds;
  console.log(`  ratio agree --bootstrap 0 / python: ${plainRatio.toFixed(3)}× (target ≤ 0.1×: ${verdict(plainRatio)}; every figure, no intervals, like the Python pipeline)`);
  console.log(`  ratio agree / python:               ${full.toFixed(3)}× (target ≤ 0.1×: ${verdict(full)}; adds 1,000 bootstrap resamples for the intervals)`);
  console.log(`  threads: ${availableParallelism()} CPU(s) here; 'one thread' rows set SLOTSMITH_WORKERS=0`);

  // In-process: the computation alone, after both files are parsed and aligned.
  const layers = [a, b].map((file, i) => ({ name: `layer-${i}`, ...columnsRead(readFileSync(file)) }));
  const aligned = layersAlign(layers.map((l) => ({ name: l.name, scheme: l.scheme, utterances: l.utterances })));
  if (!aligned.ok) throw new Error('bench pair did not align');
  const computeRuns: number[] = [];
  for (let r = 0; r < Math.max(repeats, 5); r++) computeRuns.push(timeMs(() => agreementCompute(aligned.corpus, { bootstrap: 0 })));
  const bootstrapRuns: number[] = [];
  for (let r = 0; r < 3; r++) bootstrapRuns.push(timeMs(() => agreementCompute(aligned.corpus, { bootstrap: 1000 })));
  const alignMs = timeMs(() => layersAlign(layers.map((l) => ({ name: l.name, scheme: l.scheme, utterances: l.utterances }))));
  console.log(`  in-process, after parsing: align ${alignMs.toFixed(0)} ms; agreement (all figures, no bootstrap) median ${median(computeRuns).toFixed(0)} ms (target ≤ 150 ms); with 1,000 bootstrap resamples median ${median(bootstrapRuns).toFixed(0)} ms`);
  bootstrapEnginesBench(aligned.corpus, Math.max(repeats, 3));
}

/** Steps of 100 resamples, as the agreement worker and its helpers call the core. */
const ENGINE_STEP = 100;

/**
 * The bootstrap's two engines side by side on one thread (interleaved, medians): 1,000 resamples'
 * totals, and the patch replay after 1 and after 10 changed utterances; each pair must agree exactly.
 */
export function bootstrapEnginesBench(corpus: AlignedCorpus, repeats: number): void {
  const job = agreementPrepare(corpus, { bootstrap: 1000, seed: 1 }).job;
  if (job === null) throw new Error('no bootstrap job on the bench pair');
  const { rows, layout, seed, resamples } = job;
  const count = rows.patternOf.length;
  const width = layout.width;
  const totals = (engine: BootstrapEngine): Float64Array => {
    const out = new Float64Array(resamples * width);
    for (let at = 0; at < resamples; at += ENGINE_STEP) out.set(bootstrapTotalsRange(rows, layout, seed, at, Math.min(resamples, at + ENGINE_STEP), { engine }), at * width);
    return out;
  };
  const planOf = (changed: number): BootstrapPatchPlan => {
    // Spread over the corpus, first and last included; small integer changes as one label edit makes.
    const positions = Int32Array.from({ length: changed }, (_, i) => Math.round((i * (count - 1)) / Math.max(1, changed - 1)));
    const deltas = Float64Array.from({ length: changed * width }, (_, i) => ((i * 7) % 5) - 2);
    return { positions, deltas, count, width, seed };
  };
  const patch = (plan: BootstrapPatchPlan, engine: BootstrapEngine): Float64Array => {
    const out = new Float64Array(resamples * width);
    for (let at = 0; at < resamples; at += ENGINE_STEP) out.set(bootstrapPatchRange(plan, at, Math.min(resamples, at + ENGINE_STEP), { engine }), at * width);
    return out;
  };
  const same = (a: Float64Array, b: Float64Array): boolean => a.length === b.length && a.every((v, i) => Object.is(v, b[i]));
  const cases: [string, (engine: BootstrapEngine) => Float64Array][] = [
    ['1,000 resamples (totals)', totals],
    ['patch, 1 changed utterance', (engine) => patch(planOf(1), engine)],
    ['patch, 10 changed utterances', (engine) => patch(planOf(10), engine)],
  ];
  console.log(`  bootstrap engines, one thread, ${count} utterances, ${rows.rowStart.length - 1} row patterns, ${rows.index.length} entries, width ${width}; WebAssembly SIMD ${bootstrapWasmAvailable() ? 'available' : 'NOT available (both rows run JS)'}; ${repeats} interleaved runs, medians`);
  for (const [label, run] of cases) {
    const times: Record<BootstrapEngine, number[]> = { js: [], auto: [] };
    let identical = true;
    for (let r = 0; r < repeats; r++) {
      let js: Float64Array = new Float64Array(0);
      let wasm: Float64Array = new Float64Array(0);
      times.js.push(timeMs(() => (js = run('js'))));
      times.auto.push(timeMs(() => (wasm = run('auto'))));
      identical &&= same(js, wasm);
    }
    const [j, w] = [median(times.js), median(times.auto)];
    console.log(`  ${label.padEnd(30)} JS ${j.toFixed(0).padStart(5)} ms, WASM ${w.toFixed(0).padStart(5)} ms (${(j / w).toFixed(1)}×), results identical: ${identical ? 'yes' : 'NO'}`);
  }
}
