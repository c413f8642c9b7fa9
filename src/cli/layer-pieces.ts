import { closeSync, openSync, readSync } from 'node:fs';
import type { AlignLayerData } from '../core/agreement';
import { AlignColumnsTarget, alignColumnsSize } from '../core/agreement/align-columns';
import { columnsReaderTo } from '../core/formats';
import type { ReadError, Scheme } from '../core/types';

const LF = 10;
const CR = 13;
/** First byte of a UTF-8 BOM: a piece must not start with one (only the file's start may). */
const BOM_FIRST = 0xef;
const WINDOW = 1 << 16;
const CHUNK_BYTES = 1 << 20;

/**
 * Where the first piece boundary at or after `from` lies in the open file: just after a blank line
 * (LF LF, or LF CR LF), where the column reader has finished an utterance and starts afresh, and
 * not before a BOM's first byte. `size` when there is none before the end.
 */
export function boundaryFind(fd: number, from: number, size: number): number {
  const window = new Uint8Array(WINDOW);
  let position = from;
  while (position < size) {
    const length = readSync(fd, window, 0, Math.min(WINDOW, size - position), position);
    if (length <= 0) break;
    const byte = (j: number): number => (j < length ? (window[j] ?? -1) : -1);
    const atEnd = position + length >= size;
    // A match spans up to 4 bytes (LF CR LF and the byte after); those cut by the window's end are looked at again.
    const last = atEnd ? length : length - 3;
    for (let i = 0; i < last; i++) {
      if (window[i] !== LF) continue;
      let after = -1;
      if (byte(i + 1) === LF) after = i + 2;
      else if (byte(i + 1) === CR && byte(i + 2) === LF) after = i + 3;
      if (after < 0 || after >= length) continue;
      if (byte(after) !== BOM_FIRST) return position + after;
    }
    if (atEnd || last <= 0) break;
    position += last;
  }
  return size;
}

export interface PieceRead {
  layer: AlignLayerData;
  errors: ReadError[];
  /** Lines in the piece. */
  lines: number;
  /** Where the piece ended: the byte after its last. */
  end: number;
}

/**
 * A column file read on its own from byte `start` (0, or a boundary from `boundaryFind`), lines
 * numbered from there. `next(position)` says how far to read from `position` (a piece ends when it
 * returns `position`), so a piece's end may be settled while it is being read. A file that cannot
 * be read throws: the caller has already looked at it.
 */
export function pieceRead(path: string, start: number, scheme: Scheme | undefined, sizeHint: number, next: (position: number) => number): PieceRead {
  const target = new AlignColumnsTarget(path, alignColumnsSize(sizeHint));
  const reader = columnsReaderTo(target, scheme === undefined ? {} : { scheme });
  const fd = openSync(path, 'r');
  const buffer = new Uint8Array(CHUNK_BYTES);
  let position = start;
  try {
    for (let end = next(position); end > position; end = next(position)) {
      while (position < end) {
        const length = readSync(fd, buffer, 0, Math.min(CHUNK_BYTES, end - position), position);
        if (length <= 0) throw new Error(`${path}: file ended before byte ${String(end)}`);
        reader.push(buffer.subarray(0, length));
        position += length;
      }
    }
  } finally {
    closeSync(fd);
  }
  const document = reader.end();
  return { layer: target.done(), errors: document.errors, lines: target.lineCount, end: position };
}
