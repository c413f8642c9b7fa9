import { columnsWrite, FormatWriteError, jsonlWrite } from '../formats';
import { type MaskKind, textMask } from '../privacy';
import { tagParse, tagsConvert } from '../schemes';
import type { Scheme, Utterance } from '../types';
import { ExportRefusedError, exportCheck } from './check';
import { type SplitOptions, type SplitPart, splitAssign } from './split';
import type { ExportInput } from './types';

export type ExportFormat = 'iob2' | 'bioes' | 'jsonl';
export const EXPORT_FORMATS: readonly ExportFormat[] = ['iob2', 'bioes', 'jsonl'];

export interface ExportOptions {
  format: ExportFormat;
  /** Length-preserving masking of the text (see `textMask`); tokens keep their offsets. */
  mask?: readonly MaskKind[];
  split?: SplitOptions;
  /**
   * Write even when chosen layers have illegal transitions: IOB2 keeps the stored tags exactly; BIOES
   * and JSON Lines read them leniently (a stray I-X opens a span), as `convert` does.
   */
  asIs?: boolean;
  /** Scheme of the stored tags; default IOB2, what the app stores. */
  scheme?: Scheme;
}

/** `all` without a split; otherwise one file per part. */
export type ExportPartName = 'all' | SplitPart;

export interface ExportFile {
  part: ExportPartName;
  content: string;
  count: number;
}

/** A piece of one part's file: the pieces of a part, joined in order, are that part's file. */
export interface ExportChunk {
  part: ExportPartName;
  text: string;
  /** Utterances written so far over all parts, and in all: for a progress bar. */
  done: number;
  total: number;
}

/** Re-encoded tags, or why they cannot be written without losing a label. */
type TagsEncode = (tags: string[]) => string[] | string;

function tagMalformed(tags: readonly string[]): string | null {
  const i = tags.findIndex((tag) => tagParse(tag) === null);
  return i < 0 ? null : `tag ${i} ${JSON.stringify(tags[i])} is not a valid tag`;
}

/**
 * The CLI's `convert` re-encodes every tag sequence with `tagsConvert`; so do we when nothing is
 * illegal. As-is IOB2 keeps the stored tags untouched. As-is BIOES cannot keep illegal IOB2 tags, so
 * it is converted leniently (a stray I-X opens a span, CoNLL-2000 reading), exactly as `convert` does.
 * A malformed tag would become O there, so it is refused, as `jsonlWrite` refuses it. JSON Lines
 * always derives spans leniently inside `jsonlWrite`, so it gets the stored tags.
 */
function tagsEncoder(format: ExportFormat, asIs: boolean, scheme: Scheme): TagsEncode {
  if (format === 'jsonl' || (format === 'iob2' && asIs)) return (tags) => tags;
  // Legal tags already in the target scheme re-encode to themselves: skip the work.
  if (!asIs && format === scheme) return (tags) => tags;
  return (tags) => tagMalformed(tags) ?? tagsConvert(tags, format);
}

/** The id part of a `FormatWriteError` message, as `errors.ts` builds it. */
function idPart(utterance: Utterance): string {
  return utterance.id === undefined ? '' : ` (id ${JSON.stringify(utterance.id)})`;
}

/** Re-number a writer error from its chunk to its part, so chunked and one-shot errors read alike. */
function writeErrorPlace(error: unknown, chunk: readonly Utterance[], offset: number): unknown {
  if (!(error instanceof FormatWriteError) || offset === 0) return error;
  const utterance = chunk[error.index];
  if (utterance === undefined) return error;
  const prefix = `cannot write utterance ${error.index + 1}${idPart(utterance)} as ${error.format}: `;
  if (!error.message.startsWith(prefix)) return error;
  return new FormatWriteError(error.format, utterance, offset + error.index, error.message.slice(prefix.length));
}

function partsPlan(utterances: readonly Utterance[], split: SplitOptions | undefined): { part: ExportPartName; positions: number[] }[] {
  if (split === undefined) return [{ part: 'all', positions: utterances.map((_, i) => i) }];
  // An empty intent counts as none: both mean the utterance has no intent to stratify by.
  const assignment = splitAssign(
    utterances.map((u) => (u.intent === '' ? undefined : u.intent)),
    split,
  );
  return (['train', 'dev', 'test'] as const).map((part) => ({ part, positions: assignment[part] }));
}

/**
 * Export the selection in pieces of about `chunkSize` utterances, so a worker can stream a large
 * corpus and report progress; every part yields at least one piece (possibly empty). Checks happen
 * before the first piece: bad split options throw a RangeError, and illegal transitions throw an
 * `ExportRefusedError` listing them unless `asIs` is set. A writer that cannot represent an
 * utterance throws `FormatWriteError`, numbered within its part as `exportWrite` would.
 */
export function exportChunks(
  selection: ExportInput,
  options: ExportOptions,
  chunkSize = 1000,
): Generator<ExportChunk, void, undefined> {
  if (!(Number.isInteger(chunkSize) || chunkSize === Infinity) || chunkSize < 1) {
    throw new RangeError(`exportChunks: chunk size must be a whole number of at least 1, got ${chunkSize}`);
  }
  const asIs = options.asIs ?? false;
  const scheme = options.scheme ?? 'iob2';
  if (!asIs) {
    const violations = exportCheck(selection, scheme);
    if (violations.length > 0) throw new ExportRefusedError(violations);
  }
  const parts = partsPlan(selection.utterances, options.split);
  return chunksGenerate(selection.utterances, parts, options, tagsEncoder(options.format, asIs, scheme), chunkSize);
}

function* chunksGenerate(
  utterances: readonly Utterance[],
  parts: { part: ExportPartName; positions: number[] }[],
  options: ExportOptions,
  encode: TagsEncode,
  chunkSize: number,
): Generator<ExportChunk, void, undefined> {
  const mask = options.mask ?? [];
  const columns = options.format !== 'jsonl';
  const total = utterances.length;
  let done = 0;
  for (const { part, positions } of parts) {
    let offset = 0;
    do {
      const chunk = positions.slice(offset, offset + chunkSize).map((position, k): Utterance => {
        const u = utterances[position] as Utterance;
        const tags = encode(u.tags);
        if (typeof tags === 'string') throw new FormatWriteError('IOB columns', u, offset + k, tags);
        return { ...u, text: mask.length === 0 ? u.text : textMask(u.text, mask), tags };
      });
      let text: string;
      try {
        text = columns ? columnsWrite(chunk) : jsonlWrite(chunk);
      } catch (error) {
        throw writeErrorPlace(error, chunk, offset);
      }
      // Column files separate utterances with a blank line, so a later piece starts with one.
      if (columns && offset > 0) text = `\n${text}`;
      offset += chunk.length;
      done += chunk.length;
      yield { part, text, done, total };
    } while (offset < positions.length);
  }
}

/** One-shot export: one file per part, each equal to the joined pieces of `exportChunks`. */
export function exportWrite(
  selection: ExportInput,
  options: ExportOptions,
): ExportFile[] {
  const files: ExportFile[] = [];
  let previousDone = 0;
  for (const chunk of exportChunks(selection, options, Infinity)) {
    files.push({ part: chunk.part, content: chunk.text, count: chunk.done - previousDone });
    previousDone = chunk.done;
  }
  return files;
}
