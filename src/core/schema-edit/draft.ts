/**
 * The editor's form state for one slot or intent: plain strings as typed, turned into a schema entry
 * only on save. Empty optional fields are left out of the entry, so the stored schema stays small.
 */
import type { IntentDef, SlotDef } from '../backup/model';

export interface SlotDraft {
  name: string;
  key: string;
  colour: string;
  description: string;
  /** Example utterances, one per line. */
  examples: string;
  /** Allowed intents; null for any. */
  intents: string[] | null;
}

export interface IntentDraft {
  name: string;
  description: string;
}

export function slotDraftFrom(slot: SlotDef): SlotDraft {
  return {
    name: slot.name,
    key: slot.key ?? '',
    colour: slot.colour ?? '',
    description: slot.description ?? '',
    examples: (slot.examples ?? []).join('\n'),
    intents: slot.intents === undefined ? null : [...slot.intents],
  };
}

/** The schema entry for a draft: names and keys as typed (the validator judges them), text trimmed. */
export function slotDraftToDef(draft: SlotDraft): SlotDef {
  const examples = draft.examples
    .split(/\r?\n/)
    .map((line) => line.trim())
    .filter((line) => line !== '');
  const description = draft.description.trim();
  return {
    name: draft.name.trim(),
    ...(draft.key !== '' && { key: draft.key }),
    ...(draft.colour !== '' && { colour: draft.colour.toUpperCase() }),
    ...(description !== '' && { description }),
    ...(examples.length > 0 && { examples }),
    ...(draft.intents !== null && draft.intents.length > 0 && { intents: [...draft.intents] }),
  };
}

export function intentDraftFrom(intent: IntentDef): IntentDraft {
  return { name: intent.name, description: intent.description ?? '' };
}

export function intentDraftToDef(draft: IntentDraft): IntentDef {
  const description = draft.description.trim();
  return { name: draft.name.trim(), ...(description !== '' && { description }) };
}
