import { tagParse, type ParsedTag } from '../schemes';

/** A distinct tag string, parsed once; every utterance shares this one string. */
export interface TagEntry {
  tag: string;
  parsed: ParsedTag | null;
}

const LETTER_O = 79;
const SLOTS = 4096;

/**
 * Looks tags up straight from the line they sit in, so the million tags of a big file cost no
 * string allocation each; only a tag never seen before is sliced out. The slot comes from the
 * length and three code units (cheap, and enough to tell `B-day` from `I-day`); `startsWith`
 * settles collisions.
 */
export class TagTable {
  private readonly slots: (TagEntry[] | undefined)[] = new Array<TagEntry[] | undefined>(SLOTS);
  private readonly outside: TagEntry = { tag: 'O', parsed: tagParse('O') };

  /** The entry for `text[start, end)` (non-empty). */
  lookup(text: string, start: number, end: number): TagEntry {
    const length = end - start;
    const head = text.charCodeAt(start);
    if (length === 1 && head === LETTER_O) return this.outside;
    const mix = length * 31 + head * 7 + text.charCodeAt(start + (length >> 1)) * 3 + text.charCodeAt(end - 1);
    const slot = mix & (SLOTS - 1);
    let bucket = this.slots[slot];
    if (bucket === undefined) {
      bucket = [];
      this.slots[slot] = bucket;
    } else {
      for (let i = 0; i < bucket.length; i++) {
        const entry = bucket[i];
        if (entry !== undefined && entry.tag.length === length && text.startsWith(entry.tag, start)) return entry;
      }
    }
    const tag = text.slice(start, end);
    const entry = { tag, parsed: tagParse(tag) };
    bucket.push(entry);
    return entry;
  }
}
