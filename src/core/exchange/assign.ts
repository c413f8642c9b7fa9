/**
 * Seeded overlap assignment: which annotators get which utterances. Exactly round(f·N) utterances go
 * to two annotators and the rest to one; each single goes to the least loaded annotator.
 * Doubles are dealt twice, and the first plan whose loads differ by at most one is kept:
 * 1. pairs first: each double to the pair with the fewest doubles so far (then the smaller summed
 *    load), so pair counts differ by at most one; singles usually even out the loads;
 * 2. loads first: each double to the pair with the smallest summed load (then the fewest doubles);
 *    this always keeps loads within one (if they differ by at most one before a step, they still do
 *    after it), while pairs may differ a little more. Used when few singles are left to even out.
 * Ties go to a seeded coin. Same seed, same input: same plan.
 */
import { mulberry32Floats } from '../random';

export interface AssignmentItem<T> {
  id: T;
  /** One or two annotators, in the order they were given. */
  annotators: string[];
}

export interface AssignmentPair {
  a: string;
  b: string;
  count: number;
}

export interface AssignmentPlan<T> {
  /** In the order of the ids given (project order). */
  items: AssignmentItem<T>[];
  loads: Record<string, number>;
  pairs: AssignmentPair[];
  doubles: number;
}

/** Utterances that go to two annotators: round(f·N), halves rounded up. */
export function assignmentDoubles(count: number, overlap: number): number {
  return Math.round(overlap * count);
}

/** Why the plan cannot be made, in words for the user; null when it can. */
export function assignmentProblem(count: number, annotators: readonly string[], overlap: number): string | null {
  if (annotators.length === 0) return 'Choose at least one annotator.';
  if (new Set(annotators).size !== annotators.length) return 'Each annotator can be chosen once only.';
  if (!(overlap >= 0 && overlap <= 1)) return 'The overlap must be between 0 and 100 %.';
  if (assignmentDoubles(count, overlap) > 0 && annotators.length < 2) return 'An overlap needs at least two annotators.';
  if (count === 0) return 'No utterances are chosen.';
  return null;
}

function shuffled(n: number, random: () => number): number[] {
  const order = Array.from({ length: n }, (_, i) => i);
  // Fisher–Yates (Knuth, TAOCP vol. 2, Algorithm P).
  for (let i = n - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    const a = order[i] as number;
    order[i] = order[j] as number;
    order[j] = a;
  }
  return order;
}

/** Index of a random minimum of `score` over 0..n-1 (ties broken by `random`, reservoir style). */
function argMinRandom(n: number, score: (i: number) => number, random: () => number): number {
  let best = -1;
  let bestScore = Infinity;
  let ties = 0;
  for (let i = 0; i < n; i++) {
    const s = score(i);
    if (s < bestScore) {
      best = i;
      bestScore = s;
      ties = 1;
    } else if (s === bestScore && random() * ++ties < 1) best = i;
  }
  return best;
}

/** The plan for `ids` (project order); throws RangeError when `assignmentProblem` names a problem. */
export function assignmentPlan<T>(ids: readonly T[], annotators: readonly string[], overlap: number, seed: number): AssignmentPlan<T> {
  const problem = assignmentProblem(ids.length, annotators, overlap);
  if (problem !== null) throw new RangeError(problem);
  const pairsFirst = planDeal(ids, annotators, overlap, seed, true);
  const loads = Object.values(pairsFirst.loads);
  return Math.max(...loads) - Math.min(...loads) <= 1 ? pairsFirst : planDeal(ids, annotators, overlap, seed, false);
}

function planDeal<T>(ids: readonly T[], annotators: readonly string[], overlap: number, seed: number, pairsFirst: boolean): AssignmentPlan<T> {
  const random = mulberry32Floats(seed);
  const k = annotators.length;
  const doubles = assignmentDoubles(ids.length, overlap);
  const order = shuffled(ids.length, random);
  const loads = new Array<number>(k).fill(0);
  const pairs: [number, number][] = [];
  for (let a = 0; a < k; a++) for (let b = a + 1; b < k; b++) pairs.push([a, b]);
  const pairCounts = new Array<number>(pairs.length).fill(0);
  const owners: number[][] = new Array<number[]>(ids.length);
  // Whole-number scores: the first criterion times a weight above any value of the second.
  const weight = 2 * ids.length + 1;
  for (let n = 0; n < order.length; n++) {
    const index = order[n] as number;
    if (n < doubles) {
      const p = argMinRandom(pairs.length, (i) => {
        const [a, b] = pairs[i] as [number, number];
        const load = (loads[a] as number) + (loads[b] as number);
        const count = pairCounts[i] as number;
        return pairsFirst ? count * weight + load : load * weight + count;
      }, random);
      const [a, b] = pairs[p] as [number, number];
      pairCounts[p] = (pairCounts[p] as number) + 1;
      loads[a] = (loads[a] as number) + 1;
      loads[b] = (loads[b] as number) + 1;
      owners[index] = [a, b];
    } else {
      const a = argMinRandom(k, (i) => loads[i] as number, random);
      loads[a] = (loads[a] as number) + 1;
      owners[index] = [a];
    }
  }
  return {
    items: ids.map((id, i) => ({ id, annotators: (owners[i] as number[]).map((a) => annotators[a] as string) })),
    loads: Object.fromEntries(annotators.map((name, i) => [name, loads[i] as number])),
    pairs: pairs.map(([a, b], i) => ({ a: annotators[a] as string, b: annotators[b] as string, count: pairCounts[i] as number })),
    doubles,
  };
}

/** Each annotator's ids, in the order given. */
export function assignmentByAnnotator<T>(plan: AssignmentPlan<T>): Map<string, T[]> {
  const out = new Map<string, T[]>(Object.keys(plan.loads).map((a) => [a, []]));
  for (const item of plan.items) for (const a of item.annotators) out.get(a)?.push(item.id);
  return out;
}
