/** Plain logic of the team screen: reading its fields, the preview table, file names and summaries. */
import { ANNOTATORS_RESERVED, type LayerStatus } from '../../../core/backup/model';
import type { AssignmentPlan } from '../../../core/exchange';
import type { MergeSummary } from '../../../db/exchange-repo';

const CONTROL = /\p{Cc}/u;
export const SEED_MAX = 0xffffffff;

/** Annotator ids from a comma- or space-separated list: trimmed, each once, none reserved. */
export function annotatorIdsParse(text: string): { ids: string[]; problem: string | null } {
  const ids = [...new Set(text.split(/[,\s]+/).filter((id) => id !== ''))];
  const reserved = ids.find((id) => ANNOTATORS_RESERVED.includes(id));
  if (reserved !== undefined) return { ids, problem: `“${reserved}” is a reserved layer name, not a person.` };
  if (ids.some((id) => CONTROL.test(id))) return { ids, problem: 'Annotator ids cannot hold control characters.' };
  if (ids.length === 0) return { ids, problem: 'Name at least one annotator.' };
  return { ids, problem: null };
}

/** A percentage from 0 to 100 as a fraction, or null. */
export function overlapParse(text: string): number | null {
  const trimmed = text.trim();
  if (!/^\d+(\.\d+)?$/.test(trimmed)) return null;
  const percent = Number(trimmed);
  return percent >= 0 && percent <= 100 ? percent / 100 : null;
}

/** A whole number from 0 to 2³²−1 (the range mulberry32 takes), or null. */
export function wholeParse(text: string, max = SEED_MAX): number | null {
  const trimmed = text.trim();
  if (!/^\d+$/.test(trimmed)) return null;
  const n = Number(trimmed);
  return n <= max ? n : null;
}

export const STATUS_CHOICES: readonly (LayerStatus | 'none')[] = ['none', 'unlabelled', 'draft', 'done', 'skipped', 'flagged'];

export function statusChoiceText(status: LayerStatus | 'none'): string {
  return status === 'none' ? 'no layer yet' : status;
}

export interface PreviewRow {
  annotator: string;
  total: number;
  /** Utterances this annotator shares with another one. */
  shared: number;
}

export function previewRows<T>(plan: AssignmentPlan<T>): PreviewRow[] {
  return Object.entries(plan.loads).map(([annotator, total]) => ({
    annotator,
    total,
    shared: plan.items.filter((i) => i.annotators.length === 2 && i.annotators.includes(annotator)).length,
  }));
}

/** Characters unsafe in file names on common systems (common practice, no source). */
function fileNameSafe(name: string): string {
  return name.replace(/[\p{Cc}<>:"/\\|?*]+/gu, '_').trim() || 'project';
}

export function packFileName(projectName: string, annotator: string): string {
  return `${fileNameSafe(projectName)}-pack-${fileNameSafe(annotator)}.slotsmith-pack.jsonl`;
}

export function layersFileName(projectName: string, annotator: string): string {
  return `${fileNameSafe(projectName)}-layers-${fileNameSafe(annotator)}.slotsmith-layers.jsonl`;
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** One sentence for the live region; the table carries the numbers too. */
export function mergeSummaryText(s: MergeSummary): string {
  const parts = [`${plural(s.added, 'new layer')}`, `${plural(s.replaced, 'newer revision')}`, `${s.unchanged} unchanged`];
  if (s.older.length > 0) parts.push(`${plural(s.older.length, 'older layer')} ignored (lines ${s.older.join(', ')})`);
  if (s.conflicts.length > 0) parts.push(`${plural(s.conflicts.length, 'layer')} edited on two machines (lines ${s.conflicts.join(', ')}; the later edit kept)`);
  return `Merged ${s.annotator}’s layers: ${parts.join(', ')}.`;
}
