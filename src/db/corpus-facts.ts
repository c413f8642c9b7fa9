/**
 * What the utterance table says about a layer, computed the same way by the index pass (every
 * utterance) and by the page read (the visible rows): rule violations and disagreement.
 */
import { ANNOTATORS_RESERVED, type LayerStatus, type ProjectSchema } from '../core/backup/model';
import { schemaValidate, transitionsValidate, type LabelSchema } from '../core/rules';
import type { Scheme } from '../core/types';

/** The rule checker's view of the project schema; null while the project defines no slots or intents. */
export function labelSchemaOf(schema: ProjectSchema): LabelSchema | null {
  if (schema.slots.length === 0 && schema.intents.length === 0) return null;
  // A slot without an intent list goes with any intent, so each intent allows those plus the slots naming it.
  const restricted = schema.slots.some((s) => s.intents !== undefined);
  const named = new Set([...schema.intents.map((i) => i.name), ...schema.slots.flatMap((s) => s.intents ?? [])]);
  const allowed: Record<string, string[]> = {};
  if (restricted) for (const intent of named) allowed[intent] = schema.slots.filter((s) => s.intents === undefined || s.intents.includes(intent)).map((s) => s.name);
  return {
    slots: schema.slots.map((s) => s.name),
    intents: schema.intents.length === 0 ? undefined : schema.intents.map((i) => i.name),
    allowedSlotsByIntent: allowed,
  };
}

/** Illegal transitions under the project's scheme plus schema issues (unknown slot or intent, slot not allowed). */
export function layerViolationCount(layer: { tags: readonly string[]; intent: string | null }, scheme: Scheme, schema: LabelSchema | null): number {
  let count = transitionsValidate(layer.tags, scheme).length;
  if (schema !== null) count += schemaValidate({ tags: layer.tags, intent: layer.intent ?? undefined }, schema).length;
  return count;
}

/** People's layers: gold and model layers are written by processes and never count as an annotator. */
export function annotatorIsHuman(annotator: string): boolean {
  return !ANNOTATORS_RESERVED.includes(annotator);
}

export interface LayerLike {
  annotator: string;
  tags: readonly string[];
  intent: string | null;
  status: LayerStatus;
}

function tagsEqual(a: readonly string[], b: readonly string[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * Two or more people's layers whose tags or intent differ. Layers still `unlabelled` carry no
 * decision yet, so they take no part.
 */
export function layersDisagree(layers: readonly LayerLike[]): boolean {
  let first: LayerLike | null = null;
  for (const layer of layers) {
    if (!annotatorIsHuman(layer.annotator) || layer.status === 'unlabelled') continue;
    if (first === null) first = layer;
    else if (first.intent !== layer.intent || !tagsEqual(first.tags, layer.tags)) return true;
  }
  return false;
}

/** People's layers marked done, and people's layers in all. */
export function layersDone(layers: readonly LayerLike[]): { done: number; layers: number } {
  let done = 0;
  let count = 0;
  for (const layer of layers) {
    if (!annotatorIsHuman(layer.annotator)) continue;
    count += 1;
    if (layer.status === 'done') done += 1;
  }
  return { done, layers: count };
}
