import type { Scheme } from '../types';
import { tagParse } from './tag';

/**
 * Guess the scheme of a corpus from its tag sequences, first match wins:
 * 1. any E- or S- tag: `bioes` (neither IOB scheme uses those prefixes);
 * 2. a B-X that opens a span after O or at the utterance start: `iob2` (IOB1 never does that);
 * 3. an I-X that opens a span (at the start, after O, or after another slot), with every B-X
 *    directly after a token of an X span, i.e. B only separating same-slot neighbours: `iob1`;
 * 4. otherwise (no spans, only B-X I-X* runs, or mixed evidence): `iob2`, the common default.
 * Malformed tags read as O. Sequences are read once, so a generator may be passed.
 */
export function schemeDetect(tagSequences: Iterable<readonly string[]>): Scheme {
  let insideOpensSpan = false;
  let beginAfterOtherSlot = false;
  let beginOpensSpan = false;
  for (const tags of tagSequences) {
    let previousSlot: string | null = null;
    for (const tag of tags) {
      const parsed = tagParse(tag);
      if (parsed === null || parsed.prefix === 'O') {
        previousSlot = null;
        continue;
      }
      const { prefix, slot } = parsed;
      if (prefix === 'E' || prefix === 'S') return 'bioes';
      if (prefix === 'B') {
        if (previousSlot === null) beginOpensSpan = true;
        else if (previousSlot !== slot) beginAfterOtherSlot = true;
      } else if (previousSlot !== slot) {
        insideOpensSpan = true;
      }
      previousSlot = slot;
    }
  }
  if (beginOpensSpan) return 'iob2';
  if (insideOpensSpan && !beginAfterOtherSlot) return 'iob1';
  return 'iob2';
}
