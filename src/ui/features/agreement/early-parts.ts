import type { AgreementOutcome, AgreementResult } from '../../../workers/agreement-run';

/**
 * The final result with the early result's objects wherever they hold the same data: the worker sends
 * the figures first and then adds only the intervals (`report.ci`), so every other part is the early
 * one, and the sections showing them need not render again.
 */
export function withEarlyParts(outcome: AgreementOutcome, early: AgreementResult | null): AgreementOutcome {
  if (!outcome.ok || early === null) return outcome;
  return { ...outcome, report: { ...early.report, ci: outcome.report.ci }, overTime: early.overTime, disagreements: early.disagreements, counted: early.counted };
}
