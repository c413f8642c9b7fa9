/**
 * `npm run bench`: whole-process measurements on a seeded ~100k-utterance IOB2 file, each side by side
 * with its baseline in the same run (commands interleaved, medians reported). Not a test: numbers
 * are printed, never asserted.
 */
import { mkdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { columnsWrite } from '../src/core/formats';
import type { Utterance } from '../src/core/types';
import { corpusGenerate } from '../scripts/corpus/generate';
import { cliBuild } from '../scripts/build-cli.mjs';
import { agreeBench } from './agree';
import { browserBench } from './browser';
import { corpusTableBench } from './browser/corpus-table';
import { crfBench } from './crf';
import { measureInterleaved, runCapture } from './measure';

const root = fileURLToPath(new URL('..', import.meta.url));
const out = `${root}/bench/out`;
const count = Number(process.env.BENCH_UTTERANCES ?? 100_000);
const repeats = Number(process.env.BENCH_REPEATS ?? 5);
const seed = 424242;

// The baseline the issue names: awk testing only I-after-O (tags in the last column).
const AWK_I_AFTER_O = 'NF { t = $NF; if (t ~ /^I-/ && prev == "O") n++; prev = t; next } { prev = "" } END { print n + 0 }';

function mb(bytes: number): number {
  return bytes / (1024 * 1024);
}

function prepare(): { checkFile: string; cleanFile: string; tokens: number } {
  mkdirSync(out, { recursive: true });
  const started = performance.now();
  const corpus = corpusGenerate({ seed, count });
  // Each utterance as one annotator labelled it, so the file carries their ~1% illegal transitions.
  const byId = new Map<string, Utterance>();
  for (const layer of corpus.layers) for (const u of layer.utterances) if (u.id !== undefined && !byId.has(u.id)) byId.set(u.id, u);
  // Generator bookkeeping (template, annotator) is dropped: a user's file carries id, intent and text.
  const plain = (u: Utterance): Utterance => ({ ...u, meta: {} });
  const labelled = corpus.truth.map((u) => plain(byId.get(u.id ?? '') ?? u));
  const checkFile = `${out}/annotated.iob2`;
  const cleanFile = `${out}/truth.iob2`;
  writeFileSync(checkFile, columnsWrite(labelled));
  writeFileSync(cleanFile, columnsWrite(corpus.truth.map(plain)));
  const tokens = labelled.reduce((n, u) => n + u.tokens.length, 0);
  console.log(`generated ${count} utterances, ${tokens} tokens in ${((performance.now() - started) / 1000).toFixed(1)} s (seed ${seed})`);
  return { checkFile, cleanFile, tokens };
}

function row(label: string, seconds: number, rssMb: number | null, extra = ''): string {
  const rss = rssMb === null ? '' : `${rssMb.toFixed(0).padStart(6)} MB`;
  return `  ${label.padEnd(34)} ${seconds.toFixed(3).padStart(8)} s ${rss} ${extra}`;
}

const only = process.env.BENCH_ONLY; // 'agree' | 'browser' | 'table' | 'crf': run one part only

async function main(): Promise<void> {
  if (only === 'browser') {
    mkdirSync(out, { recursive: true });
    await browserBench({ root, out, count, seed });
    return;
  }
  if (only === 'table') {
    mkdirSync(out, { recursive: true });
    await corpusTableBench({ root, out, count, seed });
    return;
  }
  if (only === 'crf') {
    mkdirSync(out, { recursive: true });
    await crfBench({ out, seed });
    return;
  }
  await cliBuild();
  if (only === 'agree') {
    mkdirSync(out, { recursive: true });
    agreeBench({ root, out, count, repeats, seed });
    return;
  }
  const { checkFile, cleanFile, tokens } = prepare();
  const cli = ['node', `${root}/bin/slotsmith.mjs`];

  const checkSize = statSync(checkFile).size;
  const awkCount = runCapture(['awk', AWK_I_AFTER_O, checkFile]).stdout.trim();
  const checkJson = JSON.parse(runCapture([...cli, 'check', '--json', '--scheme', 'iob2', checkFile]).stdout) as {
    files: Array<{ violations: Array<{ rule: string }> }>;
  };
  const violations = checkJson.files[0]?.violations ?? [];
  const iAfterO = violations.filter((v) => v.rule === 'iob2/inside-after-outside').length;

  console.log(`\n== check vs awk (I-after-O only) on ${mb(checkSize).toFixed(1)} MB, ${tokens} tokens, ${repeats} interleaved runs, medians`);
  console.log(`  awk counts ${awkCount} I-after-O; check reports ${violations.length} violations, ${iAfterO} of them I-after-O`);
  const check = measureInterleaved(
    { awk: ['awk', AWK_I_AFTER_O, checkFile], check: [...cli, 'check', '--scheme', 'iob2', checkFile] },
    repeats,
  );
  const awk = check.awk!;
  const ours = check.check!;
  console.log(row('awk one-liner (I-after-O only)', awk.medianSeconds, awk.peakRssMb));
  console.log(row('slotsmith check (all rules)', ours.medianSeconds, ours.peakRssMb, `exit ${ours.exitCode}`));
  const ratio = ours.medianSeconds / awk.medianSeconds;
  console.log(`  ratio check/awk: ${ratio.toFixed(2)}× (target ≤ 2×: ${ratio <= 2 ? 'met' : 'NOT met'})`);

  const cleanSize = statSync(cleanFile).size;
  const jsonl = `${out}/truth.jsonl`;
  const back = `${out}/truth.back.iob2`;
  console.log(`\n== convert round trip on ${mb(cleanSize).toFixed(1)} MB IOB2, ${repeats} interleaved runs, medians`);
  const convert = measureInterleaved(
    {
      'iob2 → jsonl': [...cli, 'convert', cleanFile, '--to', 'jsonl', '-o', jsonl],
      'jsonl → iob2': [...cli, 'convert', jsonl, '--to', 'iob2', '-o', back],
      'iob2 → bioes': [...cli, 'convert', cleanFile, '--to', 'bioes', '-o', `${out}/truth.bioes`],
    },
    repeats,
  );
  const jsonlSize = statSync(jsonl).size;
  for (const [label, m] of Object.entries(convert)) {
    const inputSize = label.startsWith('jsonl') ? jsonlSize : cleanSize;
    console.log(row(`slotsmith convert ${label}`, m.medianSeconds, m.peakRssMb, `${(mb(inputSize) / m.medianSeconds).toFixed(1)} MB/s input`));
  }
  const identical = readFileSync(back).equals(readFileSync(cleanFile));
  console.log(`  IOB2 → JSONL → IOB2 byte-identical: ${identical ? 'yes' : 'NO'}`);
  if (!identical) process.exitCode = 1;

  agreeBench({ root, out, count, repeats, seed });
  await browserBench({ root, out, count, seed });
  await corpusTableBench({ root, out, count, seed });
  await crfBench({ out, seed });
}

await main();
