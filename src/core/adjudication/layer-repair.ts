/**
 * Rule repair of one stored layer, shared by the review screen's preview and the repository that
 * applies it (so what is previewed is exactly what is written). Transitions are mended by the core's
 * `tagsRepair`; optionally, spans the schema does not allow are then dropped (their tokens become O).
 */
import { tagsRepair, type RepairStrategy } from '../rules/repair';
import { schemaValidate, type LabelSchema } from '../rules/schema';
import { transitionsAreLegal } from '../rules/transitions';
import { spansFromTags, tagsFromSpans } from '../schemes/codec';
import type { Scheme } from '../types';

export interface LayerRepairOptions {
  strategy: RepairStrategy;
  /** When given, spans with an unknown slot or a slot not allowed for the intent are dropped too. */
  schema?: LabelSchema | null;
}

/** The repaired tags; the very same values (a copy) when nothing needs mending. */
export function layerTagsRepair(tags: readonly string[], intent: string | null, scheme: Scheme, options: LayerRepairOptions): string[] {
  const mended = transitionsAreLegal(tags, scheme) ? tags.slice() : tagsRepair(tags, scheme, options.strategy).after;
  const schema = options.schema ?? null;
  if (schema === null) return mended;
  const starts = new Set<number>();
  for (const issue of schemaValidate({ tags: mended, intent: intent ?? undefined }, schema)) if (issue.index !== null) starts.add(issue.index);
  if (starts.size === 0) return mended;
  const kept = spansFromTags(mended).filter((s) => !starts.has(s.start));
  return tagsFromSpans(kept, mended.length, scheme);
}

/** Positions where two tag lists differ. */
export function tagsChangedAt(before: readonly string[], after: readonly string[]): number[] {
  const at: number[] = [];
  for (let i = 0; i < Math.max(before.length, after.length); i++) if (before[i] !== after[i]) at.push(i);
  return at;
}
