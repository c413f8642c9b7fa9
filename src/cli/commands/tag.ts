import { readFileSync } from 'node:fs';
import { type CrfModel, crfModelFromJson, crfTagger, utteranceWords } from '../../core/crf';
import { columnsWrite, jsonlWrite } from '../../core/formats';
import { tagsConvert } from '../../core/schemes';
import type { Utterance } from '../../core/types';
import { EXIT_BAD_INPUT, EXIT_OK } from '../exit-codes';
import { type CliIo, fileWriteAtomic } from '../io';
import { documentLoad, type LoadOptions } from '../load';
import type { OutputFormat } from './convert';

export interface TagOptions extends LoadOptions {
  output?: string;
  /** Default iob2. */
  to?: OutputFormat;
}

/** Read a model file, reporting problems on stderr; null when it cannot be used. */
export function modelRead(path: string, io: CliIo): CrfModel | null {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (error) {
    io.err(`${path}: error: cannot read model (${(error as NodeJS.ErrnoException).code ?? 'error'})\n`);
    return null;
  }
  try {
    return crfModelFromJson(text);
  } catch (error) {
    io.err(`${path}: error: ${(error as Error).message}\n`);
    return null;
  }
}

/** Tag every utterance of IN with the model; existing tags are replaced, text, ids and comments kept. */
export function tagRun(modelPath: string, input: string, options: TagOptions, io: CliIo): number {
  const model = modelRead(modelPath, io);
  if (model === null) return EXIT_BAD_INPUT;
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
  const tagger = crfTagger(model);
  const to = options.to ?? 'iob2';
  const tagged: Utterance[] = document.utterances.map((u) => {
    const tags = tagger.tags(utteranceWords(u));
    return { ...u, tags: to === 'jsonl' ? tags : tagsConvert(tags, to) };
  });
  const text = to === 'jsonl' ? jsonlWrite(tagged) : columnsWrite(tagged);
  if (options.output === undefined) io.out(text);
  else fileWriteAtomic(options.output, text);
  return EXIT_OK;
}
