import { spansAreWellFormed, spansFromTags, tagParse } from '../schemes';
import type { Utterance } from '../types';
import { offsetsUtf16ToCodePoints, textHasSurrogates } from './code-points';
import { FormatWriteError } from './errors';

function tokensProblem(utterance: Utterance): string | null {
  const { tokens, tags, text } = utterance;
  if (tags.length !== tokens.length) return `it has ${tokens.length} tokens but ${tags.length} tags`;
  let previousEnd = 0;
  for (let i = 0; i < tokens.length; i++) {
    const token = tokens[i];
    if (token === undefined || !(token.start >= previousEnd && token.end > token.start && token.end <= text.length)) {
      return `token ${i} has offsets outside the text or out of order`;
    }
    previousEnd = token.end;
    const tag = tags[i] ?? '';
    // The lenient decoder would read it as O: refuse rather than lose a label silently.
    if (tagParse(tag) === null) return `tag ${i} ${JSON.stringify(tag)} is not a valid tag`;
  }
  return null;
}

function metaJson(meta: Record<string, string>): string {
  // Built by hand: an object literal would put integer-like keys first, not in code-unit order.
  const keys = Object.keys(meta).sort();
  return `{${keys.map((key) => `${JSON.stringify(key)}:${JSON.stringify(meta[key])}`).join(',')}}`;
}

function utteranceJson(utterance: Utterance, index: number): string {
  const problem = tokensProblem(utterance);
  if (problem !== null) throw new FormatWriteError('JSON Lines', utterance, index, problem);
  const { text, tokens } = utterance;
  const flat: number[] = new Array<number>(tokens.length * 2);
  tokens.forEach((t, i) => {
    flat[2 * i] = t.start;
    flat[2 * i + 1] = t.end;
  });
  if (textHasSurrogates(text)) flat.splice(0, flat.length, ...offsetsUtf16ToCodePoints(text, flat));
  if (flat.includes(-1)) throw new FormatWriteError('JSON Lines', utterance, index, 'a token offset splits a surrogate pair');
  const spans = spansFromTags(utterance.tags);
  if (!spansAreWellFormed(spans, tokens.length)) throw new FormatWriteError('JSON Lines', utterance, index, 'its tags do not decode to spans');
  const parts: string[] = [];
  if (utterance.id !== undefined) parts.push(`"id":${JSON.stringify(utterance.id)}`);
  parts.push(`"text":${JSON.stringify(text)}`);
  if (utterance.intent !== undefined) parts.push(`"intent":${JSON.stringify(utterance.intent)}`);
  const tokenItems: string[] = [];
  for (let i = 0; i < tokens.length; i++) tokenItems.push(`{"start":${flat[2 * i]},"end":${flat[2 * i + 1]}}`);
  parts.push(`"tokens":[${tokenItems.join(',')}]`);
  const spanItems = spans.map(
    (span) => `{"start":${flat[2 * span.start]},"end":${flat[2 * span.end - 1]},"label":${JSON.stringify(span.slot)}}`,
  );
  parts.push(`"spans":[${spanItems.join(',')}]`);
  if (Object.keys(utterance.meta).length > 0) parts.push(`"meta":${metaJson(utterance.meta)}`);
  return `{${parts.join(',')}}`;
}

/**
 * Canonical JSON Lines: keys id, text, intent, tokens, spans, meta; id and intent omitted when
 * absent, meta when empty; offsets in code points. Spans come from the lenient `spansFromTags`, so
 * an illegal tag sequence is written as the CoNLL-2000 evaluation would read it.
 */
export function jsonlWrite(utterances: readonly Utterance[]): string {
  let out = '';
  utterances.forEach((utterance, index) => {
    out += `${utteranceJson(utterance, index)}\n`;
  });
  return out;
}
