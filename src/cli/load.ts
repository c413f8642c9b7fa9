import { closeSync, openSync, readSync } from 'node:fs';
import { columnsReader, delimitedReader, type DocumentReader, formatDetect, jsonlReader, textReader } from '../core/formats';
import type { Document, Scheme, Utterance } from '../core/types';

export const INPUT_FORMATS = ['iob1', 'iob2', 'bioes', 'columns', 'jsonl', 'text', 'csv', 'tsv'] as const;
export type InputFormat = (typeof INPUT_FORMATS)[number];

export interface LoadOptions {
  from?: InputFormat;
  scheme?: Scheme;
  column?: string;
}

export type Loaded = { ok: true; format: string; document: Document } | { ok: false; message: string };

const CHUNK_BYTES = 1 << 20;

export type ReaderMade = { ok: true; format: string; reader: DocumentReader } | { ok: false; message: string };

/** Reading choices a command makes for itself (not flags the user gives). */
export interface ReadChoices {
  /** `false`: column files are read without token ranges (see `ColumnsReadOptions.tokenRanges`). */
  tokenRanges?: boolean;
}

export function readerCreate(path: string, head: Uint8Array, options: LoadOptions, onUtterance?: (u: Utterance) => void, choices: ReadChoices = {}): ReaderMade {
  const { format, scheme } = formatChoose(path, head, options);
  const common = { ...(scheme !== undefined && { scheme }), ...(onUtterance !== undefined && { onUtterance }) };
  switch (format) {
    case 'columns':
      return { ok: true, format, reader: columnsReader({ ...common, ...(choices.tokenRanges === false && { tokenRanges: false }) }) };
    case 'jsonl':
      return { ok: true, format, reader: jsonlReader(common) };
    case 'text':
      return { ok: true, format, reader: textReader(common) };
    case 'csv':
    case 'tsv': {
      if (options.column === undefined) {
        return { ok: false, message: `${format.toUpperCase()} input needs --column NAME (the column holding the text)` };
      }
      const delimiter = format === 'csv' ? ',' : '\t';
      return { ok: true, format, reader: delimitedReader({ ...common, column: options.column, delimiter, header: true }) };
    }
    default:
      return { ok: false, message: `unknown input format "${format}"` };
  }
}

/** The format to read `path` as: the one asked for (an IOB flavour is columns with that scheme), else detected. */
export function formatChoose(path: string, head: Uint8Array, options: LoadOptions): { format: string; scheme: Scheme | undefined } {
  let format: string = options.from ?? '';
  let scheme = options.scheme;
  if (format === 'iob1' || format === 'iob2' || format === 'bioes') {
    scheme = format;
    format = 'columns';
  }
  if (format === '') format = formatDetect(path, new TextDecoder('utf-8').decode(head));
  return { format, scheme };
}

/**
 * Stream a file through the reader `made` gives for its first bytes, in 1 MiB chunks. The decoder
 * copies what it keeps between pushes, so one buffer serves every chunk.
 */
export function fileStream(path: string, made: (head: Uint8Array) => ReaderMade): Loaded {
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code ?? 'error';
    return { ok: false, message: `cannot read file (${code}): ${(error as Error).message}` };
  }
  try {
    const buffer = new Uint8Array(CHUNK_BYTES);
    let length = readSync(fd, buffer, 0, CHUNK_BYTES, null);
    const reader = made(buffer.subarray(0, length));
    if (!reader.ok) return reader;
    while (length > 0) {
      reader.reader.push(buffer.subarray(0, length));
      length = readSync(fd, buffer, 0, CHUNK_BYTES, null);
    }
    return { ok: true, format: reader.format, document: reader.reader.end() };
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code ?? 'error';
    return { ok: false, message: `cannot read file (${code}): ${(error as Error).message}` };
  } finally {
    closeSync(fd);
  }
}

/**
 * Read a file in the format asked for, or the one its name and first bytes suggest. The file is
 * streamed in 1 MiB chunks; with `onUtterance` each utterance goes to the caller and is not kept.
 */
export function documentLoad(path: string, options: LoadOptions, onUtterance?: (u: Utterance) => void, choices: ReadChoices = {}): Loaded {
  return fileStream(path, (head) => readerCreate(path, head, options, onUtterance, choices));
}
