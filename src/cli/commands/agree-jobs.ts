import { closeSync, openSync, readSync } from 'node:fs';
import type { AlignLayerData } from '../../core/agreement';
import { alignLayersJoin, type AlignLayerPart } from '../../core/agreement/align-layer-join';
import type { Scheme } from '../../core/types';
import { layerLoad, type LayerLoaded } from '../layer-load';
import { boundaryFind, pieceRead, type PieceRead } from '../layer-pieces';
import { formatChoose, type LoadOptions } from '../load';

/**
 * How `agree` shares the parsing between threads. Each file goes to one thread; once the main
 * thread has read its own, it takes the unread second half of a helper's column file (cut
 * between utterances), so a helper that started late, or has the bigger file, does not keep it
 * waiting. The helper's share and the taken tail join into exactly the layer of a one-thread read.
 *
 * The hand-over is one shared word per file: while open, how far the helper has claimed the file
 * (it claims a chunk before reading it); once the main thread has taken the tail from byte b,
 * -(b + 1). Both sides change it only by compare-and-swap, so the helper never reads past b.
 */
export type AgreeJob =
  | { kind: 'columns'; file: number; path: string; bytes: number; scheme: Scheme | undefined }
  | { kind: 'whole'; file: number; path: string; bytes: number; options: LoadOptions };

export type AgreeJobResult = { kind: 'columns'; read: PieceRead | null } | { kind: 'whole'; loaded: LayerLoaded };

/** Bytes a helper claims at a time, and the least tail worth taking. */
const CLAIM_BYTES = 1 << 20;
const TAIL_MIN_BYTES = 2 << 20;
const HEAD_BYTES = 1 << 20;
/** Shared words are 32-bit: bigger files are not split. */
const SPLIT_MAX_BYTES = 0x7ffffffe;

/** The file's first bytes, as `documentLoad` sees them for format detection (empty when unreadable). */
function headRead(path: string): Uint8Array {
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch {
    return new Uint8Array(0);
  }
  try {
    const head = new Uint8Array(HEAD_BYTES);
    return head.subarray(0, readSync(fd, head, 0, HEAD_BYTES, null));
  } catch {
    return new Uint8Array(0);
  } finally {
    closeSync(fd);
  }
}

/** One job per file: column files that can be split, every other file read whole. */
export function agreeJobsPlan(files: readonly string[], sizes: readonly number[], options: LoadOptions): AgreeJob[] {
  return files.map((path, file): AgreeJob => {
    const bytes = sizes[file] ?? 0;
    if (bytes > 0 && bytes <= SPLIT_MAX_BYTES) {
      const { format, scheme } = formatChoose(path, headRead(path), options);
      if (format === 'columns') return { kind: 'columns', file, path, bytes, scheme };
    }
    return { kind: 'whole', file, path, bytes, options };
  });
}

/** Run a job on a helper: a column file is read chunk by chunk as claimed in `words[job.file]`, up to where the main thread took the tail. */
export function agreeJobRun(job: AgreeJob, words: Int32Array): AgreeJobResult {
  if (job.kind === 'whole') return { kind: 'whole', loaded: layerLoad(job.path, job.options, job.bytes) };
  const size = job.bytes;
  const next = (position: number): number => {
    for (;;) {
      const word = Atomics.load(words, job.file);
      if (word < 0) return Math.min(position + CLAIM_BYTES, Math.max(position, -(word + 1)));
      const end = Math.min(position + CLAIM_BYTES, size);
      if (end <= position) return position;
      if (Atomics.compareExchange(words, job.file, word, end) === word) return end;
    }
  };
  try {
    return { kind: 'columns', read: pieceRead(job.path, 0, job.scheme, size, next) };
  } catch {
    // Unreadable now though it was readable a moment ago: the whole-file read reports it.
    return { kind: 'columns', read: null };
  }
}

export interface TailRead {
  file: number;
  start: number;
  read: PieceRead | null;
}

/**
 * On the main thread, once its own files are read: take the second half of what a helper has not
 * yet claimed of one of its column files (the last such file first), read it here, and repeat
 * while a tail worth taking is left. Returns the tails read.
 */
export function agreeTailsTake(jobs: readonly AgreeJob[], helperFiles: readonly number[], words: Int32Array): TailRead[] {
  const tails: TailRead[] = [];
  for (let taken = true; taken; ) {
    taken = false;
    for (let j = helperFiles.length - 1; j >= 0 && !taken; j--) {
      const job = jobs[helperFiles[j] as number];
      if (job?.kind !== 'columns') continue;
      const tail = tailClaim(job, words);
      if (tail < 0) continue;
      let read: PieceRead | null;
      try {
        read = pieceRead(job.path, tail, job.scheme, job.bytes - tail, (position) => Math.min(position + CLAIM_BYTES, job.bytes));
      } catch {
        read = null;
      }
      tails.push({ file: job.file, start: tail, read });
      taken = true;
    }
  }
  return tails;
}

/** Close the helper's file at a boundary halfway through its unclaimed part; that boundary, or -1. */
function tailClaim(job: Extract<AgreeJob, { kind: 'columns' }>, words: Int32Array): number {
  let fd: number;
  try {
    fd = openSync(job.path, 'r');
  } catch {
    return -1;
  }
  try {
    for (;;) {
      const claimed = Atomics.load(words, job.file);
      if (claimed < 0 || job.bytes - claimed < TAIL_MIN_BYTES) return -1;
      const at = boundaryFind(fd, claimed + Math.floor((job.bytes - claimed) / 2), job.bytes);
      if (at >= job.bytes) return -1;
      if (Atomics.compareExchange(words, job.file, claimed, -(at + 1)) === claimed) return at;
    }
  } finally {
    closeSync(fd);
  }
}

/** The typed arrays' buffers of a result, to transfer rather than copy between threads. */
export function agreeJobBuffers(result: AgreeJobResult): ArrayBuffer[] {
  let layer: AlignLayerData | null = null;
  if (result.kind === 'columns') layer = result.read?.layer ?? null;
  else if (result.loaded.ok) layer = result.loaded.layer;
  if (layer === null) return [];
  return [layer.lines, layer.tokenStart, layer.ranges, layer.tokenLines, layer.tagCounts, layer.tags, layer.intents].map((a) => a.buffer as ArrayBuffer);
}

/**
 * One file's layer from its job's result and any tails taken from it: parts joined in file order,
 * lines shifted by the parts before. A file with an error in any part is read again whole here,
 * so its errors and their line numbers are exactly those of a one-thread read.
 */
export function agreeJobAssemble(job: AgreeJob, result: AgreeJobResult, tails: readonly TailRead[], options: LoadOptions): LayerLoaded {
  if (result.kind === 'whole') return result.loaded;
  const pieces: Array<{ start: number; read: PieceRead | null }> = [{ start: 0, read: result.read }];
  for (const tail of tails) if (tail.file === job.file) pieces.push({ start: tail.start, read: tail.read });
  pieces.sort((a, b) => a.start - b.start);
  const parts: AlignLayerPart[] = [];
  let lineOffset = 0;
  let position = 0;
  for (const { start, read } of pieces) {
    if (read === null || read.errors.length > 0 || start !== position) return layerLoad(job.path, options, job.bytes);
    parts.push({ layer: read.layer, lineOffset });
    lineOffset += read.lines;
    position = read.end;
  }
  if (position !== job.bytes) return layerLoad(job.path, options, job.bytes);
  const layer = parts.length === 1 ? (parts[0] as AlignLayerPart).layer : alignLayersJoin(job.path, parts);
  return { ok: true, layer, errors: [] };
}
