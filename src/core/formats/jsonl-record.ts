import { slotNameIsValid, tagsFromSpans } from '../schemes';
import type { Tokeniser } from '../tokenise';
import type { Scheme, Span, Token, Utterance } from '../types';
import { codePointLength, offsetsCodePointsToUtf16, offsetsUtf16ToCodePoints } from './code-points';

/** Tokens with both offsets mapped through `convert`, which takes and returns one flat list. */
function tokensMapped(tokens: readonly Token[], convert: (flat: number[]) => number[]): Token[] {
  const flat: number[] = new Array<number>(tokens.length * 2);
  tokens.forEach((t, i) => {
    flat[2 * i] = t.start;
    flat[2 * i + 1] = t.end;
  });
  const mapped = convert(flat);
  return tokens.map((_, i) => ({ start: mapped[2 * i] ?? 0, end: mapped[2 * i + 1] ?? 0 }));
}

/** Index of the token whose `key` offset equals `offset` (tokens sorted), or -1. */
function tokenIndexAt(tokens: readonly Token[], key: 'start' | 'end', offset: number): number {
  let low = 0;
  let high = tokens.length - 1;
  while (low <= high) {
    const mid = (low + high) >> 1;
    const value = tokens[mid]?.[key] ?? 0;
    if (value === offset) return mid;
    if (value < offset) low = mid + 1;
    else high = mid - 1;
  }
  return -1;
}

/** A problem with one record; the reader turns it into a `ReadError` on the record's line. */
class RecordError extends Error {}

type Json = Record<string, unknown>;

function objectIs(value: unknown): value is Json {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** `null` counts as absent: Python's `json.dumps` writes None that way. */
function optionalString(record: Json, key: string): string | undefined {
  const value = record[key];
  if (value === undefined || value === null) return undefined;
  if (typeof value !== 'string') throw new RecordError(`"${key}" must be a string, got ${JSON.stringify(value)}`);
  return value;
}

function offsetRead(item: Json, key: 'start' | 'end', where: string, length: number): number {
  const value = item[key];
  if (typeof value !== 'number' || !Number.isInteger(value)) {
    throw new RecordError(`${where}.${key} must be an integer code-point offset, got ${JSON.stringify(value)}`);
  }
  if (value < 0 || value > length) {
    throw new RecordError(`${where}.${key} = ${value} is out of range: the text has ${length} code points`);
  }
  return value;
}

function rangeRead(item: unknown, where: string, length: number): { start: number; end: number; item: Json } {
  if (!objectIs(item)) throw new RecordError(`${where} must be an object with "start" and "end"`);
  const start = offsetRead(item, 'start', where, length);
  const end = offsetRead(item, 'end', where, length);
  if (end <= start) throw new RecordError(`${where} is empty or reversed: start ${start}, end ${end}`);
  return { start, end, item };
}

/** Code-point token ranges from the file, sorted and disjoint. */
function tokensRead(value: unknown, text: string, length: number): Token[] {
  if (!Array.isArray(value)) throw new RecordError('"tokens" must be an array of {"start", "end"} objects');
  const tokens: Token[] = [];
  let codePoints: string[] | undefined;
  let previous: Token | undefined;
  value.forEach((raw, i) => {
    const where = `tokens[${i}]`;
    const { start, end, item } = rangeRead(raw, where, length);
    if (previous !== undefined && start < previous.start) throw new RecordError(`${where} starts before tokens[${i - 1}]: tokens must be sorted`);
    if (previous !== undefined && start < previous.end) throw new RecordError(`${where} overlaps tokens[${i - 1}]`);
    const written = item.text;
    if (written !== undefined) {
      codePoints ??= Array.from(text);
      const actual = codePoints.slice(start, end).join('');
      if (written !== actual) {
        throw new RecordError(
          `token/offset mismatch: ${where}.text is ${JSON.stringify(written)} but the text at [${start}, ${end}) is ${JSON.stringify(actual)}`,
        );
      }
    }
    previous = { start, end };
    tokens.push(previous);
  });
  return tokens;
}

/** Spans as token-index ranges; their code-point offsets must fall on token boundaries. */
function spansRead(value: unknown, tokens: readonly Token[], length: number): Span[] {
  if (value === undefined || value === null) return [];
  if (!Array.isArray(value)) throw new RecordError('"spans" must be an array of {"start", "end", "label"} objects');
  const spans = value.map((raw, i): Span & { index: number } => {
    const where = `spans[${i}]`;
    const { start, end, item } = rangeRead(raw, where, length);
    const label = item.label;
    if (typeof label !== 'string' || !slotNameIsValid(label)) {
      throw new RecordError(`${where}.label must be a non-empty slot name without white space, got ${JSON.stringify(label)}`);
    }
    const first = tokenIndexAt(tokens, 'start', start);
    const last = tokenIndexAt(tokens, 'end', end);
    if (first < 0 || last < first) {
      throw new RecordError(`${where} [${start}, ${end}) is not on token boundaries`);
    }
    return { start: first, end: last + 1, slot: label, index: i };
  });
  spans.sort((a, b) => a.start - b.start || a.end - b.end);
  for (let i = 1; i < spans.length; i++) {
    const [a, b] = [spans[i - 1], spans[i]];
    if (a && b && b.start < a.end) throw new RecordError(`spans[${a.index}] and spans[${b.index}] overlap`);
  }
  return spans.map(({ start, end, slot }) => ({ start, end, slot }));
}

function metaRead(value: unknown): Record<string, string> {
  if (value === undefined || value === null) return {};
  if (!objectIs(value)) throw new RecordError('"meta" must be an object of strings');
  for (const [key, item] of Object.entries(value)) {
    if (typeof item !== 'string') throw new RecordError(`meta ${JSON.stringify(key)} must be a string, got ${JSON.stringify(item)}`);
  }
  return value as Record<string, string>;
}

function utteranceBuild(record: Json, tokenise: Tokeniser, scheme: Scheme): Utterance {
  const text = record.text;
  if (typeof text !== 'string') {
    throw new RecordError(text === undefined ? 'missing "text"' : `"text" must be a string, got ${JSON.stringify(text)}`);
  }
  const id = optionalString(record, 'id');
  const intent = optionalString(record, 'intent');
  const meta = metaRead(record.meta);
  let tokens: Token[];
  let tokensCodePoints: Token[];
  const length = codePointLength(text);
  // Without surrogate pairs both kinds of offset coincide, and one token list serves for both.
  const same = length === text.length;
  if (record.tokens === undefined || record.tokens === null) {
    tokens = tokenise(text);
    tokensCodePoints = same ? tokens : tokensMapped(tokens, (flat) => offsetsUtf16ToCodePoints(text, flat));
  } else {
    tokensCodePoints = tokensRead(record.tokens, text, length);
    tokens = same ? tokensCodePoints : tokensMapped(tokensCodePoints, (flat) => offsetsCodePointsToUtf16(text, flat));
  }
  const spans = spansRead(record.spans, tokensCodePoints, length);
  const utterance: Utterance = { text, tokens, tags: tagsFromSpans(spans, tokens.length, scheme), meta };
  if (id !== undefined) utterance.id = id;
  if (intent !== undefined) utterance.intent = intent;
  return utterance;
}

/** One JSON Lines record → an utterance, or the message saying what is wrong with it. */
export function jsonlRecordParse(source: string, tokenise: Tokeniser, scheme: Scheme): Utterance | string {
  let record: unknown;
  try {
    record = JSON.parse(source);
  } catch (error) {
    return `invalid JSON: ${(error as Error).message}`;
  }
  if (!objectIs(record)) return 'each line must be a JSON object';
  try {
    return utteranceBuild(record, tokenise, scheme);
  } catch (error) {
    if (error instanceof RecordError) return error.message;
    throw error;
  }
}
