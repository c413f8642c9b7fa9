import { tagKind } from '../rules/tagKinds';
import { tagParse, type ParsedTag } from '../schemes';

/** A distinct tag string, parsed once; every utterance shares this one string. */
export interface TagEntry {
  tag: string;
  parsed: ParsedTag | null;
  /** The tag's `tagKind`, so validators need not read it again. */
  kind: number;
}

/**
 * The trie is rows of `TRIE_WIDTH` cells, one per ASCII code unit; a node is known by where its row
 * starts, so a step is `row = trie[row + code]`. Row 0 means "no such tag on the trie" and stays all zero.
 */
export const TRIE_SHIFT = 7;
export const TRIE_WIDTH = 1 << TRIE_SHIFT;
export const TRIE_ROOT = TRIE_WIDTH;
/** Trie size cap: a file of countless distinct (say malformed) tags falls back to the map, memory stays bounded. */
const NODES_MAX = 4096;

/**
 * Interns tags straight from the line they sit in, so the million tags of a big file cost no string
 * allocation each. A caller scanning a tag anyway walks the trie as it goes (`trie`, `entries`) and
 * lands on the entry with no string compare. Tags off the trie (new, non-ASCII, or past the cap) go
 * through `lookup`, which files them.
 */
export class TagTable {
  /** Child links (see `TRIE_WIDTH`); a typed array keeps each step one plain load. */
  trie = new Int32Array(64 * TRIE_WIDTH);
  /** The entry a trie node stands for, by node number (`row >> TRIE_SHIFT`). */
  readonly entries: (TagEntry | undefined)[] = [undefined, undefined];
  private readonly byTag = new Map<string, TagEntry>();

  /** The entry for `text[start, end)` (non-empty), by trie walk when it can. */
  find(text: string, start: number, end: number): TagEntry {
    const trie = this.trie;
    let row = TRIE_ROOT;
    for (let i = start; i < end && row !== 0; i++) {
      const code = text.charCodeAt(i);
      row = code < TRIE_WIDTH ? (trie[row + code] ?? 0) : 0;
    }
    return this.entries[row >> TRIE_SHIFT] ?? this.lookup(text, start, end);
  }

  /** The entry for `text[start, end)` (non-empty), off the trie. */
  lookup(text: string, start: number, end: number): TagEntry {
    const tag = text.slice(start, end);
    let entry = this.byTag.get(tag);
    if (entry === undefined) {
      entry = { tag, parsed: tagParse(tag), kind: tagKind(tag) };
      this.byTag.set(tag, entry);
      this.trieAdd(entry);
    }
    return entry;
  }

  private trieAdd(entry: TagEntry): void {
    const tag = entry.tag;
    for (let i = 0; i < tag.length; i++) if (tag.charCodeAt(i) >= TRIE_WIDTH) return;
    if (this.entries.length + tag.length > NODES_MAX) return;
    let row = TRIE_ROOT;
    for (let i = 0; i < tag.length; i++) {
      const cell = row + tag.charCodeAt(i);
      let child = this.trie[cell] ?? 0;
      if (child === 0) {
        child = (this.entries.push(undefined) - 1) * TRIE_WIDTH;
        this.trieGrow();
        this.trie[cell] = child;
      }
      row = child;
    }
    this.entries[row >> TRIE_SHIFT] = entry;
  }

  private trieGrow(): void {
    const rows = this.entries.length;
    if (rows * TRIE_WIDTH <= this.trie.length) return;
    const grown = new Int32Array(this.trie.length * 2);
    grown.set(this.trie);
    this.trie = grown;
  }
}
