import { statSync } from 'node:fs';
import {
  agreementCompute,
  agreementIntervalsAdd,
  agreementPrepare,
  alignBuilder,
  resampleValuesJoin,
  type AgreementOptions,
  type AgreementReport,
  type AlignBuilder,
  type AlignedCorpus,
} from '../../core/agreement';
import type { ReadError } from '../../core/types';
import { EXIT_BAD_INPUT, EXIT_OK } from '../exit-codes';
import type { CliIo } from '../io';
import { layerLoad } from '../layer-load';
import type { LoadOptions } from '../load';
import { agreeJson } from './agree-json';
import { agreeText } from './agree-text';
import { agreeWorkerCount, AgreeWorkers } from './agree-workers';

export interface AgreeOptions extends LoadOptions {
  json: boolean;
  bootstrap?: number;
  seed?: number;
}

type FileRead = { ok: true; errors: ReadError[] } | { ok: false; message: string };

/** Each file streamed straight into alignment data (see `layerLoad`). */
function filesReadHere(files: readonly string[], options: LoadOptions, builder: AlignBuilder, sizes: readonly number[]): FileRead[] {
  return files.map((file, i): FileRead => {
    const loaded = layerLoad(file, options, sizes[i] ?? 0);
    if (!loaded.ok) return loaded;
    builder.layerAdd(loaded.layer);
    return { ok: true, errors: loaded.errors };
  });
}

async function filesReadOnWorkers(files: readonly string[], options: LoadOptions, builder: AlignBuilder, workers: AgreeWorkers, sizes: readonly number[]): Promise<FileRead[]> {
  const replies = await workers.gather(files, options, sizes);
  return replies.map((reply): FileRead => {
    if (!reply.ok) return reply;
    builder.layerAdd(reply.layer);
    return { ok: true, errors: reply.errors };
  });
}

async function reportCompute(corpus: AlignedCorpus, options: AgreementOptions, workers: AgreeWorkers | null): Promise<AgreementReport> {
  if (workers === null) return agreementCompute(corpus, options);
  const pending = agreementPrepare(corpus, options);
  if (pending.job === null) return pending.report;
  return agreementIntervalsAdd(pending, resampleValuesJoin(await workers.bootstrap(pending.job)));
}

/** Each file's size in bytes, 0 when it cannot be read (that is reported when it is read). */
function fileSizes(files: readonly string[]): number[] {
  return files.map((file) => {
    try {
      return statSync(file).size;
    } catch {
      return 0;
    }
  });
}

/**
 * `slotsmith agree A B [C …]`: malformed or mismatched input is exit 2 with every problem listed.
 * Large inputs are parsed and resampled on worker threads (see `agreeWorkerCount`); the figures
 * are the same whatever the thread count.
 */
export async function agreeRun(files: readonly string[], options: AgreeOptions, io: CliIo): Promise<number> {
  const load: LoadOptions = {
    ...(options.from !== undefined && { from: options.from }),
    ...(options.scheme !== undefined && { scheme: options.scheme }),
    ...(options.column !== undefined && { column: options.column }),
  };
  const sizes = fileSizes(files);
  const count = agreeWorkerCount(sizes.reduce((a, b) => a + b, 0));
  const workers = count > 0 ? new AgreeWorkers(count) : null;
  try {
    const builder = alignBuilder();
    const reads = workers === null ? filesReadHere(files, load, builder, sizes) : await filesReadOnWorkers(files, load, builder, workers, sizes);
    let bad = false;
    reads.forEach((read, i) => {
      const file = files[i] ?? '';
      if (!read.ok) {
        io.err(`${file}:0: error: ${read.message}\n`);
        bad = true;
        return;
      }
      for (const e of read.errors) io.err(`${file}:${e.line}: error: ${e.message}\n`);
      if (read.errors.length > 0) bad = true;
    });
    if (bad) {
      io.err('agree: malformed input; no figures computed\n');
      return EXIT_BAD_INPUT;
    }
    const aligned = builder.finish();
    if (!aligned.ok) {
      for (const e of aligned.errors) io.err(`agree: ${e.message}\n`);
      if (aligned.errorCount > aligned.errors.length) io.err(`agree: … ${aligned.errorCount - aligned.errors.length} more alignment problem(s)\n`);
      return EXIT_BAD_INPUT;
    }
    const report = await reportCompute(
      aligned.corpus,
      {
        ...(options.bootstrap !== undefined && { bootstrap: options.bootstrap }),
        ...(options.seed !== undefined && { seed: options.seed }),
      },
      workers,
    );
    io.out(options.json ? `${JSON.stringify(agreeJson(report))}\n` : agreeText(report));
    return EXIT_OK;
  } finally {
    await workers?.close();
  }
}
