import { spansFromTags } from '../schemes';
import { locationCompare, stringCompare, tagsNormalise, tokenFold } from './normalise';
import type { FindingLocation, LabelledUtterance, SlotOutlierFinding } from './types';

export interface SlotOutlierOptions {
  /** The majority slot must be seen at least this many times as often (default 10). */
  minRatio?: number;
  /** …and at least this many times in all (default 5), so two-against-one is not an outlier. */
  minMajority?: number;
}

export const SLOT_OUTLIER_MIN_RATIO = 10;
export const SLOT_OUTLIER_MIN_MAJORITY = 5;

/**
 * Span values (case-folded tokens joined by a space) seen k times under slot A and at least
 * minRatio·k times under the value's most frequent slot B: the A occurrences are reported,
 * highest ratio first. The thresholds are common practice, no source.
 */
export function slotOutliersFind(utterances: readonly LabelledUtterance[], options: SlotOutlierOptions = {}): SlotOutlierFinding[] {
  const minRatio = options.minRatio ?? SLOT_OUTLIER_MIN_RATIO;
  const minMajority = options.minMajority ?? SLOT_OUTLIER_MIN_MAJORITY;
  const values = new Map<string, Map<string, FindingLocation[]>>();
  for (const utterance of utterances) {
    for (const span of spansFromTags(tagsNormalise(utterance))) {
      const value = utterance.tokens.slice(span.start, span.end).map(tokenFold).join(' ');
      let slots = values.get(value);
      if (slots === undefined) {
        slots = new Map();
        values.set(value, slots);
      }
      const location: FindingLocation = { id: utterance.id, layer: utterance.layer, start: span.start, end: span.end };
      const locations = slots.get(span.slot);
      if (locations === undefined) slots.set(span.slot, [location]);
      else locations.push(location);
    }
  }
  const findings: SlotOutlierFinding[] = [];
  for (const [value, slots] of values) {
    if (slots.size < 2) continue;
    const ranked = [...slots.entries()].sort((a, b) => b[1].length - a[1].length || stringCompare(a[0], b[0]));
    const [majoritySlot, majorityLocations] = ranked[0] ?? ['', []];
    const majorityCount = majorityLocations.length;
    if (majorityCount < minMajority) continue;
    for (const [slot, locations] of ranked.slice(1)) {
      const ratio = majorityCount / locations.length;
      if (ratio < minRatio) continue;
      findings.push({ kind: 'slot-outlier', value, slot, count: locations.length, majoritySlot, majorityCount, ratio, locations: locations.sort(locationCompare) });
    }
  }
  return findings.sort(
    (a, b) => b.ratio - a.ratio || b.majorityCount - a.majorityCount || stringCompare(a.value, b.value) || stringCompare(a.slot, b.slot),
  );
}
