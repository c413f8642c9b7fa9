import { tagCodeBegins, tagCodeSlot } from './types';

/** Spans of one utterance in reusable typed arrays: [start, end) token indices and slot codes. */
export class SpanList {
  count = 0;
  start: Int32Array;
  end: Int32Array;
  slot: Int32Array;

  constructor(capacity = 64) {
    this.start = new Int32Array(capacity);
    this.end = new Int32Array(capacity);
    this.slot = new Int32Array(capacity);
  }

  private grow(): void {
    const capacity = this.start.length * 2;
    const start = new Int32Array(capacity);
    const end = new Int32Array(capacity);
    const slot = new Int32Array(capacity);
    start.set(this.start);
    end.set(this.end);
    slot.set(this.slot);
    this.start = start;
    this.end = end;
    this.slot = slot;
  }

  /**
   * Read the spans of IOB2 tag codes in [from, to): B opens a span, I extends a span of its slot, and a
   * stray I opens one (CoNLL-2000 reading, as `spansFromTags`; `layersAlign` gives legal IOB2 anyway).
   */
  decode(tags: Int32Array, from: number, to: number): void {
    this.count = 0;
    let previous = 0;
    for (let t = from; t < to; t++) {
      const code = tags[t] ?? 0;
      const continues = code > 0 && !tagCodeBegins(code) && tagCodeSlot(previous) === tagCodeSlot(code);
      previous = code;
      if (code <= 0) continue;
      if (!continues) {
        if (this.count === this.start.length) this.grow();
        this.start[this.count] = t - from;
        this.end[this.count] = t - from + 1;
        this.slot[this.count] = tagCodeSlot(code);
        this.count++;
      } else {
        this.end[this.count - 1] = t - from + 1;
      }
    }
  }
}

/** Spans equal in start, end and slot. Both lists are sorted by start with distinct starts. */
export function spansExactMatches(a: SpanList, b: SpanList, perSlot: Float64Array | null): number {
  let i = 0;
  let j = 0;
  let matched = 0;
  while (i < a.count && j < b.count) {
    const sa = a.start[i] ?? 0;
    const sb = b.start[j] ?? 0;
    if (sa < sb) i++;
    else if (sb < sa) j++;
    else {
      const slot = a.slot[i] ?? 0;
      if (a.end[i] === b.end[j] && slot === b.slot[j]) {
        matched++;
        if (perSlot !== null) perSlot[slot] = (perSlot[slot] ?? 0) + 1;
      }
      i++;
      j++;
    }
  }
  return matched;
}

function nextOfSlot(list: SpanList, from: number, slot: number): number {
  let k = from;
  while (k < list.count && list.slot[k] !== slot) k++;
  return k;
}

/**
 * Size of a maximum one-to-one matching of same-slot overlapping spans. Within one layer spans are
 * disjoint and sorted, so per slot a two-pointer sweep is optimal: of two overlapping spans, the one
 * ending first can overlap no later span of the other side, so pairing them never loses a match.
 */
export function spansOverlapMatches(a: SpanList, b: SpanList): number {
  let matched = 0;
  for (let first = 0; first < a.count; first++) {
    const slot = a.slot[first] ?? 0;
    if (nextOfSlot(a, 0, slot) !== first) continue; // this slot was swept from its first span
    let i = first;
    let j = nextOfSlot(b, 0, slot);
    while (i < a.count && j < b.count) {
      if ((a.end[i] ?? 0) <= (b.start[j] ?? 0)) i = nextOfSlot(a, i + 1, slot);
      else if ((b.end[j] ?? 0) <= (a.start[i] ?? 0)) j = nextOfSlot(b, j + 1, slot);
      else {
        matched++;
        i = nextOfSlot(a, i + 1, slot);
        j = nextOfSlot(b, j + 1, slot);
      }
    }
  }
  return matched;
}
