import type { TextTarget } from './lines';

const LF = 0x0a;
const EMPTY = new Uint8Array(0);

function bytesConcat(a: Uint8Array, b: Uint8Array): Uint8Array {
  if (a.length === 0) return b;
  const out = new Uint8Array(a.length + b.length);
  out.set(a, 0);
  out.set(b, a.length);
  return out;
}

/**
 * UTF-8 bytes → text, whole lines at a time, so a multi-byte character split across chunks is never
 * cut (LF cannot occur inside a UTF-8 sequence). Each run of whole lines is decoded strictly in one
 * go; only when that fails is it decoded line by line, so a bad line is reported and the rest kept.
 * A BOM is passed through as U+FEFF: the text consumers strip it, so bytes and strings agree.
 */
export class ByteLineDecoder {
  private pending: Uint8Array = EMPTY;
  private readonly strict = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
  private readonly lenient = new TextDecoder('utf-8', { fatal: false, ignoreBOM: true });

  constructor(private readonly target: TextTarget) {}

  push(chunk: Uint8Array): void {
    const lastNewline = chunk.lastIndexOf(LF);
    if (lastNewline < 0) {
      this.pending = bytesConcat(this.pending, chunk.slice());
      return;
    }
    const region = bytesConcat(this.pending, chunk.subarray(0, lastNewline + 1));
    // Copied: a streaming caller may reuse its buffer for the next chunk.
    this.pending = chunk.slice(lastNewline + 1);
    this.regionDecode(region);
  }

  end(): void {
    if (this.pending.length > 0) this.regionDecode(this.pending);
    this.pending = EMPTY;
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
