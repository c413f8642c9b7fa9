import type { Utterance } from '../types';
import type { AlignError, AlignErrorKind, AlignErrorPlace } from './types';

/** Collects alignment errors: keeps the first `limit`, counts them all. */
export class AlignErrorList {
  readonly errors: AlignError[] = [];
  count = 0;

  constructor(private readonly limit: number) {}

  add(kind: AlignErrorKind, id: string | null, index: number, places: AlignErrorPlace[], message: string): void {
    this.count++;
    if (this.errors.length < this.limit) this.errors.push({ kind, id, index, places, message });
  }
}

export function utteranceName(id: string | null, index: number): string {
  return id === null ? `utterance #${String(index + 1)}` : `utterance ${id}`;
}

export function placeOf(layer: string, utterance: Utterance): AlignErrorPlace {
  return { layer, line: utterance.line ?? null };
}

export function lineText(line: number | null | undefined): string {
  return line === null || line === undefined ? 'line unknown' : `line ${String(line)}`;
}

export function placeText(place: AlignErrorPlace): string {
  return `${place.layer} (${lineText(place.line)})`;
}

/** Where a token sits: its own line when the reader recorded one, else the utterance's. */
export function tokenPlaceText(layer: string, utterance: Utterance, token: number): string {
  return `${layer} (${lineText(utterance.tokenLines?.[token] ?? utterance.line)})`;
}

export function tokenText(utterance: Utterance, token: number): string {
  const range = utterance.tokens[token];
  return range === undefined ? '' : utterance.text.slice(range.start, range.end);
}

/** Index of the first token whose text differs, -1 when the sequences match (counts must be equal). */
export function tokensFirstDifference(a: Utterance, b: Utterance): number {
  const sameText = a.text === b.text;
  for (let t = 0; t < a.tokens.length; t++) {
    const x = a.tokens[t];
    const y = b.tokens[t];
    if (x === undefined || y === undefined) return t;
    if (sameText && x.start === y.start && x.end === y.end) continue;
    if (a.text.slice(x.start, x.end) !== b.text.slice(y.start, y.end)) return t;
  }
  return -1;
}
