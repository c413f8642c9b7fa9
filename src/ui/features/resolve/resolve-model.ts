/**
 * The resolver's state for one utterance, derived from the stored layers alone (A, B and gold): the
 * disagreements, which are settled (decision lines in the gold note, see core/adjudication), and the
 * gold draft. Each decision turns into one `layerSave` change, so every decision is a history row.
 */
import {
  adjudicationDiff,
  decisionLine,
  disagreementKeys,
  draftStart,
  goldTags,
  INTENT_KEY,
  intentsDiffer,
  noteDecide,
  noteDecidedKeys,
  spansPlace,
  spansTake,
  type AdjudicationDiff,
  type DiffRegion,
  type Side,
} from '../../../core/adjudication';
import type { LayerContent, LayerStatus } from '../../../core/backup/model';
import { spansFromTags } from '../../../core/schemes';
import type { Scheme, Span } from '../../../core/types';

export interface LayerView {
  tags: readonly string[];
  intent: string | null;
}

export interface ResolveInput {
  length: number;
  scheme: Scheme;
  a: LayerView;
  b: LayerView;
  gold: Pick<LayerContent, 'tags' | 'intent' | 'note' | 'status' | 'revision'> | undefined;
  /** Layer owner ids, for the decision lines. */
  names: { a: string; b: string };
}

export interface ResolveItem {
  key: string;
  kind: 'region' | 'intent';
  region: DiffRegion | null;
  decided: boolean;
}

export interface ResolveModel {
  input: ResolveInput;
  diff: AdjudicationDiff;
  intentDiffers: boolean;
  items: ResolveItem[];
  /** The gold draft as spans, and its intent. */
  spans: Span[];
  intent: string | null;
  note: string;
  revision: number;
  decided: number;
}

export interface GoldChange {
  tags: string[];
  intent: string | null;
  note: string;
  status: LayerStatus;
}

export function resolveModel(input: ResolveInput): ResolveModel {
  const diff = adjudicationDiff(input.a.tags, input.b.tags);
  const intentDiffers = intentsDiffer(input.a.intent, input.b.intent);
  const { gold } = input;
  const settled = noteDecidedKeys(gold?.note ?? '');
  // A gold layer marked done counts as settled throughout, however it was made.
  const allDone = gold?.status === 'done';
  const items: ResolveItem[] = disagreementKeys(diff.regions, intentDiffers).map((key, i) => ({
    key,
    kind: key === INTENT_KEY ? 'intent' : 'region',
    region: key === INTENT_KEY ? null : (diff.regions[i] ?? null),
    decided: allDone || settled.has(key),
  }));
  return {
    input,
    diff,
    intentDiffers,
    items,
    spans: gold === undefined ? draftStart(diff) : spansFromTags(gold.tags),
    intent: gold === undefined ? (intentDiffers ? null : input.a.intent) : gold.intent,
    note: gold?.note ?? '',
    revision: gold?.revision ?? 0,
    decided: items.filter((i) => i.decided).length,
  };
}

/** The gold layer after a decision: every key in `decidedNow` becomes settled with its line. */
function changeMake(model: ResolveModel, spans: Span[], intent: string | null, lines: { key: string; line: string }[]): GoldChange {
  let note = model.note;
  for (const { key, line } of lines) note = noteDecide(note, key, line);
  const settled = noteDecidedKeys(note);
  const done = model.input.gold?.status === 'done' || model.items.every((i) => settled.has(i.key));
  return { tags: goldTags(spans, model.input.length, model.input.scheme), intent, note, status: done ? 'done' : 'draft' };
}

function sideName(model: ResolveModel, side: Side): string {
  return model.input.names[side];
}

/** Take one side for one disagreement (a token region or the intent). */
export function decisionTake(model: ResolveModel, item: ResolveItem, side: Side, reason = ''): GoldChange {
  const line = decisionLine(item.key, `took ${sideName(model, side)}`, reason);
  if (item.kind === 'intent') return changeMake(model, model.spans, model.input[side].intent, [{ key: item.key, line }]);
  const region = item.region as DiffRegion;
  return changeMake(model, spansTake(model.spans, region, side), model.intent, [{ key: item.key, line }]);
}

/** Take one side for the whole utterance: every disputed region and the intent. */
export function decisionTakeAll(model: ResolveModel, side: Side, reason = ''): GoldChange {
  const spans = model.diff.regions.reduce((acc, r) => spansTake(acc, r, side), model.spans);
  const intent = model.intentDiffers ? model.input[side].intent : model.intent;
  const lines = model.items.map((i) => ({ key: i.key, line: decisionLine(i.key, `took ${sideName(model, side)}`, reason) }));
  return changeMake(model, spans, intent, lines);
}

/**
 * Label tokens [start, end) with `slot` (null clears them). Every disputed region the edit touches
 * counts as settled by this edit.
 */
export function decisionEdit(model: ResolveModel, start: number, end: number, slot: string | null, reason = ''): GoldChange {
  const what = slot === null ? `cleared tokens ${start + 1}-${end}` : `labelled tokens ${start + 1}-${end} as ${slot}`;
  const lines = model.items
    .filter((i) => i.region !== null && i.region.start < end && i.region.end > start)
    .map((i) => ({ key: i.key, line: decisionLine(i.key, what, reason) }));
  return changeMake(model, spansPlace(model.spans, start, end, slot), model.intent, lines);
}

/** Set the gold intent by hand (null: none). */
export function decisionIntent(model: ResolveModel, intent: string | null, reason = ''): GoldChange {
  const lines = model.intentDiffers ? [{ key: INTENT_KEY, line: decisionLine(INTENT_KEY, `set to ${intent ?? 'none'}`, reason) }] : [];
  return changeMake(model, model.spans, intent, lines);
}

/** The next item after `index` still open (wrapping within the utterance); -1 when all are settled. */
export function itemNextOpen(items: readonly ResolveItem[], index: number): number {
  for (let step = 1; step <= items.length; step++) {
    const i = (index + step) % items.length;
    if (!(items[i] as ResolveItem).decided) return i;
  }
  return -1;
}

/** The region number (1-based) holding each token, 0 outside every disagreement. */
export function tokenRegions(diff: AdjudicationDiff): number[] {
  const at = new Array<number>(diff.length).fill(0);
  diff.regions.forEach((r, k) => {
    for (let i = r.start; i < r.end; i++) at[i] = k + 1;
  });
  return at;
}

/** A side's reading of a region in words: `day "friday", time_window "morning"` or `no label`. */
export function regionText(spans: readonly Span[], words: readonly string[]): string {
  if (spans.length === 0) return 'no label';
  return spans.map((s) => `${s.slot} “${words.slice(s.start, s.end).join(' ')}”`).join(', ');
}

