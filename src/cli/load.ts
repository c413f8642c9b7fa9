import type { Document, Scheme } from '../core/types';
import { columnsRead, delimitedRead, formatDetect, jsonlRead, textRead } from '../core/formats';
import { fileRead } from './io';

export const INPUT_FORMATS = ['iob1', 'iob2', 'bioes', 'columns', 'jsonl', 'text', 'csv', 'tsv'] as const;
export type InputFormat = (typeof INPUT_FORMATS)[number];

export interface LoadOptions {
  from?: InputFormat;
  scheme?: Scheme;
  column?: string;
}

export type Loaded =
  | { ok: true; format: string; document: Document }
  | { ok: false; message: string };

const HEAD_BYTES = 64 * 1024;

/** Read a file in the format asked for, or the one its name and first bytes suggest. */
export function documentLoad(path: string, options: LoadOptions): Loaded {
  const read = fileRead(path);
  if (!read.ok) return { ok: false, message: read.message };
  const bytes = read.bytes;
  let format: string = options.from ?? '';
  let scheme = options.scheme;
  if (format === 'iob1' || format === 'iob2' || format === 'bioes') {
    scheme = format;
    format = 'columns';
  }
  if (format === '') {
    const head = new TextDecoder('utf-8').decode(bytes.subarray(0, HEAD_BYTES));
    format = formatDetect(path, head);
  }
  const schemeOption = scheme === undefined ? {} : { scheme };
  switch (format) {
    case 'columns':
      return { ok: true, format, document: columnsRead(bytes, schemeOption) };
    case 'jsonl':
      return { ok: true, format, document: jsonlRead(bytes, schemeOption) };
    case 'text':
      return { ok: true, format, document: textRead(bytes) };
    case 'csv':
    case 'tsv': {
      if (options.column === undefined) {
        return { ok: false, message: `${format.toUpperCase()} input needs --column NAME (the column holding the text)` };
      }
      const delimiter = format === 'csv' ? ',' : '\t';
      return { ok: true, format, document: delimitedRead(bytes, { column: options.column, delimiter, header: true }) };
    }
    default:
      return { ok: false, message: `unknown input format "${format}"` };
  }
}
