import { tagsConvert } from '../schemes';
import type { Utterance } from '../types';
import type { CrfSequence } from './dataset';

/** The words of an utterance, as its token ranges cut them. */
export function utteranceWords(utterance: Pick<Utterance, 'text' | 'tokens'>): string[] {
  return utterance.tokens.map((token) => utterance.text.slice(token.start, token.end));
}

/**
 * A training sequence from an utterance in any scheme: tags re-encoded as legal IOB2, illegal input
 * read the CoNLL-2000 way (a stray I-X starts a span), so the tagger learns only legal sequences.
 */
export function crfSequenceFromUtterance(utterance: Pick<Utterance, 'text' | 'tokens' | 'tags'>): CrfSequence {
  return { words: utteranceWords(utterance), tags: tagsConvert(utterance.tags, 'iob2') };
}
