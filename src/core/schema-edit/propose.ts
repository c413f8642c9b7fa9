/** Defaults for a new slot: a colour and a shortcut key that no other slot has yet, where possible. */
import type { ProjectSchema } from '../backup/model';
import { keyNormalise, keyProblem } from './keys';
import { OKABE_ITO, paletteColourOf } from './palette';

/** The first palette colour no slot uses; with all eight taken, the least used (palette order breaks ties). */
export function colourPropose(schema: ProjectSchema): string {
  const uses = new Map<string, number>(OKABE_ITO.map((c) => [c.hex, 0]));
  for (const slot of schema.slots) {
    const entry = slot.colour === undefined ? undefined : paletteColourOf(slot.colour);
    if (entry !== undefined) uses.set(entry.hex, (uses.get(entry.hex) ?? 0) + 1);
  }
  let best = OKABE_ITO[0]?.hex ?? '#E69F00';
  for (const { hex } of OKABE_ITO) if ((uses.get(hex) ?? 0) < (uses.get(best) ?? 0)) best = hex;
  return best;
}

const FALLBACK_KEYS = 'abcdefghijklmnopqrstuvwxyz';

/**
 * A free shortcut key for a slot called `name`: its letters first (so `day` gets d, or a, …), then the
 * alphabet; null when every candidate is taken or reserved (the slot is then labelled from the list).
 */
export function keyPropose(schema: ProjectSchema, name = ''): string | null {
  const taken = new Set(schema.slots.flatMap((s) => (s.key === undefined || s.key === '' ? [] : [keyNormalise(s.key)])));
  const letters = [...name.toLowerCase()].filter((c) => /^\p{Ll}$/u.test(c));
  for (const candidate of [...letters, ...FALLBACK_KEYS]) {
    if (!taken.has(keyNormalise(candidate)) && keyProblem(candidate) === null) return candidate;
  }
  return null;
}

/** Colour and key proposed for a new slot called `name`. */
export function slotPropose(schema: ProjectSchema, name = ''): { colour: string; key: string | null } {
  return { colour: colourPropose(schema), key: keyPropose(schema, name) };
}
