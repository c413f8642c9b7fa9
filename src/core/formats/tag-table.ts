import { tagKind } from '../rules/tagKinds';
import { tagParse, type ParsedTag } from '../schemes';

/** A distinct tag string, parsed once; every utterance shares this one string. */
export interface TagEntry {
  tag: string;
  parsed: ParsedTag | null;
  /** The tag's `tagKind`, so validators need not read it again. */
  kind: number;
}

/** Trie rows are indexed by ASCII code unit: `trie[node * TRIE_WIDTH + code]` is the child node. */
export const TRIE_WIDTH = 128;
/** The trie's root node; node 0 is "no such tag on the trie" and its row stays all zero. */
export const TRIE_ROOT = 1;
/** Trie size cap: a file of countless distinct (say malformed) tags falls back to the map, memory stays bounded. */
const NODES_MAX = 4096;

/**
 * Interns tags straight from the line they sit in, so the million tags of a big file cost no string
 * allocation each. A caller scanning a tag anyway walks the trie as it goes (`trie`, `entries`) and
 * lands on the entry with no string compare. Tags off the trie (new, non-ASCII, or past the cap) go
 * through `lookup`, which files them.
 */
export class TagTable {
  /** Child links, one row of `TRIE_WIDTH` per node; a typed array keeps each step one plain load. */
  trie = new Int32Array(64 * TRIE_WIDTH);
  /** The entry a trie node stands for, by node. */
  readonly entries: (TagEntry | undefined)[] = [undefined, undefined];
  private readonly byTag = new Map<string, TagEntry>();

  /** The entry for `text[start, end)` (non-empty), by trie walk when it can. */
  find(text: string, start: number, end: number): TagEntry {
    const trie = this.trie;
    let node = TRIE_ROOT;
    for (let i = start; i < end && node !== 0; i++) {
      const code = text.charCodeAt(i);
      node = code < TRIE_WIDTH ? (trie[node * TRIE_WIDTH + code] ?? 0) : 0;
    }
    return this.entries[node] ?? this.lookup(text, start, end);
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
    let node = TRIE_ROOT;
    for (let i = 0; i < tag.length; i++) {
      const cell = node * TRIE_WIDTH + tag.charCodeAt(i);
      let child = this.trie[cell] ?? 0;
      if (child === 0) {
        child = this.entries.push(undefined) - 1;
        this.trieGrow();
        this.trie[cell] = child;
      }
      node = child;
    }
    this.entries[node] = entry;
  }

  private trieGrow(): void {
    const rows = this.entries.length;
    if (rows * TRIE_WIDTH <= this.trie.length) return;
    const grown = new Int32Array(this.trie.length * 2);
    grown.set(this.trie);
    this.trie = grown;
  }
}
