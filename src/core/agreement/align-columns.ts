import type { ColumnsTarget, ColumnsUtterance } from '../formats/columns-target';
import type { TagEntry } from '../formats/tag-table';
import type { AlignLayerData } from './align-layer';
import { FloatGrow, IntGrow } from './align-grow';
import { LabelInterner, RawPrefix, RawTagTable } from './labels';
import { MISSING } from './types';

/** A first guess of a column file's size from its bytes (a token line is ~18 bytes, an utterance ~220 in our data). */
export function alignColumnsSize(bytes: number): { utterances: number; tokens: number } {
  return { utterances: Math.ceil(bytes / 160), tokens: Math.ceil(bytes / 14) };
}

/**
 * A column reader's target (see `columnsReaderTo`) that writes one layer's `AlignLayerData` as the
 * file is scanned: no Token, tag list or Utterance object per utterance. It equals what
 * `AlignLayerGatherer` makes of the reader's utterances (tested), slot and intent codes included:
 * tags are encoded, and labels interned, only once the utterance is kept.
 */
export class AlignColumnsTarget implements ColumnsTarget {
  private readonly ids: (string | null)[] = [];
  private readonly texts: string[] = [];
  private readonly lines: FloatGrow;
  private readonly tokenStart: IntGrow;
  private readonly ranges: IntGrow;
  private readonly tokenLines: FloatGrow;
  private readonly tagCounts: IntGrow;
  private readonly tags: IntGrow;
  private readonly intents: IntGrow;
  private readonly slots = new LabelInterner(1);
  private readonly raw = new RawTagTable(this.slots);
  private readonly intentNames = new LabelInterner(0);
  /** The current utterance's tag entries, encoded when it is kept (a dropped one must intern nothing). */
  private pending: TagEntry[] = [];
  private pendingCount = 0;
  /** Raw tag code of the last entry seen: runs of one tag (O above all) skip the map. */
  private lastEntry: TagEntry | undefined;
  private lastCode = 0;
  /** Lines the reader read, once it has ended. */
  lineCount = 0;

  constructor(
    readonly name: string,
    size: { utterances: number; tokens: number } = { utterances: 1024, tokens: 16384 },
  ) {
    this.lines = new FloatGrow(size.utterances);
    this.tokenStart = new IntGrow(size.utterances + 1);
    this.ranges = new IntGrow(2 * size.tokens);
    this.tokenLines = new FloatGrow(size.tokens);
    this.tagCounts = new IntGrow(size.utterances);
    this.tags = new IntGrow(size.tokens);
    this.intents = new IntGrow(size.utterances);
    this.tokenStart.push(0);
  }

  tokenAdd(entry: TagEntry, line: number, start: number, end: number): void {
    if (this.pendingCount === this.pending.length) this.pending.push(entry);
    else this.pending[this.pendingCount] = entry;
    this.pendingCount++;
    this.tokenLines.push(line);
    // Only an utterance with an error has unplaced tokens, and it is dropped.
    this.ranges.reserve(2);
    this.ranges.data[this.ranges.length++] = start < 0 ? 0 : start;
    this.ranges.data[this.ranges.length++] = start < 0 ? 0 : end;
  }

  utteranceKeep(u: ColumnsUtterance): void {
    this.ids.push(u.id === undefined || u.id === '' ? null : u.id);
    this.texts.push(u.text);
    this.lines.push(u.line);
    const count = this.pendingCount;
    this.tagsEncode(count);
    this.tokenStart.push(this.tags.length);
    this.tagCounts.push(count);
    this.intents.push(u.intent === undefined ? MISSING : this.intentNames.code(u.intent));
    this.pendingCount = 0;
  }

  utteranceDrop(): void {
    const from = this.tags.length;
    this.tokenLines.length = from;
    this.ranges.length = 2 * from;
    this.pendingCount = 0;
  }

  linesRead(count: number): void {
    this.lineCount = count;
  }

  /** As `AlignLayerGatherer`'s `tagsEncode`: the lenient CoNLL-2000 reading, then IOB2 codes. */
  private tagsEncode(count: number): void {
    this.tags.reserve(count);
    const out = this.tags.data;
    const at = this.tags.length;
    const raw = this.raw;
    let open = 0;
    for (let t = 0; t < count; t++) {
      const entry = this.pending[t] as TagEntry;
      let code = this.lastCode;
      if (entry !== this.lastEntry) {
        code = raw.code(entry.tag);
        this.lastEntry = entry;
        this.lastCode = code;
      }
      const prefix = raw.prefix[code] ?? RawPrefix.O;
      const slot = raw.slot[code] ?? 0;
      if (prefix === RawPrefix.O) {
        open = 0;
        out[at + t] = 0;
        continue;
      }
      if ((prefix === RawPrefix.I || prefix === RawPrefix.E) && open === slot) {
        out[at + t] = 2 * slot;
      } else {
        out[at + t] = 2 * slot - 1;
        open = slot;
      }
      if (prefix === RawPrefix.E || prefix === RawPrefix.S) open = 0;
    }
    this.tags.length += count;
  }

  /**
   * The layer; its typed arrays are views of the arrays filled (no copy: at this size a copy is
   * tens of megabytes, and big fresh buffers bring on full collections).
   */
  done(): AlignLayerData {
    return {
      name: this.name,
      count: this.ids.length,
      ids: this.ids,
      lines: this.lines.data.subarray(0, this.lines.length),
      texts: this.texts,
      tokenStart: this.tokenStart.data.subarray(0, this.tokenStart.length),
      ranges: this.ranges.data.subarray(0, this.ranges.length),
      tokenLines: this.tokenLines.data.subarray(0, this.tokenLines.length),
      tagCounts: this.tagCounts.data.subarray(0, this.tagCounts.length),
      tags: this.tags.data.subarray(0, this.tags.length),
      slotNames: [...this.slots.names],
      intents: this.intents.data.subarray(0, this.intents.length),
      intentNames: [...this.intentNames.names],
    };
  }
}
