import { spansFromTags, tagsFromSpans } from '../schemes/codec';
import { tagParse } from '../schemes/tag';
import type { Scheme, Span } from '../types';
import { transitionsAreLegal } from './transitions';

/**
 * How an illegal sequence is mended. Both read the tags leniently first (`spansFromTags`: the
 * CoNLL-2000 evaluation reading, where a tag that cannot continue the open span starts a new one)
 * and re-encode in the same scheme, so the result always validates clean. Malformed tags become O.
 *
 * - `begin-span` keeps every span of that reading: a stray I-X becomes B-X (IOB2); a misplaced B-X
 *   becomes I-X (IOB1); in BIOES a stray I-/E- gets its B-, an unclosed span gets its E- (or S-).
 * - `drop-stray` removes the spans that a continuation tag (I- or E-) opened where the scheme does
 *   not allow one to open: their tokens become O. In IOB1 an I- may open a span, so only E- spans
 *   go; spans opened by B- or S- are kept (S- is read as a one-token span even in IOB1/IOB2), and in
 *   BIOES a properly opened span that was never closed is kept and closed at its last token.
 */
export type RepairStrategy = 'begin-span' | 'drop-stray';
export const REPAIR_STRATEGIES: readonly RepairStrategy[] = ['begin-span', 'drop-stray'];

export interface TagChange {
  index: number;
  from: string;
  to: string;
}

/** A before/after preview; `changes` lists the positions where the two differ, in order. */
export interface Repair {
  before: readonly string[];
  after: string[];
  changes: TagChange[];
}

// Which prefixes may legitimately open a span, per scheme (E- never does; S- always reads as one).
const OPENERS: Record<Scheme, string> = { iob1: 'BIS', iob2: 'BS', bioes: 'BS' };

function spanOpenedLegitimately(tags: readonly string[], span: Span, scheme: Scheme): boolean {
  const parsed = tagParse(tags[span.start] ?? 'O');
  return parsed !== null && parsed.prefix !== 'O' && OPENERS[scheme].includes(parsed.prefix);
}

/** The spans a repair keeps (see `RepairStrategy`). */
export function spansRepair(tags: readonly string[], scheme: Scheme, strategy: RepairStrategy): Span[] {
  const spans = spansFromTags(tags);
  if (strategy === 'begin-span') return spans;
  return spans.filter((span) => spanOpenedLegitimately(tags, span, scheme));
}

export function tagsRepair(tags: readonly string[], scheme: Scheme, strategy: RepairStrategy): Repair {
  const before = tags.slice();
  const after = tagsFromSpans(spansRepair(tags, scheme, strategy), tags.length, scheme);
  const changes: TagChange[] = [];
  for (let i = 0; i < after.length; i++) {
    const from = before[i] ?? '';
    const to = after[i] ?? 'O';
    if (from !== to) changes.push({ index: i, from, to });
  }
  return { before, after, changes };
}

export interface RepairChangeCount {
  from: string;
  to: string;
  count: number;
}

/** Corpus-level summary of what a repair would do; nothing is modified. */
export interface RepairPreview {
  scheme: Scheme;
  strategy: RepairStrategy;
  utterances: number;
  /** Utterances the repair rewrites: exactly those with an illegal transition, as repairs validate clean. */
  utterancesChanged: number;
  tagsChanged: number;
  /** Spans that the repair removes (always 0 for `begin-span`, which keeps every span). */
  spansRemoved: number;
  /** How often each tag was rewritten to each other tag, most frequent first. */
  changeCounts: RepairChangeCount[];
  /** The first few repairs, with the utterance's position in the input. */
  examples: { utterance: number; repair: Repair }[];
}

// Code-unit order, so the summary does not depend on the runtime's locale.
function textCompare(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

export function repairPreview(
  utterances: readonly { tags: readonly string[] }[],
  scheme: Scheme,
  strategy: RepairStrategy,
  options: { exampleLimit?: number } = {},
): RepairPreview {
  const exampleLimit = options.exampleLimit ?? 20;
  const preview: RepairPreview = {
    scheme,
    strategy,
    utterances: utterances.length,
    utterancesChanged: 0,
    tagsChanged: 0,
    spansRemoved: 0,
    changeCounts: [],
    examples: [],
  };
  const counts = new Map<string, RepairChangeCount>();
  utterances.forEach(({ tags }, position) => {
    // Legal sequences re-encode to themselves, so the cheap check skips the decode for most of a corpus.
    if (transitionsAreLegal(tags, scheme)) return;
    const repair = tagsRepair(tags, scheme, strategy);
    preview.utterancesChanged++;
    preview.tagsChanged += repair.changes.length;
    if (strategy === 'drop-stray') {
      preview.spansRemoved += spansFromTags(tags).length - spansFromTags(repair.after).length;
    }
    for (const { from, to } of repair.changes) {
      const key = `${from}\u0000${to}`;
      const entry = counts.get(key);
      if (entry === undefined) counts.set(key, { from, to, count: 1 });
      else entry.count++;
    }
    if (preview.examples.length < exampleLimit) preview.examples.push({ utterance: position, repair });
  });
  preview.changeCounts = [...counts.values()].sort((a, b) => b.count - a.count || textCompare(a.from, b.from) || textCompare(a.to, b.to));
  return preview;
}
