import type { Scheme } from '../types';

/** One rule: its id, the scheme it belongs to (null for schema rules) and a one-line description. */
export interface RuleInfo {
  id: RuleId;
  scheme: Scheme | null;
  description: string;
}

// The table is the single source of rule ids; the types below are derived from it.
const RULES = [
  { id: 'iob2/inside-at-start', scheme: 'iob2', description: 'An I- tag opens the utterance; in IOB2 every span starts with B-.' },
  { id: 'iob2/inside-after-outside', scheme: 'iob2', description: 'An I- tag follows O; in IOB2 every span starts with B-.' },
  { id: 'iob2/inside-after-other-slot', scheme: 'iob2', description: 'I-X follows B-Y or I-Y of another slot; I-X may only continue an X span.' },
  { id: 'iob2/tag-outside-scheme', scheme: 'iob2', description: 'An E- or S- tag, which IOB2 does not use (only O, B- and I-).' },
  { id: 'iob2/malformed-tag', scheme: 'iob2', description: 'Not a tag: expected O, or B-/I- followed by a slot name.' },
  { id: 'iob1/begin-at-start', scheme: 'iob1', description: 'A B- tag opens the utterance; in IOB1 B- only separates two adjacent spans of one slot.' },
  { id: 'iob1/begin-after-outside', scheme: 'iob1', description: 'A B- tag follows O; in IOB1 a span after O starts with I-.' },
  { id: 'iob1/begin-after-other-slot', scheme: 'iob1', description: 'B-X follows a span of another slot; in IOB1 it starts with I-X.' },
  { id: 'iob1/tag-outside-scheme', scheme: 'iob1', description: 'An E- or S- tag, which IOB1 does not use (only O, B- and I-).' },
  { id: 'iob1/malformed-tag', scheme: 'iob1', description: 'Not a tag: expected O, or B-/I- followed by a slot name.' },
  { id: 'bioes/continue-at-start', scheme: 'bioes', description: 'An I- or E- tag opens the utterance; a span starts with B- (or is a single S-).' },
  { id: 'bioes/continue-after-outside', scheme: 'bioes', description: 'An I- or E- tag follows O; a span starts with B- (or is a single S-).' },
  { id: 'bioes/continue-after-closed', scheme: 'bioes', description: 'An I- or E- tag follows E- or S-, whose span is already closed.' },
  { id: 'bioes/continue-other-slot', scheme: 'bioes', description: 'I-Y or E-Y follows B-X or I-X of another slot; the X span must end with E-X first.' },
  { id: 'bioes/unclosed-before-outside', scheme: 'bioes', description: 'O follows B- or I-: the open span was never closed with E- (one token: S-).' },
  { id: 'bioes/unclosed-before-begin', scheme: 'bioes', description: 'B- or S- follows B- or I-: the open span was never closed with E-.' },
  { id: 'bioes/unclosed-at-end', scheme: 'bioes', description: 'The utterance ends inside a span (last tag B- or I-); it must end with E- (one token: S-).' },
  { id: 'bioes/malformed-tag', scheme: 'bioes', description: 'Not a tag: expected O, or B-/I-/E-/S- followed by a slot name.' },
  { id: 'schema/unknown-slot', scheme: null, description: "A span's slot is not in the project's slot list." },
  { id: 'schema/unknown-intent', scheme: null, description: "The utterance's intent is not in the project's intent list." },
  { id: 'schema/slot-not-allowed-for-intent', scheme: null, description: "A span's slot is not among the slots allowed for the utterance's intent." },
] as const;

export type RuleId = (typeof RULES)[number]['id'];
export type SchemaRuleId = Extract<RuleId, `schema/${string}`>;
export type TransitionRuleId = Exclude<RuleId, SchemaRuleId>;

/** Every rule id with a one-line description, in display order (for the UI and the docs). */
export const RULE_TABLE: readonly RuleInfo[] = RULES;

const descriptions = new Map<string, string>(RULES.map((r) => [r.id, r.description]));

export function ruleDescribe(id: RuleId): string {
  return descriptions.get(id) ?? id;
}

/** The rules that can fire for one scheme's transitions (schema rules excluded). */
export function rulesOfScheme(scheme: Scheme): readonly RuleInfo[] {
  return RULE_TABLE.filter((r) => r.scheme === scheme);
}
