/**
 * Masking for files that leave the machine. Every replacement keeps the text's length in UTF-16
 * units, so token offsets (and the labels that refer to them) stay valid after masking.
 */

export type MaskKind = 'digits' | 'email';
export const MASK_KINDS: readonly MaskKind[] = ['digits', 'email'];

/** Local part, @, a domain with at least one dot (common practice, no source: a pragmatic subset of RFC 5322). */
const EMAIL = /[\p{L}\p{N}._%+-]+@[\p{L}\p{N}-]+(?:\.[\p{L}\p{N}-]+)+/gu;
const DIGIT = /\p{Nd}/gu;

function fill(match: string, mark: string): string {
  return mark.repeat(match.length);
}

export function textMask(text: string, kinds: Iterable<MaskKind>): string {
  const wanted = new Set(kinds);
  let out = text;
  // E-mail first: its digits would otherwise be masked as digits and the address left readable.
  // The pattern is costly on long texts; most utterances have no '@' and skip it.
  if (wanted.has('email') && out.includes('@')) out = out.replace(EMAIL, (m) => fill(m, '*'));
  if (wanted.has('digits')) out = out.replace(DIGIT, (m) => fill(m, '0'));
  return out;
}
