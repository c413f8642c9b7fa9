import type { Finding, FindingLocation } from './types';

/**
 * A key that survives edits elsewhere in the corpus, so dismissals can be remembered: built from
 * the kind and the finding's content (text, slots, utterance id), never from token positions or
 * counts, which shift as the corpus changes.
 */
export function findingKey(finding: Finding): string {
  switch (finding.kind) {
    case 'variation':
      return JSON.stringify(['variation', finding.tokens]);
    case 'identical':
      return JSON.stringify(['identical', finding.tokens]);
    case 'slot-outlier':
      return JSON.stringify(['slot-outlier', finding.value, finding.slot]);
    case 'model-disagreement':
      return JSON.stringify([
        'model-disagreement',
        finding.location.id,
        finding.location.layer,
        finding.tokens,
        finding.annotatorTags,
        finding.modelTags,
      ]);
  }
}

/** Every place a finding points at, for jump-to lists and range checks. */
export function findingLocations(finding: Finding): FindingLocation[] {
  switch (finding.kind) {
    case 'variation':
    case 'identical':
      return finding.readings.flatMap((reading) => reading.locations);
    case 'slot-outlier':
      return finding.locations;
    case 'model-disagreement':
      return [finding.location];
  }
}

/** Findings the lead has not dismissed, order kept. */
export function findingsUndismissed<F extends Finding>(findings: readonly F[], dismissed: ReadonlySet<string>): F[] {
  return findings.filter((finding) => !dismissed.has(findingKey(finding)));
}
