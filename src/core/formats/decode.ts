import { NonAsciiFinder } from './ascii-runs';
import type { TextTarget } from './lines';

const LF = 0x0a;
const EMPTY = new Uint8Array(0);
/** ASCII lines closer than this to a line with other characters are decoded along with it (fewer, larger pieces). */
const MIXED_GAP = 256;

/** Index just past the LF ending the line that holds `at`, or the end of `bytes`. */
function lineEnd(bytes: Uint8Array, at: number): number {
  const newline = bytes.indexOf(LF, at);
  return newline < 0 ? bytes.length : newline + 1;
}

function bytesConcat(parts: readonly Uint8Array[]): Uint8Array {
  if (parts.length === 1) return parts[0] ?? EMPTY;
  let length = 0;
  for (const part of parts) length += part.length;
  const out = new Uint8Array(length);
  let at = 0;
  for (const part of parts) {
    out.set(part, at);
    at += part.length;
  }
  return out;
}

/**
 * UTF-8 bytes → text, whole lines at a time, so a multi-byte character split across chunks is never
 * cut (LF cannot occur inside a UTF-8 sequence). Each run of whole lines is decoded strictly in one
 * go; only when that fails is it decoded line by line, so a bad line is reported and the rest kept.
 * A BOM is passed through as U+FEFF: the text consumers strip it, so bytes and strings agree.
 */
export class ByteLineDecoder {
  /** Bytes of the unfinished last line, kept as pieces so a long line costs one copy, not one per chunk. */
  private pending: Uint8Array[] = [];
  private readonly strict = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
  private readonly lenient = new TextDecoder('utf-8', { fatal: false, ignoreBOM: true });

  constructor(private readonly target: TextTarget) {}

  push(chunk: Uint8Array): void {
    const lastNewline = chunk.lastIndexOf(LF);
    // Pending pieces are copies: a streaming caller may reuse its buffer for the next chunk.
    if (lastNewline < 0) {
      this.pending.push(chunk.slice());
      return;
    }
    // Only the line that straddles the chunk edge is joined; the rest is decoded in place, uncopied.
    let from = 0;
    if (this.pending.length > 0) {
      const firstNewline = chunk.indexOf(LF);
      this.regionDecode(bytesConcat([...this.pending, chunk.subarray(0, firstNewline + 1)]));
      from = firstNewline + 1;
    }
    this.pending = lastNewline + 1 < chunk.length ? [chunk.slice(lastNewline + 1)] : [];
    if (from <= lastNewline) this.regionDecode(chunk.subarray(from, lastNewline + 1));
  }

  end(): void {
    if (this.pending.length > 0) this.regionDecode(bytesConcat(this.pending));
    this.pending = [];
  }

  /**
   * Decode whole lines. Runs of pure-ASCII lines are decoded apart from lines with other characters
   * (and the ASCII lines close to them, up to `MIXED_GAP` bytes): the engine makes one-byte strings
   * of the former, which decode several times faster and are quicker to scan for everyone after.
   * UTF-8 never puts an LF inside a character (every byte of a multi-byte one is ≥ 0x80: RFC 3629
   * section 3, from memory), so decoding line runs apart changes no text.
   */
  private regionDecode(region: Uint8Array): void {
    const length = region.length;
    const finder = new NonAsciiFinder(region);
    let start = 0;
    let other = finder.find(0, length);
    while (other >= 0) {
      const mixedStart = region.lastIndexOf(LF, other) + 1;
      let mixedEnd = lineEnd(region, other);
      for (;;) {
        other = finder.find(mixedEnd, Math.min(length, mixedEnd + MIXED_GAP));
        if (other < 0) break;
        mixedEnd = lineEnd(region, other);
      }
      if (mixedStart > start) this.blockDecode(region.subarray(start, mixedStart));
      this.blockDecode(region.subarray(mixedStart, mixedEnd));
      start = mixedEnd;
      other = finder.find(start, length);
    }
    if (start < length) this.blockDecode(start === 0 ? region : region.subarray(start));
  }

  /** Decode whole lines strictly in one go; only when that fails line by line, so a bad line is reported and the rest kept. */
  private blockDecode(block: Uint8Array): void {
    let text: string;
    try {
      text = this.strict.decode(block);
    } catch {
      this.linesDecode(block);
      return;
    }
    this.target.push(text);
  }

  private linesDecode(region: Uint8Array): void {
    let start = 0;
    while (start < region.length) {
      const newline = region.indexOf(LF, start);
      const end = newline < 0 ? region.length : newline + 1;
      const line = region.subarray(start, end);
      let text: string | null = null;
      try {
        text = this.strict.decode(line);
      } catch {
        this.target.pushUndecodable(this.lenient.decode(line));
      }
      if (text !== null) this.target.push(text);
      start = end;
    }
  }
}
