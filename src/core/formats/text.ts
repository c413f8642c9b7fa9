import { tokeniserCreate, type Tokeniser, type TokeniserSpec } from '../tokenise';
import type { Document, ReadError, Scheme, Utterance } from '../types';
import { FormatWriteError, textHasLineBreak } from './errors';
import { documentRead, readerFromLineParser, UNDECODABLE_MESSAGE, type DocumentReader, type LineParser, type ReadInput, type UtteranceSinkOption, utteranceSink } from './reader';

export interface TextReadOptions extends UtteranceSinkOption {
  /** Default: words. */
  tokeniser?: TokeniserSpec;
  /** The scheme recorded on the document (every tag is O, so it only matters downstream). Default: iob2. */
  scheme?: Scheme;
}

function lineIsBlank(text: string): boolean {
  return text.trim() === '';
}

class TextParser implements LineParser {
  private readonly utterances: Utterance[] = [];
  private readonly errors: ReadError[] = [];
  private readonly tokenise: Tokeniser;
  private readonly scheme: Scheme;
  private readonly emit: (utterance: Utterance) => void;

  constructor(options: TextReadOptions) {
    this.tokenise = tokeniserCreate(options.tokeniser ?? { kind: 'words' });
    this.scheme = options.scheme ?? 'iob2';
    this.emit = utteranceSink(options, this.utterances);
  }

  lineAdd(source: string, start: number, end: number, line: number): void {
    const text = source.slice(start, end);
    if (lineIsBlank(text)) return;
    const tokens = this.tokenise(text);
    this.emit({ text, tokens, tags: new Array<string>(tokens.length).fill('O'), meta: {}, line });
  }

  lineUndecodable(line: number): void {
    this.errors.push({ line, message: `${UNDECODABLE_MESSAGE}; it is skipped` });
  }

  end(): Document {
    return { scheme: this.scheme, utterances: this.utterances, errors: this.errors };
  }
}

/** Incremental plain-text reader: one utterance per non-blank line, all tags O. */
export function textReader(options: TextReadOptions = {}): DocumentReader {
  return readerFromLineParser(new TextParser(options));
}

export function textRead(input: ReadInput, options: TextReadOptions = {}): Document {
  return documentRead(textReader(options), input);
}

/** One text per line, final newline; tags, ids and meta are not kept. */
export function textWrite(utterances: readonly Utterance[]): string {
  let out = '';
  utterances.forEach((utterance, index) => {
    const { text } = utterance;
    const fail = (reason: string) => new FormatWriteError('plain text', utterance, index, reason);
    if (textHasLineBreak(text)) throw fail('its text contains a line break');
    if (lineIsBlank(text)) throw fail('its text is blank, and readers skip blank lines');
    // A reader strips U+FEFF at the very start of a file as a byte order mark.
    if (index === 0 && text.charCodeAt(0) === 0xfeff) throw fail('its text starts with U+FEFF, which reads as a byte order mark');
    out += `${text}\n`;
  });
  return out;
}
