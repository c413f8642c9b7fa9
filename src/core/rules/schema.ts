import { spansFromTags } from '../schemes/codec';
import type { SchemaRuleId } from './ruleIds';

/** The project's label lists. `allowedSlotsByIntent` restricts only the intents it names. */
export interface LabelSchema {
  slots: readonly string[];
  intents?: readonly string[] | undefined;
  allowedSlotsByIntent?: Readonly<Record<string, readonly string[]>> | undefined;
}

/** A schema problem; `index` is the first token of the offending span, or null for the intent. */
export interface SchemaIssue {
  index: number | null;
  rule: SchemaRuleId;
  message: string;
  /** The offending slot or intent name. */
  name: string;
}

interface CompiledSchema {
  slots: ReadonlySet<string>;
  intents: ReadonlySet<string> | null;
  allowed: ReadonlyMap<string, ReadonlySet<string>>;
}

// Validation runs per utterance over whole corpora, so each schema object is turned into sets once.
const compiled = new WeakMap<LabelSchema, CompiledSchema>();

function schemaCompile(schema: LabelSchema): CompiledSchema {
  let result = compiled.get(schema);
  if (result === undefined) {
    const allowed = new Map<string, ReadonlySet<string>>();
    for (const [intent, slots] of Object.entries(schema.allowedSlotsByIntent ?? {})) allowed.set(intent, new Set(slots));
    result = {
      slots: new Set(schema.slots),
      intents: schema.intents === undefined ? null : new Set(schema.intents),
      allowed,
    };
    compiled.set(schema, result);
  }
  return result;
}

/**
 * Schema issues of one utterance: the intent when an intent list is given and does not hold it;
 * each span (lenient reading, see `spansFromTags`) whose slot is not in the slot list; and each span
 * whose slot is listed but not allowed for the utterance's intent. An unknown slot is reported only
 * as unknown. A missing or empty intent is not checked; malformed tags are left to `transitionsValidate`.
 */
export function schemaValidate(
  utterance: { tags: readonly string[]; intent?: string | undefined },
  schema: LabelSchema,
): SchemaIssue[] {
  const { slots, intents, allowed } = schemaCompile(schema);
  const issues: SchemaIssue[] = [];
  const intent = utterance.intent === undefined || utterance.intent === '' ? null : utterance.intent;
  if (intent !== null && intents !== null && !intents.has(intent)) {
    issues.push({
      index: null,
      rule: 'schema/unknown-intent',
      message: `intent ${intent} is not in the project's intent list`,
      name: intent,
    });
  }
  const allowedHere = intent === null ? undefined : allowed.get(intent);
  for (const { start, end, slot } of spansFromTags(utterance.tags)) {
    const tokens = end - start === 1 ? `token ${start}` : `tokens ${start}-${end - 1}`;
    if (!slots.has(slot)) {
      issues.push({ index: start, rule: 'schema/unknown-slot', message: `slot ${slot} (${tokens}) is not in the project's slot list`, name: slot });
    } else if (allowedHere !== undefined && !allowedHere.has(slot)) {
      issues.push({
        index: start,
        rule: 'schema/slot-not-allowed-for-intent',
        message: `slot ${slot} (${tokens}) is not allowed for intent ${intent ?? ''}`,
        name: slot,
      });
    }
  }
  return issues;
}
