import type { LabelledUtterance } from '../../../src/core/error-detect';

/** A labelled utterance from space-separated text (home-repair scenario, invented data). */
export function said(id: string, text: string, tags: readonly string[], intent?: string, layer = 'lead'): LabelledUtterance {
  const tokens = text.split(' ');
  if (tokens.length !== tags.length) throw new Error(`test data: ${id} has ${String(tokens.length)} tokens, ${String(tags.length)} tags`);
  return intent === undefined ? { id, layer, tokens, tags: [...tags] } : { id, layer, tokens, tags: [...tags], intent };
}

/** `count` copies of one labelling, ids prefix-1 … prefix-count. */
export function copies(count: number, prefix: string, text: string, tags: readonly string[], intent?: string): LabelledUtterance[] {
  return Array.from({ length: count }, (_, i) => said(`${prefix}-${String(i + 1)}`, text, tags, intent));
}
