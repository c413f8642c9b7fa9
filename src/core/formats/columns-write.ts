import type { Utterance } from '../types';
import { commentKeyIsWritable } from './columns-comment';
import { FormatWriteError, textHasLineBreak } from './errors';

const WHITE_SPACE = /\s/u;
const DOCSTART = '-DOCSTART-';

function fieldCheck(value: string | undefined, what: string): string | null {
  if (value !== undefined && textHasLineBreak(value)) return `${what} contains a line break`;
  return null;
}

/**
 * Why an utterance cannot be written as columns and read back unchanged, or null. Tokens are found
 * again by searching `# text` in order, so each must be the first match after the previous one.
 */
function columnsProblem(utterance: Utterance): string | null {
  const { text, tokens, tags } = utterance;
  if (tokens.length === 0) return 'it has no tokens; a column file needs at least one token line';
  if (tags.length !== tokens.length) return `it has ${tokens.length} tokens but ${tags.length} tags`;
  const simple = fieldCheck(utterance.id, 'id') ?? fieldCheck(utterance.intent, 'intent') ?? fieldCheck(text, 'text');
  if (simple !== null) return simple;
  for (const [key, value] of Object.entries(utterance.meta)) {
    if (!commentKeyIsWritable(key)) return `meta key ${JSON.stringify(key)} cannot be a "# key = value" comment key`;
    const problem = fieldCheck(value, `meta value for ${JSON.stringify(key)}`);
    if (problem !== null) return problem;
  }
  let offset = 0;
  for (let i = 0; i < tokens.length; i++) {
    const { start, end } = tokens[i] ?? { start: -1, end: -1 };
    const token = text.slice(start, end);
    if (!(start >= offset && end > start && end <= text.length)) return `token ${i} has offsets outside the text or out of order`;
    if (WHITE_SPACE.test(token)) return `token ${i} ${JSON.stringify(token)} contains white space`;
    if (token === DOCSTART) return `token ${i} is ${DOCSTART}, which readers skip`;
    if (text.indexOf(token, offset) !== start) return `token ${i} ${JSON.stringify(token)} would be found earlier in the text on reading`;
    const tag = tags[i] ?? '';
    if (tag === '' || WHITE_SPACE.test(tag)) return `tag ${i} ${JSON.stringify(tag)} is empty or contains white space`;
    offset = end;
  }
  return null;
}

/** Lines of one utterance in canonical order: id, intent, text, other meta by code unit, tokens. */
function utteranceLines(utterance: Utterance, out: string[]): void {
  if (utterance.id !== undefined) out.push(`# id = ${utterance.id}`);
  if (utterance.intent !== undefined) out.push(`# intent = ${utterance.intent}`);
  out.push(`# text = ${utterance.text}`);
  // Default sort compares UTF-16 code units, which is the documented canonical key order.
  for (const key of Object.keys(utterance.meta).sort()) out.push(`# ${key} = ${utterance.meta[key] ?? ''}`);
  const { text, tokens, tags } = utterance;
  for (let i = 0; i < tokens.length; i++) {
    const token = tokens[i];
    if (token !== undefined) out.push(`${text.slice(token.start, token.end)}\t${tags[i] ?? ''}`);
  }
}

/**
 * Canonical IOB/BIOES column file. Tags are written as they are (convert them first to change
 * scheme). Throws `FormatWriteError` for an utterance that could not be read back unchanged.
 */
export function columnsWrite(utterances: readonly Utterance[]): string {
  const lines: string[] = [];
  utterances.forEach((utterance, index) => {
    const problem = columnsProblem(utterance);
    if (problem !== null) throw new FormatWriteError('IOB columns', utterance, index, problem);
    if (index > 0) lines.push('');
    utteranceLines(utterance, lines);
  });
  return lines.length === 0 ? '' : `${lines.join('\n')}\n`;
}
