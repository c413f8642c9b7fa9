import { crfModelToJson, type CrfSequence, crfSequenceFromUtterance, crfTrain } from '../../core/crf';
import { crfHelperCount, crfWithHelpers } from '../crf-threads';
import { EXIT_BAD_INPUT, EXIT_OK } from '../exit-codes';
import { type CliIo, fileWriteAtomic } from '../io';
import { documentLoad, type LoadOptions } from '../load';
import { violationsLocate } from './check';

export interface TrainOptions extends LoadOptions {
  output: string;
  iterations?: number;
  c2?: number;
  seed?: number;
}

/**
 * Read labelled files (any input format `convert` reads) into training sequences. Malformed lines
 * stop the run; illegal transitions are read the CoNLL-2000 way, with a warning.
 */
export function sequencesLoad(files: readonly string[], options: LoadOptions, io: CliIo): CrfSequence[] | null {
  const sequences: CrfSequence[] = [];
  for (const file of files) {
    const loaded = documentLoad(file, options);
    if (!loaded.ok) {
      io.err(`${file}:0: error: ${loaded.message}\n`);
      return null;
    }
    const { document } = loaded;
    if (document.errors.length > 0) {
      for (const e of document.errors) io.err(`${file}:${e.line}: error: ${e.message}\n`);
      io.err(`${file}: ${document.errors.length} malformed line(s)\n`);
      return null;
    }
    const violations = violationsLocate(document.utterances, document.scheme);
    if (violations.length > 0) {
      io.err(`${file}: ${violations.length} illegal transition(s) read as the CoNLL-2000 evaluation does (a stray inside tag starts a new span)\n`);
    }
    for (const utterance of document.utterances) sequences.push(crfSequenceFromUtterance(utterance));
  }
  return sequences;
}

export async function trainRun(files: readonly string[], options: TrainOptions, io: CliIo): Promise<number> {
  const sequences = sequencesLoad(files, options, io);
  if (sequences === null) return EXIT_BAD_INPUT;
  if (!sequences.some((s) => s.words.length > 0)) {
    io.err('train: no utterances with tokens to learn from\n');
    return EXIT_BAD_INPUT;
  }
  const started = performance.now();
  const tokens = sequences.reduce((n, s) => n + s.words.length, 0);
  // Helper threads share forward–backward; the model is the same without them (see CRF_SHARDS).
  const { model, threads } = await crfWithHelpers(crfHelperCount(tokens), async (helpers) => {
    const trained = await crfTrain(sequences, {
      ...(options.iterations !== undefined && { maxIterations: options.iterations }),
      ...(options.c2 !== undefined && { c2: options.c2 }),
      ...(options.seed !== undefined && { seed: options.seed }),
      shardHelpers: helpers,
    });
    return { model: trained, threads: 1 + helpers.filter((h) => h.answered > 0).length };
  });
  fileWriteAtomic(options.output, crfModelToJson(model));
  const t = model.training;
  const seconds = ((performance.now() - started) / 1000).toFixed(1);
  io.err(
    `trained on ${t.utterances} utterance(s), ${t.tokens} token(s): ${model.labels.length} labels, ` +
      `${model.featureLabels.length} state features; ${t.iterations} iteration(s), stopped: ${t.stopped}, ` +
      `loss ${t.loss.toFixed(3)}, ${seconds} s on ${threads} thread(s) → ${options.output}\n`,
  );
  return EXIT_OK;
}
