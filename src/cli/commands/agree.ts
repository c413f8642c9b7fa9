import { agreementCompute, alignBuilder } from '../../core/agreement';
import { EXIT_BAD_INPUT, EXIT_OK } from '../exit-codes';
import type { CliIo } from '../io';
import { documentLoad, type LoadOptions } from '../load';
import { agreeJson } from './agree-json';
import { agreeText } from './agree-text';

export interface AgreeOptions extends LoadOptions {
  json: boolean;
  bootstrap?: number;
  seed?: number;
}

/** `slotsmith agree A B [C …]`: malformed or mismatched input is exit 2 with every problem listed. */
export function agreeRun(files: readonly string[], options: AgreeOptions, io: CliIo): number {
  // Each file streams straight into the builder: no Utterance objects outlive their parse.
  const builder = alignBuilder();
  let bad = false;
  for (const file of files) {
    builder.layerBegin(file);
    const loaded = documentLoad(file, options, (utterance) => builder.utteranceAdd(utterance));
    builder.layerEnd();
    if (!loaded.ok) {
      io.err(`${file}:0: error: ${loaded.message}\n`);
      bad = true;
      continue;
    }
    for (const e of loaded.document.errors) io.err(`${file}:${e.line}: error: ${e.message}\n`);
    if (loaded.document.errors.length > 0) bad = true;
  }
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
  const report = agreementCompute(aligned.corpus, {
    ...(options.bootstrap !== undefined && { bootstrap: options.bootstrap }),
    ...(options.seed !== undefined && { seed: options.seed }),
  });
  io.out(options.json ? `${JSON.stringify(agreeJson(report))}\n` : agreeText(report));
  return EXIT_OK;
}
