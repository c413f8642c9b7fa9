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

type ReaderMade = { ok: true; format: string; reader: DocumentReader } | { ok: false; message: string };

/** Reading choices a command makes for itself (not flags the user gives). */
export interface ReadChoices {
  /** `false`: column files are read without token ranges (see `ColumnsReadOptions.tokenRanges`). */
  tokenRanges?: boolean;
}

function readerCreate(path: string, head: Uint8Array, options: LoadOptions, onUtterance?: (u: Utterance) => void, choices: ReadChoices = {}): ReaderMade {
  let format: string = options.from ?? '';
  let scheme = options.scheme;
  if (format === 'iob1' || format === 'iob2' || format === 'bioes') {
    scheme = format;
    format = 'columns';
  }
  if (format === '') format = formatDetect(path, new TextDecoder('utf-8').decode(head));
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

/**
 * Read a file in the format asked for, or the one its name and first bytes suggest. The file is
 * streamed in 1 MiB chunks; with `onUtterance` each utterance goes to the caller and is not kept.
 */
export function documentLoad(path: string, options: LoadOptions, onUtterance?: (u: Utterance) => void, choices: ReadChoices = {}): Loaded {
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code ?? 'error';
    return { ok: false, message: `cannot read file (${code}): ${(error as Error).message}` };
  }
  try {
    // The decoder copies what it keeps between pushes, so one buffer serves every chunk.
    const buffer = new Uint8Array(CHUNK_BYTES);
    let length = readSync(fd, buffer, 0, CHUNK_BYTES, null);
    const made = readerCreate(path, buffer.subarray(0, length), options, onUtterance, choices);
    if (!made.ok) return made;
    while (length > 0) {
      made.reader.push(buffer.subarray(0, length));
      length = readSync(fd, buffer, 0, CHUNK_BYTES, null);
    }
    return { ok: true, format: made.format, document: made.reader.end() };
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code ?? 'error';
    return { ok: false, message: `cannot read file (${code}): ${(error as Error).message}` };
  } finally {
    closeSync(fd);
  }
}
