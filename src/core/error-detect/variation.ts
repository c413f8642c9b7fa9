import { corpusFlatten, type FlatCorpus } from './corpus-flat';
import { PairInterner } from './intern';
import { locationCompare, stringCompare } from './normalise';
import type { FindingLocation, LabelledUtterance, Reading, VariationFinding } from './types';

export interface VariationOptions {
  /** Longest n-gram considered (default 6). */
  maxLength?: number;
}

export const VARIATION_MAX_LENGTH = 6;

/** One level of the n-gram lattice: n-grams of length n starting at `positions`, with their ids. */
interface Level {
  positions: Int32Array;
  grams: Int32Array;
  sequences: Int32Array;
  gramCount: number;
}

/**
 * Variation n-grams after Dickinson & Meurers (2003), "Detecting errors in part-of-speech
 * annotation": every n-gram (case-folded, n ≤ maxLength) that recurs with different tags on some of
 * its tokens. Only maximal ones are reported: an n-gram whose occurrences all share the same
 * neighbour on one side is left to its longer extension, which carries the same evidence. The
 * n-grams are built level by level from those that recur, so the work is linear in the corpus size
 * times maxLength. Pool one layer per utterance: two layers of the same utterance would count as
 * two occurrences.
 */
export function variationFind(utterances: readonly LabelledUtterance[], options: VariationOptions = {}): VariationFinding[] {
  const maxLength = Math.max(1, Math.floor(options.maxLength ?? VARIATION_MAX_LENGTH));
  const flat = corpusFlatten(utterances);
  const findings: VariationFinding[] = [];
  let level = levelFirst(flat);
  let nearVariation: Uint8Array = new Uint8Array(0);
  for (let n = 1; n <= maxLength && level.positions.length > 0; n++) {
    const { counts, varies } = levelFindings(flat, utterances, level, n, n === maxLength, findings);
    if (n === maxLength) break;
    if (n === 1) nearVariation = positionsNearVariation(flat, varies, maxLength);
    level = levelExtend(flat, level, counts, nearVariation, n);
  }
  return findings.sort(variationCompare);
}

/**
 * Ranking after Dickinson & Meurers (2003), from memory: a nucleus with identical context on both
 * sides (non-fringe) is more likely an error than one at the edge, and longer shared context makes
 * an error more likely still. Ties go to the more frequent n-gram, then to text order for stability.
 */
export function variationCompare(a: VariationFinding, b: VariationFinding): number {
  return (
    Number(a.fringe) - Number(b.fringe) ||
    b.tokens.length - a.tokens.length ||
    b.occurrences - a.occurrences ||
    stringCompare(a.tokens.join(' '), b.tokens.join(' ')) ||
    a.nucleus.start - b.nucleus.start
  );
}

function levelFirst(flat: FlatCorpus): Level {
  const total = flat.words.length;
  const positions = new Int32Array(total);
  for (let p = 0; p < total; p++) positions[p] = p;
  return { positions, grams: flat.words.slice(), sequences: flat.tags.slice(), gramCount: flat.wordNames.size };
}

/** Count each n-gram and find those whose tag sequences differ; returns both for pruning. */
function levelFindings(
  flat: FlatCorpus,
  utterances: readonly LabelledUtterance[],
  level: Level,
  n: number,
  isLast: boolean,
  out: VariationFinding[],
): { counts: Int32Array; varies: Uint8Array } {
  const { positions, grams, sequences, gramCount } = level;
  const counts = new Int32Array(gramCount);
  const firstSequence = new Int32Array(gramCount).fill(-1);
  const varies = new Uint8Array(gramCount);
  for (let k = 0; k < positions.length; k++) {
    const g = grams[k] ?? 0;
    const s = sequences[k] ?? 0;
    counts[g] = (counts[g] ?? 0) + 1;
    const first = firstSequence[g] ?? -1;
    if (first < 0) firstSequence[g] = s;
    else if (first !== s) varies[g] = 1;
  }
  const buckets = new Map<number, number[]>();
  for (let k = 0; k < positions.length; k++) {
    const g = grams[k] ?? 0;
    if (varies[g] !== 1) continue;
    const bucket = buckets.get(g);
    if (bucket === undefined) buckets.set(g, [k]);
    else bucket.push(k);
  }
  for (const occurrences of buckets.values()) {
    const starts = occurrences.map((k) => positions[k] ?? 0);
    if (!isLast && neighboursShared(flat, starts, n)) continue;
    out.push(variationBuild(flat, utterances, level, occurrences, n));
  }
  return { counts, varies };
}

/** True when every occurrence has the same word just before it, or the same word just after it. */
function neighboursShared(flat: FlatCorpus, starts: readonly number[], n: number): boolean {
  const side = (offset: (p: number) => number, inside: (p: number) => boolean): boolean => {
    let shared = -1;
    for (const p of starts) {
      if (!inside(p)) return false;
      const word = flat.words[offset(p)] ?? -1;
      if (shared < 0) shared = word;
      else if (shared !== word) return false;
    }
    return true;
  };
  const utteranceStart = (p: number): number => flat.starts[flat.owners[p] ?? 0] ?? 0;
  const utteranceEnd = (p: number): number => flat.starts[(flat.owners[p] ?? 0) + 1] ?? 0;
  return (
    side((p) => p - 1, (p) => p > utteranceStart(p)) ||
    side((p) => p + n, (p) => p + n < utteranceEnd(p))
  );
}

function variationBuild(
  flat: FlatCorpus,
  utterances: readonly LabelledUtterance[],
  level: Level,
  occurrences: readonly number[],
  n: number,
): VariationFinding {
  const first = level.positions[occurrences[0] ?? 0] ?? 0;
  const tokens = Array.from({ length: n }, (_, j) => flat.wordNames.values[flat.words[first + j] ?? 0] ?? '');
  const bySequence = new Map<number, number[]>();
  for (const k of occurrences) {
    const s = level.sequences[k] ?? 0;
    const starts = bySequence.get(s);
    const p = level.positions[k] ?? 0;
    if (starts === undefined) bySequence.set(s, [p]);
    else starts.push(p);
  }
  const groups = [...bySequence.values()].map((starts) => ({
    starts,
    tags: Array.from({ length: n }, (_, j) => flat.tagNames.values[flat.tags[(starts[0] ?? 0) + j] ?? 0] ?? 'O'),
  }));
  let nucleusStart = n;
  let nucleusEnd = 0;
  for (let j = 0; j < n; j++) {
    const tag = groups[0]?.tags[j];
    if (groups.some((group) => group.tags[j] !== tag)) {
      nucleusStart = Math.min(nucleusStart, j);
      nucleusEnd = j + 1;
    }
  }
  const readings: Reading[] = groups.map(({ starts, tags }) => ({
    tags,
    locations: starts
      .map((p): FindingLocation => {
        const u = flat.owners[p] ?? 0;
        const offset = p - (flat.starts[u] ?? 0);
        const utterance = utterances[u];
        return { id: utterance?.id ?? '', layer: utterance?.layer ?? '', start: offset + nucleusStart, end: offset + nucleusEnd };
      })
      .sort(locationCompare),
  }));
  readings.sort((a, b) => b.locations.length - a.locations.length || stringCompare(a.tags.join(' '), b.tags.join(' ')));
  return {
    kind: 'variation',
    tokens,
    nucleus: { start: nucleusStart, end: nucleusEnd },
    fringe: nucleusStart === 0 || nucleusEnd === n,
    readings,
    occurrences: occurrences.length,
  };
}

/**
 * Positions with a word that varies somewhere (its unigram has several tags) less than maxLength
 * tokens ahead in the same utterance. An n-gram can only vary on a column whose word varies, so
 * n-grams starting elsewhere are never reported; every occurrence of an n-gram that contains such a
 * word is kept, so the counts and readings of reportable n-grams stay exact.
 */
function positionsNearVariation(flat: FlatCorpus, wordVaries: Uint8Array, maxLength: number): Uint8Array {
  const near = new Uint8Array(flat.words.length);
  for (let u = 0; u + 1 < flat.starts.length; u++) {
    const start = flat.starts[u] ?? 0;
    let nextVarying = Number.POSITIVE_INFINITY;
    for (let p = (flat.starts[u + 1] ?? 0) - 1; p >= start; p--) {
      if (wordVaries[flat.words[p] ?? 0] === 1) nextVarying = p;
      if (nextVarying - p < maxLength) near[p] = 1;
    }
  }
  return near;
}

/** The (n+1)-grams starting where a recurring n-gram starts, near a varying word, with room left. */
function levelExtend(flat: FlatCorpus, level: Level, counts: Int32Array, nearVariation: Uint8Array, n: number): Level {
  const { starts, owners, words, tags } = flat;
  const { positions: from, grams: fromGrams, sequences: fromSequences } = level;
  const size = from.length;
  const keep = new Uint8Array(size);
  let kept = 0;
  for (let k = 0; k < size; k++) {
    const p = from[k] ?? 0;
    if (nearVariation[p] !== 1 || (counts[fromGrams[k] ?? 0] ?? 0) < 2) continue;
    if (p + n >= (starts[(owners[p] ?? 0) + 1] ?? 0)) continue;
    keep[k] = 1;
    kept++;
  }
  const gramPairs = new PairInterner(kept);
  const sequencePairs = new PairInterner(kept);
  const positions = new Int32Array(kept);
  const grams = new Int32Array(kept);
  const sequences = new Int32Array(kept);
  let j = 0;
  for (let k = 0; k < size; k++) {
    if (keep[k] !== 1) continue;
    const p = from[k] ?? 0;
    positions[j] = p;
    grams[j] = gramPairs.id(fromGrams[k] ?? 0, words[p + n] ?? 0);
    sequences[j] = sequencePairs.id(fromSequences[k] ?? 0, tags[p + n] ?? 0);
    j++;
  }
  return { positions, grams, sequences, gramCount: gramPairs.size };
}
