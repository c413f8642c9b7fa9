/**
 * Which layers the agreement screen compares, kept in the URL query (`a`, `b`, `all`, `drafts`) so
 * a chosen comparison survives a reload and can be shared as a link.
 */
import { ANNOTATORS_RESERVED, type LayerStatus } from '../../../core/backup/model';
import type { AgreementRequest } from '../../../workers/agreement-run';

export interface AgreementChoice {
  a: string;
  b: string;
  /** All people's layers (Fleiss' kappa, Krippendorff's alpha, pairwise), not only A and B. */
  all: boolean;
  /** Count draft layers as well as done ones. */
  drafts: boolean;
}

export type StatusCounts = Record<string, Partial<Record<LayerStatus, number>>>;

function byName(x: string, y: string): number {
  return x < y ? -1 : x > y ? 1 : 0;
}

/** Layer owners with any layer: people by name, then the reserved gold and model layers. */
export function layerOwners(counts: StatusCounts): string[] {
  const owners = Object.keys(counts);
  const people = owners.filter((o) => !ANNOTATORS_RESERVED.includes(o)).sort(byName);
  return [...people, ...ANNOTATORS_RESERVED.filter((o) => owners.includes(o))];
}

export function choiceStatuses(choice: Pick<AgreementChoice, 'drafts'>): LayerStatus[] {
  return choice.drafts ? ['done', 'draft'] : ['done'];
}

/** The choice the query names, with defaults for what it leaves out: the first two owners. Null with fewer than two. */
export function choiceFromQuery(query: Record<string, string>, owners: readonly string[]): AgreementChoice | null {
  if (owners.length < 2) return null;
  const known = (name: string | undefined) => (name !== undefined && owners.includes(name) ? name : undefined);
  const a = known(query.a) ?? (owners[0] as string);
  const b = known(query.b) ?? owners.find((o) => o !== a) ?? a;
  return { a, b, all: query.all === '1', drafts: query.drafts === '1' };
}

export function choiceQuery(choice: AgreementChoice): Record<string, string> {
  return { a: choice.a, b: choice.b, ...(choice.all && { all: '1' }), ...(choice.drafts && { drafts: '1' }) };
}

function counted(counts: StatusCounts, owner: string, statuses: readonly LayerStatus[]): number {
  const byStatus = counts[owner] ?? {};
  return statuses.reduce((sum, s) => sum + (byStatus[s] ?? 0), 0);
}

/**
 * The worker request: A first (the aligned order then follows A, as `agree A B` does), B, then with
 * `all` every other person holding counted layers. Null, with the reason, when A and B coincide.
 */
export function choiceRequest(projectId: number, choice: AgreementChoice, counts: StatusCounts): { request: AgreementRequest } | { problem: string } {
  if (choice.a === choice.b) return { problem: 'Choose two different layers to compare.' };
  const statuses = choiceStatuses(choice);
  const others = choice.all ? layerOwners(counts).filter((o) => o !== choice.a && o !== choice.b && !ANNOTATORS_RESERVED.includes(o) && counted(counts, o, statuses) > 0) : [];
  return { request: { projectId, annotators: [choice.a, choice.b, ...others], pair: [choice.a, choice.b], statuses } };
}
