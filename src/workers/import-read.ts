/** One file through one core reader, in the stream's own chunks, with byte progress and cancel. */
import {
  columnsReader,
  delimitedReader,
  jsonlReader,
  textReader,
  type ColumnRef,
  type DocumentReader,
  type FormatName,
} from '../core/formats';
import type { TokeniserSpec } from '../core/tokenise';
import type { Document, Scheme, Utterance } from '../core/types';

export interface ImportFileOptions {
  format: FormatName;
  /** The file's scheme; undefined: detected (column files) or the project's (JSON Lines spans). */
  scheme?: Scheme;
  /** CSV/TSV: the text column, by header name. */
  column?: ColumnRef;
}

export interface ReaderSettings extends ImportFileOptions {
  tokeniser: TokeniserSpec;
  projectScheme: Scheme;
}

/** Thrown when the user cancels; callers tell it apart from real failures. */
export class ImportCancelledError extends Error {
  override name = 'ImportCancelledError';
  constructor() {
    super('The import was cancelled; nothing from it was kept.');
  }
}

/** Column files and JSON Lines carry labels, so they fill an annotator's layer; text and CSV/TSV do not. */
export function formatHasLabels(format: FormatName): boolean {
  return format === 'columns' || format === 'jsonl';
}

export function importReaderCreate(settings: ReaderSettings, onUtterance: (u: Utterance) => void): DocumentReader {
  const { format, tokeniser } = settings;
  switch (format) {
    case 'columns':
      return settings.scheme === undefined ? columnsReader({ onUtterance }) : columnsReader({ scheme: settings.scheme, onUtterance });
    case 'jsonl':
      return jsonlReader({ tokeniser, scheme: settings.scheme ?? settings.projectScheme, onUtterance });
    case 'text':
      return textReader({ tokeniser, onUtterance });
    case 'csv':
    case 'tsv':
      if (settings.column === undefined) throw new Error('Choose the column that holds the text.');
      return delimitedReader({ column: settings.column, delimiter: format === 'csv' ? ',' : '\t', tokeniser, onUtterance });
  }
}

export interface StreamHooks {
  /** Called after each chunk with the bytes read so far; may await (the commit writes here). */
  afterChunk?: (bytesRead: number) => void | Promise<void>;
  cancelled?: () => boolean;
}

/** Push the whole file through `reader` and end it; throws ImportCancelledError when cancelled between chunks. */
export async function fileStreamRead(file: Blob, reader: DocumentReader, hooks: StreamHooks = {}): Promise<Document> {
  const stream = file.stream().getReader();
  let bytesRead = 0;
  try {
    for (;;) {
      if (hooks.cancelled?.() === true) throw new ImportCancelledError();
      const { done, value } = await stream.read();
      if (done) break;
      reader.push(value);
      bytesRead += value.byteLength;
      await hooks.afterChunk?.(bytesRead);
    }
  } catch (error) {
    await stream.cancel().catch(() => undefined);
    throw error;
  }
  if (hooks.cancelled?.() === true) throw new ImportCancelledError();
  return reader.end();
}
