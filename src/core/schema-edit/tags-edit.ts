/**
 * Slot renames and deletes on stored tag arrays. Only the slot part of a tag changes, so the prefix
 * and therefore an illegal sequence stays exactly as it was (an `I-old` after `O` becomes `I-new`
 * after `O`); tags outside every scheme's grammar are never touched.
 */
import { tagParse } from '../schemes/tag';

/**
 * `tags` with every B-/I-/E-/S-`from` turned into the same prefix of `to`; the same array when nothing
 * changes, so callers can tell an untouched layer by identity.
 */
export function tagsSlotRename(tags: readonly string[], from: string, to: string): readonly string[] {
  let out: string[] | null = null;
  for (let i = 0; i < tags.length; i++) {
    const tag = tags[i] as string;
    const parsed = tagParse(tag);
    if (parsed === null || parsed.prefix === 'O' || parsed.slot !== from) continue;
    out ??= [...tags];
    out[i] = `${parsed.prefix}-${to}`;
  }
  return out ?? tags;
}

/** `tags` with every tag of `slot` turned into `O`; the same array when nothing changes. */
export function tagsSlotDelete(tags: readonly string[], slot: string): readonly string[] {
  let out: string[] | null = null;
  for (let i = 0; i < tags.length; i++) {
    const parsed = tagParse(tags[i] as string);
    if (parsed === null || parsed.prefix === 'O' || parsed.slot !== slot) continue;
    out ??= [...tags];
    out[i] = 'O';
  }
  return out ?? tags;
}

/**
 * How many spans of `slot` the tags hold, read as `spansFromTags` reads them (a stray I- or E- starts a
 * span; E- and S- close one), without building the span list: usage counts run over whole projects.
 */
export function tagsSlotSpanCount(tags: readonly string[], slot: string): number {
  let count = 0;
  // The slot of the span still open after the previous token, or null.
  let open: string | null = null;
  for (let i = 0; i < tags.length; i++) {
    const parsed = tagParse(tags[i] as string);
    if (parsed === null || parsed.prefix === 'O') {
      open = null;
      continue;
    }
    const continues = (parsed.prefix === 'I' || parsed.prefix === 'E') && open === parsed.slot;
    if (!continues && parsed.slot === slot) count++;
    open = parsed.prefix === 'E' || parsed.prefix === 'S' ? null : parsed.slot;
  }
  return count;
}

/** True when any tag names `slot` (with any prefix). */
export function tagsUseSlot(tags: readonly string[], slot: string): boolean {
  return tags.some((tag) => {
    const parsed = tagParse(tag);
    return parsed !== null && parsed.prefix !== 'O' && parsed.slot === slot;
  });
}
