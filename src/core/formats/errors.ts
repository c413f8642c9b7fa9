import type { Utterance } from '../types';

/**
 * A writer cannot represent an utterance faithfully (a token with a space in a column file, a newline
 * in a one-line field…). Thrown rather than written lossily; names the utterance by position and id.
 */
export class FormatWriteError extends Error {
  override name = 'FormatWriteError';
  /** 0-based position of the utterance in the list given to the writer. */
  readonly index: number;
  readonly id: string | undefined;
  readonly format: string;

  constructor(format: string, utterance: Utterance, index: number, reason: string) {
    const idPart = utterance.id === undefined ? '' : ` (id ${JSON.stringify(utterance.id)})`;
    super(`cannot write utterance ${index + 1}${idPart} as ${format}: ${reason}`);
    this.index = index;
    this.id = utterance.id;
    this.format = format;
  }
}

const LINE_BREAK = /[\n\r]/;

export function textHasLineBreak(text: string): boolean {
  return LINE_BREAK.test(text);
}
