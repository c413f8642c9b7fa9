import { columnsWrite, jsonlWrite } from '../../core/formats';
import { type MaskKind, textMask } from '../../core/privacy';
import { tagsConvert } from '../../core/schemes';
import type { Utterance } from '../../core/types';
import { EXIT_BAD_INPUT, EXIT_OK } from '../exit-codes';
import { type CliIo, fileWriteAtomic } from '../io';
import { documentLoad, type LoadOptions } from '../load';
import { violationsLocate } from './check';

export const OUTPUT_FORMATS = ['iob1', 'iob2', 'bioes', 'jsonl'] as const;
export type OutputFormat = (typeof OUTPUT_FORMATS)[number];

export interface ConvertOptions extends LoadOptions {
  to: OutputFormat;
  output?: string;
  /** Length-preserving masking of the utterance text (tokens keep their offsets). */
  mask?: readonly MaskKind[];
}

function documentWrite(utterances: readonly Utterance[], to: OutputFormat): string {
  if (to === 'jsonl') return jsonlWrite(utterances);
  return columnsWrite(utterances.map((u) => ({ ...u, tags: tagsConvert(u.tags, to) })));
}

/** Convert one file; malformed input writes nothing, so an existing OUT is never replaced by a partial file. */
export function convertRun(input: string, options: ConvertOptions, io: CliIo): number {
  const loaded = documentLoad(input, options);
  if (!loaded.ok) {
    io.err(`${input}:0: error: ${loaded.message}\n`);
    return EXIT_BAD_INPUT;
  }
  const { document } = loaded;
  if (document.errors.length > 0) {
    for (const e of document.errors) io.err(`${input}:${e.line}: error: ${e.message}\n`);
    io.err(`${input}: ${document.errors.length} malformed line(s); nothing written\n`);
    return EXIT_BAD_INPUT;
  }
  const violations = violationsLocate(document.utterances, document.scheme);
  if (violations.length > 0) {
    io.err(
      `${input}: ${violations.length} illegal transition(s) read as the CoNLL-2000 evaluation does ` +
        `(a stray inside tag starts a new span); run \`check\` to list them\n`,
    );
  }
  const mask = options.mask ?? [];
  const utterances = mask.length === 0 ? document.utterances : document.utterances.map((u) => ({ ...u, text: textMask(u.text, mask) }));
  let text: string;
  try {
    text = documentWrite(utterances, options.to);
  } catch (error) {
    io.err(`${input}: error: ${(error as Error).message}\n`);
    return EXIT_BAD_INPUT;
  }
  if (options.output === undefined) io.out(text);
  else fileWriteAtomic(options.output, text);
  return EXIT_OK;
}
