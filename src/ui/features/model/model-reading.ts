/** Plain-words readings of the tagger's figures, kept apart from the screen so they are unit-tested. */
import type { CrossValidation, SpanFigures } from '../../../core/crf';
import type { CrfRunProgress } from '../../../workers/crf-run';

export interface SlotRow extends SpanFigures {
  slot: string;
  /** Gold spans of the slot: true positives plus false negatives. */
  support: number;
}

/** One row per slot, by name, as the cross-validation pooled them. */
export function slotRows(cv: CrossValidation): SlotRow[] {
  return Object.entries(cv.pooled.slots)
    .map(([slot, f]) => ({ slot, ...f, support: f.truePositives + f.falseNegatives }))
    .sort((a, b) => (a.slot < b.slot ? -1 : a.slot > b.slot ? 1 : 0));
}

/** Below this F1 a slot's suggestions need a careful look; common practice, no source. */
export const SLOT_F1_WEAK = 0.6;

const percent = (x: number) => `${Math.round(x * 100)}%`;

/** One line: what the overall figure means for trusting suggestions, and which slots to watch. */
export function crossValidationReading(cv: CrossValidation): string {
  const rows = slotRows(cv).filter((r) => r.support > 0);
  if (rows.length === 0) return 'The held-out utterances hold no slot spans, so these figures say nothing yet: label more utterances with slots first.';
  const weak = rows.filter((r) => r.f1 < SLOT_F1_WEAK).map((r) => r.slot);
  const overall = cv.pooled.overall;
  const head = `On utterances it had not seen, the model found ${percent(overall.recall)} of the labelled spans exactly, and ${percent(overall.precision)} of the spans it proposed were right (F1 ${overall.f1.toFixed(2)})`;
  if (weak.length === 0) return `${head}: its suggestions are a good start on every slot, though each still needs a person to accept it.`;
  return `${head}: check suggestions for ${weak.join(', ')} closely (F1 below ${SLOT_F1_WEAK}); the other slots are a good start.`;
}

/** Share of the whole run done, counting every fold and the final training as `maxIterations` steps each. */
export function trainProgressShare(p: CrfRunProgress): { value: number; max: number } {
  const runs = p.folds >= 2 ? p.folds + 1 : 1;
  const done = p.phase === 'cross-validating' ? p.fold : runs - 1;
  return { value: done * p.maxIterations + Math.min(p.iteration, p.maxIterations), max: runs * p.maxIterations };
}

export function trainProgressText(p: CrfRunProgress): string {
  const where = p.phase === 'cross-validating' ? `Cross-validating, fold ${p.fold + 1} of ${p.folds}` : 'Training the final model';
  return `${where}: iteration ${p.iteration} of at most ${p.maxIterations}, objective ${p.loss.toFixed(2)}`;
}
