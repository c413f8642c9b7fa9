/** The export screen's choices as plain values, their validation, and the words for the outcome. */
import { LAYER_STATUSES, splitOptionsProblem, type ExportFormat, type LayerPolicy, type LayerStatus, type SelectionReport } from '../../../core/export';
import type { MaskKind } from '../../../core/privacy';
import type { ExportRequest } from '../../../workers/export-run';

export type PolicyKind = LayerPolicy['kind'];

export interface ExportForm {
  policy: PolicyKind;
  /** Used by `annotator` and `gold-else`. */
  annotator: string;
  statuses: LayerStatus[];
  format: ExportFormat;
  split: boolean;
  /** Ratios and seed as typed, so a half-typed number is shown as typed and explained. */
  train: string;
  dev: string;
  test: string;
  seed: string;
  maskDigits: boolean;
  maskEmail: boolean;
}

export function exportFormDefault(hasGold: boolean, annotator: string): ExportForm {
  return {
    policy: hasGold ? 'gold' : 'annotator',
    annotator,
    statuses: ['done'],
    format: 'iob2',
    split: false,
    train: '0.8',
    dev: '0.1',
    test: '0.1',
    seed: '1',
    maskDigits: false,
    maskEmail: false,
  };
}

function numberRead(text: string): number {
  return text.trim() === '' ? Number.NaN : Number(text);
}

/** The worker request, or the first problem in words. */
export function exportFormRequest(form: ExportForm, projectId: number, asIs = false): { request: ExportRequest } | { problem: string } {
  let policy: LayerPolicy;
  if (form.policy === 'gold') policy = { kind: 'gold' };
  else if (form.annotator === '') return { problem: 'Choose whose labels to write: this project has no annotator yet.' };
  else policy = { kind: form.policy, annotator: form.annotator };
  if (form.statuses.length === 0) return { problem: 'Tick at least one status to write.' };
  const mask: MaskKind[] = [...(form.maskDigits ? (['digits'] as const) : []), ...(form.maskEmail ? (['email'] as const) : [])];
  const request: ExportRequest = {
    projectId,
    policy,
    // In the fixed status order, so equal choices give equal requests.
    statuses: LAYER_STATUSES.filter((s) => form.statuses.includes(s)),
    format: form.format,
    mask,
    asIs,
  };
  if (form.split) {
    const split = { ratios: { train: numberRead(form.train), dev: numberRead(form.dev), test: numberRead(form.test) }, seed: numberRead(form.seed) };
    const problem = splitOptionsProblem(split);
    if (problem !== null) return { problem: `Split: ${problem}.` };
    request.split = split;
  }
  return { request };
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** What was kept and why the rest was left out, in one or two plain sentences. */
export function exportReportText(report: SelectionReport): string {
  const parts = [`${report.kept} of ${plural(report.total, 'utterance')} chosen.`];
  const reasons: string[] = [];
  if (report.missingLayer > 0) reasons.push(`${report.missingLayer} without a layer of the chosen kind`);
  for (const status of LAYER_STATUSES) {
    const n = report.filteredByStatus[status];
    if (n > 0) reasons.push(`${n} marked ${status}`);
  }
  if (reasons.length > 0) parts.push(`Left out: ${reasons.join(', ')}.`);
  return parts.join(' ');
}
