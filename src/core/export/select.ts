import type { Utterance } from '../types';
import {
  type ExportItem,
  type ExportSelection,
  GOLD_ANNOTATOR,
  LAYER_STATUSES,
  type LayerCandidate,
  type LayerPolicy,
  type LayerStatus,
  type SelectOptions,
} from './types';

/** Annotators the policy accepts, in order of preference. */
export function policyAnnotators(policy: LayerPolicy): string[] {
  switch (policy.kind) {
    case 'gold':
      return [GOLD_ANNOTATOR];
    case 'annotator':
      return [policy.annotator];
    case 'gold-else':
      return [GOLD_ANNOTATOR, policy.annotator];
  }
}

type Choice = { layer: LayerCandidate } | { missing: true } | { status: LayerStatus };

/** The first preferred layer whose status passes; else why none did. */
export function layerChoose(layers: readonly LayerCandidate[], preferred: readonly string[], statuses: ReadonlySet<LayerStatus>): Choice {
  let firstFound: LayerCandidate | undefined;
  for (const annotator of preferred) {
    const layer = layers.find((l) => l.annotator === annotator);
    if (layer === undefined) continue;
    if (statuses.has(layer.status)) return { layer };
    firstFound ??= layer;
  }
  return firstFound === undefined ? { missing: true } : { status: firstFound.status };
}

function utteranceFromLayer(item: ExportItem, layer: LayerCandidate): Utterance {
  const utterance: Utterance = { text: item.text, tokens: [...item.tokens], tags: [...layer.tags], meta: { ...item.meta } };
  if (item.id !== undefined) utterance.id = item.id;
  if (layer.intent !== undefined && layer.intent !== null) utterance.intent = layer.intent;
  return utterance;
}

/**
 * Choose, per utterance, the layer to export: the policy's annotators in order (`gold-else` tries
 * gold first), the first whose status is allowed. Utterances without one are left out and counted.
 */
export function exportSelect(items: Iterable<ExportItem>, options: SelectOptions): ExportSelection {
  const preferred = policyAnnotators(options.policy);
  const statuses = new Set<LayerStatus>(options.statuses ?? ['done']);
  const filteredByStatus = Object.fromEntries(LAYER_STATUSES.map((s) => [s, 0])) as Record<LayerStatus, number>;
  const selection: ExportSelection = {
    utterances: [],
    annotators: [],
    report: { total: 0, kept: 0, missingLayer: 0, filteredByStatus },
  };
  const { report } = selection;
  for (const item of items) {
    report.total++;
    const choice = layerChoose(item.layers, preferred, statuses);
    if ('layer' in choice) {
      selection.utterances.push(utteranceFromLayer(item, choice.layer));
      selection.annotators.push(choice.layer.annotator);
      report.kept++;
    } else if ('missing' in choice) {
      report.missingLayer++;
    } else {
      filteredByStatus[choice.status]++;
    }
  }
  return selection;
}
