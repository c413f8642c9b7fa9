/** Shared types of annotation-error detection: labelled utterances in, ranked findings out. */

/** One utterance as one layer (annotator, gold, …) labelled it. Tags are read the CoNLL-2000 way. */
export interface LabelledUtterance {
  id: string;
  layer: string;
  tokens: readonly string[];
  tags: readonly string[];
  intent?: string;
}

/** Where to jump: token indices [start, end) of one utterance in one layer. */
export interface FindingLocation {
  id: string;
  layer: string;
  start: number;
  end: number;
}

/** One way a repeated stretch of text was labelled, with every place it was labelled that way. */
export interface Reading {
  tags: string[];
  locations: FindingLocation[];
}

/** Dickinson & Meurers (2003): an n-gram whose occurrences carry different tags on some tokens. */
export interface VariationFinding {
  kind: 'variation';
  /** The n-gram, case-folded. */
  tokens: string[];
  /** Tokens [start, end) of the n-gram whose tags vary (the variation nucleus). */
  nucleus: { start: number; end: number };
  /** The nucleus touches an edge of the n-gram, so it lacks identical context on that side. */
  fringe: boolean;
  /** Tags of the whole n-gram; locations point at the nucleus. Majority reading first. */
  readings: Reading[];
  occurrences: number;
}

/** Identical (case-folded) utterances with different tags or intents. */
export interface IdenticalFinding {
  kind: 'identical';
  tokens: string[];
  tagsDiffer: boolean;
  intentsDiffer: boolean;
  /** Majority reading first; locations cover the whole utterance. */
  readings: (Reading & { intent: string | null })[];
  occurrences: number;
  /** Share of the occurrences that agree with the majority reading. */
  majorityShare: number;
}

/** A value seen rarely under one slot and far more often under another. */
export interface SlotOutlierFinding {
  kind: 'slot-outlier';
  /** The span's tokens, case-folded and joined by one space. */
  value: string;
  slot: string;
  count: number;
  majoritySlot: string;
  majorityCount: number;
  ratio: number;
  locations: FindingLocation[];
}

/** A stretch where a confident model and the annotator label differently. */
export interface ModelDisagreementFinding {
  kind: 'model-disagreement';
  location: FindingLocation;
  tokens: string[];
  annotatorTags: string[];
  modelTags: string[];
  /** Lowest model confidence over the stretch. */
  confidence: number;
}

export type Finding = VariationFinding | IdenticalFinding | SlotOutlierFinding | ModelDisagreementFinding;
export type FindingKind = Finding['kind'];
