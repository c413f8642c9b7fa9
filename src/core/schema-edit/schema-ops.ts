/** Renames and deletes on the schema value itself (the layers are rewritten by src/db/schema-edit-repo). */
import type { IntentDef, ProjectSchema, SlotDef } from '../backup/model';

export function schemaSlotRename(schema: ProjectSchema, from: string, to: string): ProjectSchema {
  return { ...schema, slots: schema.slots.map((s) => (s.name === from ? { ...s, name: to } : s)) };
}

export function schemaSlotDelete(schema: ProjectSchema, name: string): ProjectSchema {
  return { ...schema, slots: schema.slots.filter((s) => s.name !== name) };
}

/** The intent and every slot's list of allowed intents follow the new name. */
export function schemaIntentRename(schema: ProjectSchema, from: string, to: string): ProjectSchema {
  return {
    slots: schema.slots.map((s) => (s.intents?.includes(from) === true ? { ...s, intents: s.intents.map((i) => (i === from ? to : i)) } : s)),
    intents: schema.intents.map((i): IntentDef => (i.name === from ? { ...i, name: to } : i)),
  };
}

/**
 * The intent goes, and so does its place in slots' allowed lists. A list left empty is dropped (any
 * intent): the editor offers no way to say "allowed with none", and a slot nobody may use helps no one.
 */
export function schemaIntentDelete(schema: ProjectSchema, name: string): ProjectSchema {
  return {
    slots: schema.slots.map((s): SlotDef => {
      if (s.intents?.includes(name) !== true) return s;
      const rest = s.intents.filter((i) => i !== name);
      if (rest.length > 0) return { ...s, intents: rest };
      const { intents: _dropped, ...withoutIntents } = s;
      return withoutIntents;
    }),
    intents: schema.intents.filter((i) => i.name !== name),
  };
}

/** Slot and intent names of `before` missing from `after`: a plain save must not drop them (that is a delete). */
export function schemaNamesDropped(before: ProjectSchema, after: ProjectSchema): { slots: string[]; intents: string[] } {
  const slots = new Set(after.slots.map((s) => s.name));
  const intents = new Set(after.intents.map((i) => i.name));
  return { slots: before.slots.map((s) => s.name).filter((n) => !slots.has(n)), intents: before.intents.map((i) => i.name).filter((n) => !intents.has(n)) };
}
