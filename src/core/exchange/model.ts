/**
 * The exchange formats: a pack (work handed to one annotator) and a layer file (one annotator's
 * layers handed back). Both are JSON Lines: a header line, then one record per line, each line
 * carrying its own check so a sync layer can later move single records (one document per layer)
 * and an edited line is found by number.
 *
 * Fingerprint: the project's `uid` is 128 random bits made once per master project (stored on the
 * project row). A hash of all utterances would change with every later import into the master and
 * break packs already handed out; the uid stays, and each layer record still names its utterance by
 * seq, external id and token count, which the merge checks one by one. A pack is further named by
 * the SHA-256 of its records (`bodySha256`), so a layer file says which pack it answers.
 */
import type { ProjectInfo } from '../backup/model';
import type { LayerContent } from '../backup/model';

export const PACK_FORMAT = 'slotsmith-pack';
export const LAYERS_FORMAT = 'slotsmith-layers';
export const EXCHANGE_FORMAT_VERSION = 1;

/** Which project a file belongs to. */
export interface ExchangeProject {
  uid: string;
  name: string;
}

export interface PackHeader {
  format: typeof PACK_FORMAT;
  version: number;
  /** ISO 8601 time the pack was made. */
  created: string;
  project: ExchangeProject;
  /** Annotator id the pack is for, and a display name. */
  annotator: { id: string; name: string };
  /** Name, tokeniser, scheme and the schema with its guidelines (descriptions, examples). */
  setup: ProjectInfo;
  /** Layer the suggestions were copied from (e.g. `model`), when the pack has any. */
  suggestionsFrom?: string;
  count: number;
  bodySha256: string;
}

export interface PackSuggestion {
  tags: string[];
  intent: string | null;
}

export interface PackUtterance {
  seq: number;
  text: string;
  /** start,end pairs in UTF-16 code units of `text`. */
  tokens: number[];
  externalId?: string;
  meta: Record<string, string>;
  suggestion?: PackSuggestion;
}

export interface LayersHeader {
  format: typeof LAYERS_FORMAT;
  version: number;
  created: string;
  project: ExchangeProject;
  annotator: string;
  /** `bodySha256` of the pack this answers, when the layers came from one. */
  pack?: string;
  count: number;
  bodySha256: string;
}

export interface LayerRecord extends LayerContent {
  seq: number;
  externalId?: string;
  tokenCount: number;
  annotator: string;
}

export interface PackFile {
  header: PackHeader;
  utterances: PackUtterance[];
}

export interface LayersFile {
  header: LayersHeader;
  layers: LayerRecord[];
}

/** Line-numbered problems; readers never throw. */
export interface ExchangeProblem {
  line: number;
  message: string;
}

export type ExchangeRead<T> = { ok: true; file: T; warnings: ExchangeProblem[] } | { ok: false; errors: ExchangeProblem[] };
