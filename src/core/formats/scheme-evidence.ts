import type { ParsedTag } from '../schemes';
import type { Scheme } from '../types';

/**
 * Guesses a file's scheme from its tags as they stream past, so no second pass is needed:
 * any E- or S- means BIOES; otherwise a span opened by I- (never by B-) means IOB1, where B- only
 * separates two adjacent spans of one slot (Ramshaw & Marcus 1995 as restated by Tjong Kim Sang &
 * Veenstra 1999, from memory); anything else, including no spans at all, reads as IOB2.
 */
export class SchemeEvidence {
  private endOrSingle = false;
  private opensWithBegin = false;
  private opensWithInside = false;
  private previous: ParsedTag | null = null;

  utteranceStart(): void {
    this.previous = null;
  }

  tagAdd(parsed: ParsedTag): void {
    const { prefix, slot } = parsed;
    if (prefix === 'O') {
      this.previous = null;
      return;
    }
    if (prefix === 'E' || prefix === 'S') this.endOrSingle = true;
    const before = this.previous;
    const continues = before !== null && before.slot === slot && (before.prefix === 'B' || before.prefix === 'I');
    if (prefix === 'B' && !continues) this.opensWithBegin = true;
    if (prefix === 'I' && !continues) this.opensWithInside = true;
    this.previous = parsed;
  }

  scheme(): Scheme {
    if (this.endOrSingle) return 'bioes';
    if (this.opensWithInside && !this.opensWithBegin) return 'iob1';
    return 'iob2';
  }
}

