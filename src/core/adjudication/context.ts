/** A few tokens either side of a position, with their tags: how a finding is shown in context. */

export interface ContextToken {
  index: number;
  word: string;
  tag: string;
  /** The token the finding points at (the later token of an illegal transition). */
  focus: boolean;
}

export function tokensAround(words: readonly string[], tags: readonly string[], index: number, radius = 3): ContextToken[] {
  const from = Math.max(0, index - radius);
  const to = Math.min(words.length, index + radius + 1);
  const out: ContextToken[] = [];
  for (let i = from; i < to; i++) out.push({ index: i, word: words[i] ?? '', tag: tags[i] ?? '', focus: i === index });
  return out;
}
