/**
 * Which layers the likely-mistake scan checks, and which findings it keeps. Pure, so Node tests and
 * the e2e reference use the same rules as the worker.
 */
import { ANNOTATOR_GOLD, ANNOTATOR_MODEL, type LayerStatus } from '../core/backup/model';
import { findingLocations, type Finding, type FindingKind } from '../core/error-detect';

/** The order the screen lists the kinds in: text-level evidence first, the model's opinion last. */
export const FINDING_KINDS: readonly FindingKind[] = ['variation', 'identical', 'slot-outlier', 'model-disagreement'];

/** Places per reading whose words travel with the scan; the screen says how many more there are. */
export const LOCATIONS_SHOWN = 10;

export interface LayerRef {
  utteranceId: number;
  annotator: string;
  status: LayerStatus;
}

/**
 * Per utterance: its gold layer when that is done, since the decided labels are the ones that
 * count; otherwise every person's done layer, so each annotator's finished work gets checked (two
 * people's layers of one utterance then both count, see `findingsAcrossUtterances`). Drafts are
 * still being worked on, and the model layer holds suggestions, not labels. Sorted by utterance,
 * then owner, so a scan repeats exactly.
 */
export function findingsLayersChoose(refs: readonly LayerRef[]): LayerRef[] {
  const goldDone = new Set<number>();
  for (const ref of refs) if (ref.annotator === ANNOTATOR_GOLD && ref.status === 'done') goldDone.add(ref.utteranceId);
  const chosen = refs.filter((ref) => {
    if (ref.status !== 'done' || ref.annotator === ANNOTATOR_MODEL) return false;
    return goldDone.has(ref.utteranceId) ? ref.annotator === ANNOTATOR_GOLD : ref.annotator !== ANNOTATOR_GOLD;
  });
  return chosen.sort((a, b) => a.utteranceId - b.utteranceId || (a.annotator < b.annotator ? -1 : a.annotator > b.annotator ? 1 : 0));
}

/**
 * Variation and identical-utterance findings whose places all lie in one utterance are two people
 * disagreeing about that one utterance: the agreement and resolve screens deal with those, so they
 * are dropped here. Slot outliers and model disagreements are about one layer each and always stay.
 */
export function findingsAcrossUtterances<F extends Finding>(findings: readonly F[]): { kept: F[]; dropped: number } {
  const kept: F[] = [];
  let dropped = 0;
  for (const finding of findings) {
    if (finding.kind === 'variation' || finding.kind === 'identical') {
      const ids = new Set(findingLocations(finding).map((l) => l.id));
      if (ids.size < 2) {
        dropped++;
        continue;
      }
    }
    kept.push(finding);
  }
  return { kept, dropped };
}
