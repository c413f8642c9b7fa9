import type { Token, Utterance } from '../types';

/** Where one annotator's work on one utterance stands (the storage layer keeps one per layer). */
export type LayerStatus = 'unlabelled' | 'draft' | 'done' | 'skipped' | 'flagged';
export const LAYER_STATUSES: readonly LayerStatus[] = ['unlabelled', 'draft', 'done', 'skipped', 'flagged'];

/** The reserved annotator holding the adjudicated result. */
export const GOLD_ANNOTATOR = 'gold';

/** One annotator's labels on one utterance; `tags` are in the stored scheme (IOB2 in the app). */
export interface LayerCandidate {
  annotator: string;
  tags: readonly string[];
  /** Absent or null: no intent chosen. */
  intent?: string | null | undefined;
  status: LayerStatus;
}

/** One utterance with every layer it has; text and tokens are as imported. */
export interface ExportItem {
  id?: string | undefined;
  text: string;
  tokens: readonly Token[];
  meta?: Readonly<Record<string, string>> | undefined;
  layers: readonly LayerCandidate[];
}

export type LayerPolicy =
  | { kind: 'gold' }
  | { kind: 'annotator'; annotator: string }
  | { kind: 'gold-else'; annotator: string };

export interface SelectOptions {
  policy: LayerPolicy;
  /** Statuses a layer must have to be exported; default `['done']`. Gold is filtered like any layer. */
  statuses?: readonly LayerStatus[];
}

/** Why utterances were left out: no layer the policy accepts, or one whose status is filtered out. */
export interface SelectionReport {
  total: number;
  kept: number;
  missingLayer: number;
  /** Left out by status, keyed by the status of the best layer found (gold first under `gold-else`). */
  filteredByStatus: Record<LayerStatus, number>;
}

/** The utterances to export, each carrying the tags and intent of its chosen layer. */
export interface ExportSelection {
  utterances: Utterance[];
  /** Annotator of the chosen layer, parallel to `utterances`. */
  annotators: string[];
  report: SelectionReport;
}

/** What the checks and writers need: an `ExportSelection`, or any list of labelled utterances. */
export interface ExportInput {
  utterances: readonly Utterance[];
  /** Annotator of each utterance's layer, for the refusal list. */
  annotators?: readonly string[] | undefined;
}
