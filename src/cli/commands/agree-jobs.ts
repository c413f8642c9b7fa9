import { closeSync, openSync, readSync } from 'node:fs';
import type { AlignLayerData } from '../../core/agreement';
import { alignLayersJoin, type AlignLayerPart } from '../../core/agreement/align-layer-join';
import type { Scheme } from '../../core/types';
import { layerLoad, type LayerLoaded } from '../layer-load';
import { boundaryFind, pieceRead, type PieceRead } from '../layer-pieces';
import { formatChoose, type LoadOptions } from '../load';

/**
 * How `agree` shares the parsing between threads. Each file goes to one thread; once the main
 * thread has read its own, it takes the second half of what a helper has not yet read of a column
 * file (cut between utterances), and again while a tail worth taking is left, so a helper that
 * started late, or runs slowly on a busy machine, does not keep it waiting. The helper's share and
 * the taken tails join into exactly the layer of a one-thread read.
 *
 * The hand-over is one shared 64-bit word per file: how far the helper has claimed the file (it
 * claims a chunk before reading it) and where its share ends (the file's end, or where the main
 * thread's last tail starts). Both sides change it only by compare-and-swap, so the helper never
 * reads past its end and the main thread never takes what the helper has claimed.
 */
export type AgreeJob =
  | { kind: 'columns'; file: number; path: string; bytes: number; scheme: Scheme | undefined }
  | { kind: 'whole'; file: number; path: string; bytes: number; options: LoadOptions };

export type AgreeJobResult = { kind: 'columns'; read: PieceRead | null } | { kind: 'whole'; loaded: LayerLoaded };

/** Bytes a helper claims at a time, and the least tail worth taking. */
const CLAIM_BYTES = 1 << 20;
const TAIL_MIN_BYTES = 2 << 20;
const HEAD_BYTES = 1 << 20;
/** Each half of a shared word is 32-bit: bigger files are not split. */
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

/** A shared word: the helper's claimed bytes and the end of its share. */
export function agreeWordPack(claimed: number, end: number): bigint {
  return (BigInt(end) << 32n) | BigInt(claimed);
}

function wordClaimed(word: bigint): number {
  return Number(word & 0xffffffffn);
}

function wordEnd(word: bigint): number {
  return Number(word >> 32n);
}

/** The shared words for `jobs`: nothing claimed, each share up to its file's end. */
export function agreeWordsCreate(jobs: readonly AgreeJob[]): BigInt64Array {
  const words = new BigInt64Array(new SharedArrayBuffer(8 * Math.max(1, jobs.length)));
  for (const job of jobs) if (job.kind === 'columns') words[job.file] = agreeWordPack(0, job.bytes);
  return words;
}

/** Run a job on a helper: a column file is read chunk by chunk as claimed in `words[job.file]`, up to where the main thread took the tail. */
export function agreeJobRun(job: AgreeJob, words: BigInt64Array): AgreeJobResult {
  if (job.kind === 'whole') return { kind: 'whole', loaded: layerLoad(job.path, job.options, job.bytes) };
  const next = (position: number): number => {
    for (;;) {
      const word = Atomics.load(words, job.file);
      const end = Math.min(position + CLAIM_BYTES, wordEnd(word));
      if (end <= position) return position;
      if (Atomics.compareExchange(words, job.file, word, agreeWordPack(end, wordEnd(word))) === word) return end;
    }
  };
  try {
    return { kind: 'columns', read: pieceRead(job.path, 0, job.scheme, job.bytes, next) };
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
export function agreeTailsTake(jobs: readonly AgreeJob[], helperFiles: readonly number[], words: BigInt64Array): TailRead[] {
  const tails: TailRead[] = [];
  for (let taken = true; taken; ) {
    taken = false;
    for (let j = helperFiles.length - 1; j >= 0 && !taken; j--) {
      const job = jobs[helperFiles[j] as number];
      if (job?.kind !== 'columns') continue;
      const tail = tailClaim(job, words);
      if (tail === null) continue;
      const [start, end] = tail;
      let read: PieceRead | null;
      try {
        read = pieceRead(job.path, start, job.scheme, end - start, (position) => Math.min(position + CLAIM_BYTES, end));
      } catch {
        read = null;
      }
      tails.push({ file: job.file, start, read });
      taken = true;
    }
  }
  return tails;
}

/** End the helper's share at a boundary halfway through its unclaimed part: the tail taken, or null. */
function tailClaim(job: Extract<AgreeJob, { kind: 'columns' }>, words: BigInt64Array): [number, number] | null {
  let fd: number;
  try {
    fd = openSync(job.path, 'r');
  } catch {
    return null;
  }
  try {
    for (;;) {
      const word = Atomics.load(words, job.file);
      const claimed = wordClaimed(word);
      const end = wordEnd(word);
      if (end - claimed < TAIL_MIN_BYTES) return null;
      // A boundary before `end`: the bytes from `end` on are already another tail's.
      const at = boundaryFind(fd, claimed + Math.floor((end - claimed) / 2), end);
      if (at >= end) return null;
      if (Atomics.compareExchange(words, job.file, word, agreeWordPack(claimed, at)) === word) return [at, end];
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
