import { tagsNormalise, type LabelledUtterance } from '../../../src/core/error-detect';

export interface NaiveGram {
  count: number;
  sequences: Set<string>;
  /** Per occurrence, the folded word before and after it (null at an utterance edge). */
  neighbours: { left: string | null; right: string | null }[];
}

/** Every n-gram by string keys, straight from the definition: a slow reference for the fast pass. */
export function naiveGrams(utterances: readonly LabelledUtterance[], maxLength: number): Map<string, NaiveGram> {
  const grams = new Map<string, NaiveGram>();
  for (const utterance of utterances) {
    const words = utterance.tokens.map((t) => t.toLowerCase());
    const tags = tagsNormalise(utterance);
    for (let n = 1; n <= maxLength; n++) {
      for (let i = 0; i + n <= words.length; i++) {
        const key = JSON.stringify(words.slice(i, i + n));
        const gram = grams.get(key) ?? { count: 0, sequences: new Set<string>(), neighbours: [] };
        gram.count++;
        gram.sequences.add(tags.slice(i, i + n).join(' '));
        gram.neighbours.push({ left: words[i - 1] ?? null, right: words[i + n] ?? null });
        grams.set(key, gram);
      }
    }
  }
  return grams;
}

/** A neighbour shared by every occurrence on one side: the longer n-gram carries the same evidence. */
export function naiveSharesNeighbour(gram: NaiveGram): boolean {
  const shared = (pick: (o: { left: string | null; right: string | null }) => string | null): boolean => {
    const first = pick(gram.neighbours[0] ?? { left: null, right: null });
    return first !== null && gram.neighbours.every((o) => pick(o) === first);
  };
  return shared((o) => o.left) || shared((o) => o.right);
}
