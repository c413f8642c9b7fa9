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

export function lineText(line: number | null | undefined): string {
  return line === null || line === undefined ? 'line unknown' : `line ${String(line)}`;
}

export function placeText(place: AlignErrorPlace): string {
  return `${place.layer} (${lineText(place.line)})`;
}
