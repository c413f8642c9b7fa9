/** The overview screen's small decisions, apart from React so they are tested in Node. */
import { ANNOTATORS_RESERVED, LAYER_STATUSES, type LayerStatus } from '../../../core/backup/model';
import type { OverviewResult } from '../../../workers/agreement-overview';

export function distributionStatuses(drafts: boolean): LayerStatus[] {
  return drafts ? ['done', 'draft'] : ['done'];
}

/** The `source` query value when it names a layer owner; null (every annotator) otherwise. */
export function overviewSourceOf(value: string | undefined, owners: readonly string[]): string | null {
  return value !== undefined && owners.includes(value) ? value : null;
}

export function progressTableRows(result: OverviewResult): { annotator: string; counts: number[] }[] {
  return result.annotators.map((a) => ({ annotator: a.annotator, counts: LAYER_STATUSES.map((s) => a.statuses[s]) }));
}

/** People's layers in any status (gold and model are not people's work). */
export function peopleLayers(result: OverviewResult): number {
  let total = 0;
  for (const a of result.annotators) {
    if (ANNOTATORS_RESERVED.includes(a.annotator)) continue;
    for (const s of LAYER_STATUSES) total += a.statuses[s];
  }
  return total;
}
