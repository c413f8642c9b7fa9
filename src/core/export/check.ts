import { transitionsValidate } from '../rules';
import type { TransitionRuleId } from '../rules';
import type { Scheme } from '../types';
import type { ExportInput } from './types';

/** One illegal transition in a chosen layer: `position` in the selection, `index` the token. */
export interface ExportViolation {
  position: number;
  id: string | undefined;
  annotator: string | undefined;
  index: number;
  rule: TransitionRuleId;
  message: string;
}

/** Every illegal transition (under `scheme`, the stored tags' scheme) in the chosen layers, in order. */
export function exportCheck(selection: ExportInput, scheme: Scheme = 'iob2'): ExportViolation[] {
  const out: ExportViolation[] = [];
  selection.utterances.forEach((utterance, position) => {
    for (const v of transitionsValidate(utterance.tags, scheme)) {
      out.push({ position, id: utterance.id, annotator: selection.annotators?.[position], index: v.index, rule: v.rule, message: v.message });
    }
  });
  return out;
}

/** Thrown by the writers when the selection still has illegal transitions and `asIs` was not chosen. */
export class ExportRefusedError extends Error {
  override name = 'ExportRefusedError';
  readonly violations: readonly ExportViolation[];

  constructor(violations: readonly ExportViolation[]) {
    const utterances = new Set(violations.map((v) => v.position)).size;
    super(
      `export refused: ${violations.length} illegal transition(s) in ${utterances} utterance(s); ` +
        'repair them, or choose to export as-is',
    );
    this.violations = violations;
  }
}
