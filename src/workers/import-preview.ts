/**
 * What an import would bring in, gathered utterance by utterance as the file streams by: counts,
 * transition violations, labels the project does not know yet, exact duplicate texts. Memory stays
 * bounded by the example caps, apart from one set of seen texts for the duplicate check.
 */
import type { FormatName } from '../core/formats';
import { transitionsValidate } from '../core/rules';
import { tagParse } from '../core/schemes';
import { SCHEMES, type ReadError, type Scheme, type Utterance } from '../core/types';

export const PREVIEW_EXAMPLES_MAX = 50;

export interface PreviewViolation {
  line: number;
  tag: string | null;
  previous: string | null;
  rule: string;
  message: string;
}

export interface PreviewDuplicate {
  text: string;
  line: number;
  firstLine: number;
}

export interface LabelCount {
  name: string;
  count: number;
}

export interface ImportPreview {
  fileName: string;
  format: FormatName;
  scheme: Scheme;
  schemeDetected: boolean;
  utterances: number;
  tokens: number;
  /** Utterances that carry at least one slot tag or an intent: these get a layer. */
  labelled: number;
  malformed: { total: number; lines: ReadError[] };
  violations: { total: number; examples: PreviewViolation[] };
  unknownSlots: LabelCount[];
  unknownIntents: LabelCount[];
  duplicates: { total: number; examples: PreviewDuplicate[] };
}

export interface KnownLabels {
  slots: readonly string[];
  intents: readonly string[];
}

interface ViolationTally {
  total: number;
  examples: PreviewViolation[];
}

function tallyAdd(tally: ViolationTally, utterance: Utterance, scheme: Scheme): void {
  for (const v of transitionsValidate(utterance.tags, scheme)) {
    tally.total++;
    if (tally.examples.length < PREVIEW_EXAMPLES_MAX) {
      const line = utterance.tokenLines?.[v.index] ?? utterance.line ?? 0;
      tally.examples.push({ line, tag: v.tag, previous: v.previous, rule: v.rule, message: v.message });
    }
  }
}

function countsSorted(counts: Map<string, number>): LabelCount[] {
  return [...counts].map(([name, count]) => ({ name, count })).sort((a, b) => b.count - a.count || a.name.localeCompare(b.name));
}

/**
 * Feed every utterance to `add`, then `finish` with the reader's errors and scheme. When the scheme
 * is detected only at the end of the file, violations are tallied under every scheme as they stream
 * and the detected one is kept: three cheap passes instead of holding every tag until the end.
 */
export class PreviewCollector {
  private utterances = 0;
  private tokens = 0;
  private labelled = 0;
  private readonly tallies: Map<Scheme, ViolationTally>;
  private readonly slots = new Map<string, number>();
  private readonly intents = new Map<string, number>();
  private readonly knownSlots: ReadonlySet<string>;
  private readonly knownIntents: ReadonlySet<string>;
  private readonly seen = new Map<string, number>();
  private readonly duplicates: { total: number; examples: PreviewDuplicate[] } = { total: 0, examples: [] };

  constructor(
    private readonly fileName: string,
    private readonly format: FormatName,
    /** The scheme chosen by the user; undefined when it is to be detected. */
    private readonly scheme: Scheme | undefined,
    known: KnownLabels,
  ) {
    const schemes = scheme === undefined ? SCHEMES : [scheme];
    this.tallies = new Map(schemes.map((s) => [s, { total: 0, examples: [] }]));
    this.knownSlots = new Set(known.slots);
    this.knownIntents = new Set(known.intents);
  }

  add(utterance: Utterance): void {
    this.utterances++;
    this.tokens += utterance.tokens.length;
    for (const [scheme, tally] of this.tallies) tallyAdd(tally, utterance, scheme);
    let hasLabel = utterance.intent !== undefined && utterance.intent !== '';
    for (const tag of utterance.tags) {
      if (tag === 'O') continue;
      hasLabel = true;
      const slot = tagParse(tag)?.slot;
      if (slot !== undefined && !this.knownSlots.has(slot)) this.slots.set(slot, (this.slots.get(slot) ?? 0) + 1);
    }
    if (hasLabel) this.labelled++;
    const intent = utterance.intent;
    if (intent !== undefined && intent !== '' && !this.knownIntents.has(intent)) this.intents.set(intent, (this.intents.get(intent) ?? 0) + 1);
    const line = utterance.line ?? 0;
    const firstLine = this.seen.get(utterance.text);
    if (firstLine === undefined) this.seen.set(utterance.text, line);
    else {
      this.duplicates.total++;
      if (this.duplicates.examples.length < PREVIEW_EXAMPLES_MAX) this.duplicates.examples.push({ text: utterance.text, line, firstLine });
    }
  }

  finish(errors: readonly ReadError[], documentScheme: Scheme): ImportPreview {
    const scheme = this.scheme ?? documentScheme;
    const tally = this.tallies.get(scheme) ?? { total: 0, examples: [] };
    return {
      fileName: this.fileName,
      format: this.format,
      scheme,
      schemeDetected: this.scheme === undefined,
      utterances: this.utterances,
      tokens: this.tokens,
      labelled: this.labelled,
      malformed: { total: errors.length, lines: errors.slice(0, PREVIEW_EXAMPLES_MAX) },
      violations: tally,
      unknownSlots: countsSorted(this.slots),
      unknownIntents: countsSorted(this.intents),
      duplicates: this.duplicates,
    };
  }
}
