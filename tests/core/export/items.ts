import { tokeniseWords } from '../../../src/core/tokenise';
import type { ExportItem, LayerCandidate, LayerStatus } from '../../../src/core/export';

/** An invented home-repair message with its word tokens and the given layers. */
export function itemMake(id: string, text: string, layers: LayerCandidate[]): ExportItem {
  return { id, text, tokens: tokeniseWords(text), layers };
}

export function layerMake(annotator: string, status: LayerStatus, tags: string[], intent?: string): LayerCandidate {
  return intent === undefined ? { annotator, status, tags } : { annotator, status, tags, intent };
}
