import type { Document, ReadError, Utterance } from '../types';
import { ByteLineDecoder } from './decode';
import { LineSplitter, type LineSink, type TextTarget } from './lines';

/** Whole input for the one-shot readers: text, or UTF-8 bytes with or without a BOM. */
export type ReadInput = string | Uint8Array;

/**
 * An incremental reader: push the input in chunks of any size, then `end()`. Made for streaming big
 * files through a worker; the `…Read(input)` functions are one push and one end.
 */
export interface DocumentReader {
  /** The next piece of input: text, or UTF-8 bytes (one stream is all text or all bytes). */
  push(chunk: string | Uint8Array): void;
  end(): Document;
}

export interface TextParser extends TextTarget {
  end(): Document;
}

export interface LineParser extends LineSink {
  end(): Document;
}

/** Route text chunks straight to the parser and byte chunks through the UTF-8 line decoder. */
export function readerFromTextParser(parser: TextParser): DocumentReader {
  let bytes: ByteLineDecoder | null = null;
  let sawText = false;
  return {
    push(chunk) {
      if (typeof chunk === 'string') {
        if (bytes !== null) throw new TypeError('DocumentReader.push: a byte stream cannot continue with text');
        sawText = true;
        parser.push(chunk);
        return;
      }
      if (sawText) throw new TypeError('DocumentReader.push: a text stream cannot continue with bytes');
      bytes ??= new ByteLineDecoder(parser);
      bytes.push(chunk);
    },
    end() {
      bytes?.end();
      return parser.end();
    },
  };
}

export function readerFromLineParser(parser: LineParser): DocumentReader {
  const splitter = new LineSplitter(parser);
  return readerFromTextParser({
    push: (text) => splitter.push(text),
    pushUndecodable: (lineText) => splitter.pushUndecodable(lineText),
    end() {
      splitter.end();
      return parser.end();
    },
  });
}

export function documentRead(reader: DocumentReader, input: ReadInput): Document {
  reader.push(input);
  return reader.end();
}

/** Errors found in a later pass (scheme checks at the end) must still come out in file order. */
export function errorsSort(errors: ReadError[]): ReadError[] {
  return errors.sort((a, b) => a.line - b.line);
}

/**
 * Streaming consumers (the CLI's `check`, the import worker) take each good utterance as it is read
 * instead of keeping them all: the document then comes back with no utterances, only errors, and
 * memory stays flat however big the file.
 */
export interface UtteranceSinkOption {
  onUtterance?: (utterance: Utterance) => void;
}

/** The sink a parser emits to: the caller's, or one collecting into `store`. */
export function utteranceSink(option: UtteranceSinkOption, store: Utterance[]): (utterance: Utterance) => void {
  return option.onUtterance ?? ((utterance) => store.push(utterance));
}

export const UNDECODABLE_MESSAGE = 'undecodable bytes: this line is not valid UTF-8';
