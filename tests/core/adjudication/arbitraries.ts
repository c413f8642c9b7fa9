/** Random tag sequences for the adjudication property tests, illegal and malformed tags included. */
import fc from 'fast-check';

export const TAGS = ['O', 'O', 'O', 'B-day', 'I-day', 'B-area', 'I-area', 'B-service', 'I-service', 'E-day', 'bogus'];

export const tagsOf = (length: number) => fc.array(fc.constantFrom(...TAGS), { minLength: length, maxLength: length });

/** Two layers of the same utterance (same token count). */
export const layerPair = fc.integer({ min: 0, max: 14 }).chain((n) => fc.tuple(tagsOf(n), tagsOf(n)));

/**
 * Legal IOB2 checked independently of src/core/rules: only O, B-X and I-X, and every I-X directly
 * after B-X or I-X of the same slot (IOB2 as Tjong Kim Sang & Veenstra 1999 define it, "Representing
 * Text Chunks", EACL: every chunk starts with B-).
 */
export function isLegalIob2(tags: readonly string[]): boolean {
  let open: string | null = null;
  for (const tag of tags) {
    if (tag === 'O') open = null;
    else if (/^B-\S+$/u.test(tag)) open = tag.slice(2);
    else if (/^I-\S+$/u.test(tag)) {
      if (open !== tag.slice(2)) return false;
    } else return false;
  }
  return true;
}
