import { tokeniserCreate, type Tokeniser, type TokeniserSpec } from '../tokenise';
import type { Document, ReadError, Scheme, Utterance } from '../types';
import { jsonlRecordParse } from './jsonl-record';
import { documentRead, readerFromLineParser, UNDECODABLE_MESSAGE, type DocumentReader, type LineParser, type ReadInput, type UtteranceSinkOption, utteranceSink } from './reader';

export interface JsonlReadOptions extends UtteranceSinkOption {
  /** Tokenises records that carry no "tokens" (default: words). */
  tokeniser?: TokeniserSpec;
  /** Scheme of the tags made from "spans" (default: iob2). */
  scheme?: Scheme;
}

const NON_BLANK = /\S/;

class JsonlParser implements LineParser {
  private readonly utterances: Utterance[] = [];
  private readonly errors: ReadError[] = [];
  private readonly tokenise: Tokeniser;
  private readonly scheme: Scheme;
  private readonly emit: (utterance: Utterance) => void;

  constructor(options: JsonlReadOptions) {
    this.tokenise = tokeniserCreate(options.tokeniser ?? { kind: 'words' });
    this.scheme = options.scheme ?? 'iob2';
    this.emit = utteranceSink(options, this.utterances);
  }

  lineAdd(text: string, start: number, end: number, line: number): void {
    const source = text.slice(start, end);
    if (!NON_BLANK.test(source)) return;
    const parsed = jsonlRecordParse(source, this.tokenise, this.scheme);
    if (typeof parsed === 'string') {
      this.errors.push({ line, message: parsed });
      return;
    }
    parsed.line = line;
    this.emit(parsed);
  }

  lineUndecodable(line: number): void {
    this.errors.push({ line, message: `${UNDECODABLE_MESSAGE}; its record is skipped` });
  }

  end(): Document {
    return { scheme: this.scheme, utterances: this.utterances, errors: this.errors };
  }
}

/**
 * Incremental JSON Lines reader. An invalid tokeniser spec throws `TokeniserError` here, before any
 * input is read: it is a setting, not bad input.
 */
export function jsonlReader(options: JsonlReadOptions = {}): DocumentReader {
  return readerFromLineParser(new JsonlParser(options));
}

/** Read JSON Lines (offsets in code points); never throws on bad input. */
export function jsonlRead(input: ReadInput, options: JsonlReadOptions = {}): Document {
  return documentRead(jsonlReader(options), input);
}
