import { tagParse } from '../schemes';

/** Label order: `O` first, then `B-`/`I-` pairs by slot name, so label ids are stable for a tag set. */
export function labelsFromTags(sequences: Iterable<readonly string[]>): string[] {
  const seen = new Set<string>();
  for (const tags of sequences) for (const tag of tags) seen.add(tag);
  seen.delete('O');
  const key = (tag: string) => {
    const parsed = tagParse(tag);
    return parsed === null ? [tag, 9] : [parsed.slot, parsed.prefix === 'B' ? 0 : 1];
  };
  const rest = [...seen].sort((a, b) => {
    const [sa, pa] = key(a);
    const [sb, pb] = key(b);
    return sa === sb ? (pa as number) - (pb as number) : (sa as string) < (sb as string) ? -1 : 1;
  });
  return ['O', ...rest];
}

/**
 * IOB2 grammar as 0/1 masks: `start[j]` (may label the first token) and `pair[i * L + j]` (j may
 * follow i). I-X is legal only after B-X or I-X, never first (Ramshaw & Marcus 1995 as IOB2 is
 * used by the CoNLL-2000 shared task). Labels outside the grammar are left unconstrained.
 */
export interface TransitionMask {
  start: Float64Array;
  pair: Float64Array;
}

export function iob2TransitionMask(labels: readonly string[]): TransitionMask {
  const size = labels.length;
  const parsed = labels.map((label) => tagParse(label));
  const start = new Float64Array(size);
  const pair = new Float64Array(size * size);
  for (let j = 0; j < size; j++) {
    const to = parsed[j];
    const inside = to !== null && to !== undefined && to.prefix === 'I';
    start[j] = inside ? 0 : 1;
    for (let i = 0; i < size; i++) {
      const from = parsed[i];
      const continues = from !== null && from !== undefined && (from.prefix === 'B' || from.prefix === 'I') && from.slot === to?.slot;
      pair[i * size + j] = !inside || continues ? 1 : 0;
    }
  }
  return { start, pair };
}
