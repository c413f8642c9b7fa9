import { StringInterner } from './intern';
import { tagsNormalise, tokenFold } from './normalise';
import type { LabelledUtterance } from './types';

/** Every token of the corpus in one run of typed arrays, so n-gram passes stay linear and compact. */
export interface FlatCorpus {
  /** Case-folded token id per position. */
  words: Int32Array;
  /** Normalised IOB2 tag id per position. */
  tags: Int32Array;
  /** Utterance index per position. */
  owners: Int32Array;
  /** First position of each utterance; one extra entry holds the total. */
  starts: Int32Array;
  wordNames: StringInterner;
  tagNames: StringInterner;
}

export function corpusFlatten(utterances: readonly LabelledUtterance[]): FlatCorpus {
  const starts = new Int32Array(utterances.length + 1);
  let total = 0;
  utterances.forEach((utterance, u) => {
    starts[u] = total;
    total += utterance.tokens.length;
  });
  starts[utterances.length] = total;
  const words = new Int32Array(total);
  const tags = new Int32Array(total);
  const owners = new Int32Array(total);
  const wordNames = new StringInterner();
  const tagNames = new StringInterner();
  utterances.forEach((utterance, u) => {
    const base = starts[u] ?? 0;
    const normalised = tagsNormalise(utterance);
    utterance.tokens.forEach((token, i) => {
      words[base + i] = wordNames.id(tokenFold(token));
      tags[base + i] = tagNames.id(normalised[i] ?? 'O');
      owners[base + i] = u;
    });
  });
  return { words, tags, owners, starts, wordNames, tagNames };
}
