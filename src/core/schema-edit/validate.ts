/** Whole-schema checks, each problem tied to one field of one slot or intent so the editor can show it there. */
import type { ProjectSchema } from '../backup/model';
import { keyLabel, keyNormalise, keyProblem } from './keys';
import { intentNameProblem, slotNameProblem } from './names';
import { colourProblem } from './palette';

export type SchemaItemKind = 'slot' | 'intent';
export type SchemaField = 'name' | 'key' | 'colour' | 'intents';

export interface SchemaProblem {
  kind: SchemaItemKind;
  /** Position in `schema.slots` or `schema.intents`. */
  index: number;
  field: SchemaField;
  message: string;
}

/** Every problem of the schema, in slot order then intent order; empty when it may be saved. */
export function schemaProblems(schema: ProjectSchema): SchemaProblem[] {
  const problems: SchemaProblem[] = [];
  const slotAt = new Map<string, number>();
  const keyAt = new Map<string, number>();
  const intentNames = new Set(schema.intents.map((i) => i.name));
  schema.slots.forEach((slot, index) => {
    const add = (field: SchemaField, message: string) => problems.push({ kind: 'slot', index, field, message });
    const nameIssue = slotNameProblem(slot.name);
    if (nameIssue !== null) add('name', nameIssue);
    else if (slotAt.has(slot.name)) add('name', `Another slot is already called ${slot.name}.`);
    else slotAt.set(slot.name, index);
    if (slot.key !== undefined && slot.key !== '') {
      const keyIssue = keyProblem(slot.key);
      const owner = keyAt.get(keyNormalise(slot.key));
      if (keyIssue !== null) add('key', keyIssue);
      else if (owner !== undefined) add('key', `The key “${keyLabel(slot.key)}” already labels ${schema.slots[owner]?.name ?? 'another slot'}.`);
      else keyAt.set(keyNormalise(slot.key), index);
    }
    if (slot.colour !== undefined) {
      const colourIssue = colourProblem(slot.colour);
      if (colourIssue !== null) add('colour', colourIssue);
    }
    if (slot.intents !== undefined) {
      const seen = new Set<string>();
      for (const intent of slot.intents) {
        if (!intentNames.has(intent)) add('intents', `The intent ${intent} is not in the project's intent list.`);
        else if (seen.has(intent)) add('intents', `The intent ${intent} is listed twice.`);
        seen.add(intent);
      }
    }
  });
  const intentAt = new Set<string>();
  schema.intents.forEach((intent, index) => {
    const nameIssue = intentNameProblem(intent.name);
    if (nameIssue !== null) problems.push({ kind: 'intent', index, field: 'name', message: nameIssue });
    else if (intentAt.has(intent.name)) problems.push({ kind: 'intent', index, field: 'name', message: `Another intent is already called ${intent.name}.` });
    intentAt.add(intent.name);
  });
  return problems;
}

/** The problems of one slot or intent, by field (the first message of each field). */
export function schemaProblemsOf(problems: readonly SchemaProblem[], kind: SchemaItemKind, index: number): Partial<Record<SchemaField, string>> {
  const byField: Partial<Record<SchemaField, string>> = {};
  for (const p of problems) if (p.kind === kind && p.index === index) byField[p.field] ??= p.message;
  return byField;
}
