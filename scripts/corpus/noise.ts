/** Surface noise that chat text has: dropped punctuation, typos, odd casing, emoji. */
import type { Random } from './random';

/** Rates of surface noise (common practice, no source: picked to look like quick chat messages). */
export const NOISE_RATES = {
  /** Chance a template's final "?" or "." is dropped. */
  finalPunctuationDrop: 0.35,
  /** Chance each template comma is dropped. */
  commaDrop: 0.3,
  /** Chance per word (4+ ASCII letters) of a typo, outside and inside slot values. */
  typoOutsideSlot: 0.025,
  typoInsideSlot: 0.015,
  politeEnding: 0.3,
  emojiEnding: 0.07,
} as const;

export type CaseStyle = 'lower' | 'sentence' | 'as-is' | 'upper' | 'title';

export const CASE_STYLE_WEIGHTS: readonly (readonly [number, CaseStyle])[] = [
  [50, 'lower'],
  [33, 'sentence'],
  [10, 'as-is'],
  [4, 'upper'],
  [3, 'title'],
];

/** Drop or double final punctuation and drop commas, on the template text before it is filled. */
export function templateTextNoise(text: string, rng: Random): string {
  let out = text.replace(/,/gu, (comma) => (rng.chance(NOISE_RATES.commaDrop) ? '' : comma));
  out = out.replace(/([?.])(\{end\})?$/u, (_match, mark: string, end: string | undefined) => {
    const tail = end ?? '';
    if (rng.chance(NOISE_RATES.finalPunctuationDrop)) return tail;
    if (mark === '?' && rng.chance(0.08)) return `${rng.pick(['??', '?!', '???'])}${tail}`;
    return `${mark}${tail}`;
  });
  return out;
}

const KEYBOARD_NEIGHBOURS: Record<string, string> = {
  a: 'qs', b: 'vn', c: 'xv', d: 'sf', e: 'wr', f: 'dg', g: 'fh', h: 'gj', i: 'uo', j: 'hk', k: 'jl', l: 'k',
  m: 'n', n: 'bm', o: 'ip', p: 'o', q: 'w', r: 'et', s: 'ad', t: 'ry', u: 'yi', v: 'cb', w: 'qe', x: 'zc',
  y: 'tu', z: 'x',
};

/** One typo in a word of ASCII letters: swap, drop, double or a neighbouring key; the first letter stays. */
export function typoWord(word: string, rng: Random): string {
  const at = 1 + rng.int(word.length - 1);
  const kind = rng.int(4);
  if (kind === 0 && at < word.length - 1) return word.slice(0, at) + word[at + 1] + word[at] + word.slice(at + 2);
  if (kind === 1) return word.slice(0, at) + word.slice(at + 1);
  if (kind === 2) return word.slice(0, at) + word[at] + word.slice(at);
  const letter = word[at] ?? 'a';
  const neighbours = KEYBOARD_NEIGHBOURS[letter.toLowerCase()] ?? letter;
  const replacement = neighbours[rng.int(neighbours.length)] ?? letter;
  const cased = letter === letter.toUpperCase() ? replacement.toUpperCase() : replacement;
  return word.slice(0, at) + cased + word.slice(at + 1);
}

/** Give some words of 4+ ASCII letters a typo; letters stay letters, so token boundaries hold. */
export function textTypos(text: string, rate: number, rng: Random): { text: string; typos: number } {
  let typos = 0;
  const out = text.replace(/[A-Za-z]{4,}/gu, (word) => {
    if (!rng.chance(rate)) return word;
    typos++;
    return typoWord(word, rng);
  });
  return { text: out, typos };
}

export function caseApply(text: string, style: CaseStyle): string {
  switch (style) {
    case 'lower':
      return text.toLowerCase();
    case 'upper':
      return text.toUpperCase();
    case 'title':
      return text.replace(/(^|\s)(\p{Ll})/gu, (_m, space: string, letter: string) => space + letter.toUpperCase());
    case 'sentence':
    case 'as-is':
      return text;
  }
}
