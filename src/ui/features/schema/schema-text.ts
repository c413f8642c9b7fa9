/** Wording of the schema screen's confirmations and results. */
import type { SchemaUsage } from '../../../db/schema-edit-repo';

const count = (n: number, one: string, many: string) => `${n.toLocaleString('en')} ${n === 1 ? one : many}`;

function owners(usage: SchemaUsage): string {
  return usage.annotators.length === 0 ? '' : ` (${usage.annotators.join(', ')})`;
}

/** "312 spans in 290 layers (ann-a, ann-b)", or "no labels" when nothing uses the slot. */
export function slotUsageText(usage: SchemaUsage): string {
  if (usage.layers === 0) return 'no labels';
  return `${count(usage.spans, 'span', 'spans')} in ${count(usage.layers, 'layer', 'layers')}${owners(usage)}`;
}

export function intentUsageText(usage: SchemaUsage): string {
  if (usage.layers === 0) return 'no labels';
  return `${count(usage.layers, 'layer', 'layers')}${owners(usage)}`;
}
