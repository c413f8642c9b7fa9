import type { Scheme, Utterance } from '../types';

/** Code for "this layer has no value here" (utterance absent, or no intent). */
export const MISSING = -1;

export type AlignBy = 'id' | 'position';

export interface AlignLayer {
  name: string;
  scheme: Scheme;
  utterances: readonly Utterance[];
}

export interface AlignOptions {
  /** 'auto' (default): by id when every utterance of every layer has one, else by position. */
  by?: AlignBy | 'auto';
  /** Most errors listed (default 100); `errorCount` still counts them all. */
  errorLimit?: number;
}

export type AlignErrorKind = 'tokens-differ' | 'tags-count' | 'duplicate-id' | 'missing-id';

/** One layer's side of an alignment problem: `line` is the utterance's 1-based file line, null when unknown. */
export interface AlignErrorPlace {
  layer: string;
  line: number | null;
}

export interface AlignError {
  kind: AlignErrorKind;
  /** Utterance id, or null when aligned by position (then `index` tells which utterance). */
  id: string | null;
  /** 0-based position of the utterance in the aligned order (by id) or in the files (by position). */
  index: number;
  places: AlignErrorPlace[];
  message: string;
}

/**
 * Layers on one token grid, built for fast counting. Tag codes are IOB2 with a fixed layout over
 * slot codes s = 1..slots.length-1: 0 = O, 2s-1 = B-slot, 2s = I-slot; so slot = (code + 1) >> 1.
 * Slot, intent and so tag codes follow the sorted (code-unit order) label names, O first.
 */
export interface AlignedCorpus {
  by: AlignBy;
  layers: string[];
  /** Per aligned utterance: its id (by position: the first layer's id, or null). */
  ids: (string | null)[];
  utteranceCount: number;
  tokenCount: number;
  /** Utterance u owns tokens [offsets[u], offsets[u+1]). */
  offsets: Int32Array;
  /** Slot code -> name; slots[0] = 'O'. */
  slots: string[];
  /** Tag code -> IOB2 tag string. */
  tagLabels: string[];
  /** Intent code -> name. */
  intentLabels: string[];
  /** Per layer, one tag code per token; MISSING over utterances absent from the layer. */
  tags: Int32Array[];
  /** Per layer, one intent code per utterance; MISSING when absent or without intent. */
  intents: Int32Array[];
  /** Per layer, 1 where the utterance is present. */
  present: Uint8Array[];
  /** Per layer, the utterance's 1-based file line; 0 when unknown or absent. */
  lines: Int32Array[];
  /** Per layer: does any utterance carry an intent? */
  hasIntents: boolean[];
}

export type AlignResult = { ok: true; corpus: AlignedCorpus } | { ok: false; errors: AlignError[]; errorCount: number };

/** Slot code of a tag code (0 for O). */
export function tagCodeSlot(code: number): number {
  return (code + 1) >> 1;
}

/** Does the tag code open a span (B-)? */
export function tagCodeBegins(code: number): boolean {
  return (code & 1) === 1;
}
