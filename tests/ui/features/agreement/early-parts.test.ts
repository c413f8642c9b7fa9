import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { columnsRead } from '../../../../src/core/formats';
import { withEarlyParts } from '../../../../src/ui/features/agreement/early-parts';
import { agreementRun, type AgreementOutcome, type AgreementRequest, type AgreementResult } from '../../../../src/workers/agreement-run';
import { dbTest } from '../../../db/helpers';
import { agreementSeed } from '../../../workers/agreement-seed';

// The invented sample corpus (sample-corpus/README.md).
const A = columnsRead(readFileSync('sample-corpus/ann-a.iob2')).utterances;
const B = columnsRead(readFileSync('sample-corpus/ann-b.iob2')).utterances;

function ok(outcome: AgreementOutcome): AgreementResult {
  if (!outcome.ok) throw new Error(outcome.message);
  return outcome;
}

const request = (projectId: number, extra: Partial<AgreementRequest> = {}): AgreementRequest => ({
  projectId,
  annotators: ['ann-a', 'ann-b'],
  pair: ['ann-a', 'ann-b'],
  statuses: ['done'],
  ...extra,
});

describe('the early result and the final one', () => {
  it('differ only in the intervals and timings, so the screen keeps the early parts (withEarlyParts)', async () => {
    const db = dbTest();
    const { projectId } = await agreementSeed(db, [
      { annotator: 'ann-a', utterances: A },
      { annotator: 'ann-b', utterances: B },
    ]);
    let early: AgreementResult | null = null;
    const final = ok(await agreementRun(db, request(projectId, { bootstrap: 50 }), undefined, { onPoint: (e) => (early = e) }));
    if (early === null) throw new Error('no early result');
    const first = early as AgreementResult;
    expect(first.intervalsPending).toBe(true);
    expect(first.report.ci).toBeNull();
    expect(final.report.ci).not.toBeNull();
    const { ci: _ci, ...finalRest } = final.report;
    const { ci: _none, ...earlyRest } = first.report;
    expect(earlyRest).toEqual(finalRest);
    expect(first.overTime).toEqual(final.overTime);
    expect(first.disagreements).toEqual(final.disagreements);
    expect(first.counted).toEqual(final.counted);
    const merged = withEarlyParts(final, first);
    if (!merged.ok) throw new Error('merged must stay ok');
    // The early objects themselves (so the sections are not rendered again), with the final intervals and timings.
    expect(merged.report.perSlot).toBe(first.report.perSlot);
    expect(merged.overTime).toBe(first.overTime);
    expect(merged.report.ci).toBe(final.report.ci);
    expect(merged.timings).toBe(final.timings);
    expect(merged.intervalsPending).toBe(false);
    expect(merged).toEqual(final);
  });
});
