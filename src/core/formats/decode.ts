import type { TextTarget } from './lines';

const LF = 0x0a;
const EMPTY = new Uint8Array(0);

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
    const region = bytesConcat([...this.pending, chunk.subarray(0, lastNewline + 1)]);
    this.pending = lastNewline + 1 < chunk.length ? [chunk.slice(lastNewline + 1)] : [];
    this.regionDecode(region);
  }

  end(): void {
    if (this.pending.length > 0) this.regionDecode(bytesConcat(this.pending));
    this.pending = [];
  }

  private regionDecode(region: Uint8Array): void {
    let text: string;
    try {
      text = this.strict.decode(region);
    } catch {
      this.linesDecode(region);
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
