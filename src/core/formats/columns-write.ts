import type { Utterance } from '../types';
import { commentKeyIsWritable } from './columns-comment';
import { FormatWriteError, textHasLineBreak } from './errors';

// \s has no members outside the BMP, so the non-Unicode form is equivalent and quicker.
const WHITE_SPACE = /\s/;
const DOCSTART = '-DOCSTART-';

/** A reason the utterance cannot be written as columns and read back unchanged. */
class Unwritable extends Error {}

function fieldCheck(value: string | undefined, what: string): void {
  if (value !== undefined && textHasLineBreak(value)) throw new Unwritable(`${what} contains a line break`);
}

function headerLines(utterance: Utterance): string {
  const { id, intent, text, meta, tokens, tags } = utterance;
  if (tokens.length === 0) throw new Unwritable('it has no tokens; a column file needs at least one token line');
  if (tags.length !== tokens.length) throw new Unwritable(`it has ${tokens.length} tokens but ${tags.length} tags`);
  fieldCheck(id, 'id');
  fieldCheck(intent, 'intent');
  fieldCheck(text, 'text');
  let out = '';
  if (id !== undefined) out += `# id = ${id}\n`;
  if (intent !== undefined) out += `# intent = ${intent}\n`;
  out += `# text = ${text}\n`;
  // Default sort compares UTF-16 code units, which is the documented canonical key order.
  for (const key of Object.keys(meta).sort()) {
    if (!commentKeyIsWritable(key)) throw new Unwritable(`meta key ${JSON.stringify(key)} cannot be a "# key = value" comment key`);
    const value = meta[key] ?? '';
    fieldCheck(value, `meta value for ${JSON.stringify(key)}`);
    out += `# ${key} = ${value}\n`;
  }
  return out;
}

/**
 * Token lines; tokens are found again on reading by searching `# text` in order, so each must be
 * the first match after the previous one.
 */
function tokenLines(utterance: Utterance): string {
  const { text, tokens, tags } = utterance;
  let out = '';
  let offset = 0;
  for (let i = 0; i < tokens.length; i++) {
    const { start, end } = tokens[i] ?? { start: -1, end: -1 };
    if (!(start >= offset && end > start && end <= text.length)) throw new Unwritable(`token ${i} has offsets outside the text or out of order`);
    const token = text.slice(start, end);
    if (WHITE_SPACE.test(token)) throw new Unwritable(`token ${i} ${JSON.stringify(token)} contains white space`);
    if (token === DOCSTART) throw new Unwritable(`token ${i} is ${DOCSTART}, which readers skip`);
    if (text.indexOf(token, offset) !== start) throw new Unwritable(`token ${i} ${JSON.stringify(token)} would be found earlier in the text on reading`);
    const tag = tags[i] ?? '';
    if (tag === '' || WHITE_SPACE.test(tag)) throw new Unwritable(`tag ${i} ${JSON.stringify(tag)} is empty or contains white space`);
    out += `${token}\t${tag}\n`;
    offset = end;
  }
  return out;
}

/**
 * Canonical IOB/BIOES column file: per utterance `# id`, `# intent` (when present), `# text`, other
 * meta keys by code unit, then `token<TAB>tag` lines; a blank line between utterances; one final
 * newline. Tags are written as they are (convert them first to change scheme). Throws
 * `FormatWriteError` for an utterance that could not be read back unchanged.
 */
export function columnsWrite(utterances: readonly Utterance[]): string {
  let out = '';
  utterances.forEach((utterance, index) => {
    let block: string;
    try {
      block = headerLines(utterance) + tokenLines(utterance);
    } catch (error) {
      if (error instanceof Unwritable) throw new FormatWriteError('IOB columns', utterance, index, error.message);
      throw error;
    }
    out += index === 0 ? block : `\n${block}`;
  });
  return out;
}
