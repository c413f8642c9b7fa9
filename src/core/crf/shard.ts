import { CRF_SPAN } from './attributes';
import type { CrfDataset } from './dataset';
import { Lattice } from './lattice';

// tokenScoresSum and marginalsToUnits below are unrolled over exactly five window places.
if (CRF_SPAN !== 5) throw new Error('shard.ts assumes a window of ±2 (CRF_SPAN = 5)');

/**
 * Shards per training, whatever the number of threads: the objective is summed shard by shard in
 * shard order, so one thread or four give bit-identical weights, on any machine.
 */
export const CRF_SHARDS = 4;

export interface CrfStructure {
  labelCount: number;
  featureStarts: Int32Array;
  featureLabels: Uint16Array;
}

/**
 * A contiguous run of utterances with only the units its tokens use (renumbered from 0), their
 * attribute ids global: all a thread needs to compute the shard's part of the objective.
 * Plain typed arrays, so it crosses to a worker by structured clone.
 */
export interface CrfShardData extends CrfStructure {
  tokenStarts: Int32Array;
  tokenUnits: Int32Array;
  unitStarts: Int32Array;
  unitAttrs: Int32Array;
}

/** A shard's part of the objective at some weights: Σ log Z over its utterances, and its expected feature counts (state features, then L × L transitions). */
export interface CrfShardValue {
  logZ: number;
  expected: Float64Array;
}

/**
 * Another thread that holds some shards (a Web Worker, a Node worker thread). `load` replaces what
 * it held; `evaluate` answers each loaded shard's value, in load order. Owned by the caller, who ends it.
 */
export interface CrfShardHelper {
  load(shards: CrfShardData[]): Promise<void>;
  evaluate(weights: Float64Array): Promise<CrfShardValue[]>;
}

/** Utterances cut into `count` contiguous shards of about equal token counts (forward–backward's cost grows with tokens). */
export function crfShardsSplit(data: CrfDataset, structure: CrfStructure, count = CRF_SHARDS): CrfShardData[] {
  const utterances = data.tokenStarts.length - 1;
  const tokens = data.tokenStarts[utterances] as number;
  const bounds = [0];
  let u = 0;
  for (let k = 1; k < count; k++) {
    // Integer test, so the cut cannot depend on rounding: the first utterance starting at or past k/count of the tokens.
    while (u < utterances && (data.tokenStarts[u] as number) * count < k * tokens) u++;
    bounds.push(u);
  }
  bounds.push(utterances);
  const shards: CrfShardData[] = [];
  for (let k = 0; k < count; k++) shards.push(shardCut(data, structure, bounds[k] as number, bounds[k + 1] as number));
  return shards;
}

function shardCut(data: CrfDataset, structure: CrfStructure, fromUtterance: number, toUtterance: number): CrfShardData {
  const firstToken = data.tokenStarts[fromUtterance] as number;
  const endToken = data.tokenStarts[toUtterance] as number;
  const tokenStarts = new Int32Array(toUtterance - fromUtterance + 1);
  for (let u = fromUtterance; u <= toUtterance; u++) tokenStarts[u - fromUtterance] = (data.tokenStarts[u] as number) - firstToken;
  // Local unit ids in order of first use, so the cut depends on the data only.
  const local = new Map<number, number>();
  const tokenUnits = new Int32Array((endToken - firstToken) * CRF_SPAN);
  let attrCount = 0;
  for (let i = 0; i < tokenUnits.length; i++) {
    const unit = data.tokenUnits[firstToken * CRF_SPAN + i] as number;
    let id = local.get(unit);
    if (id === undefined) {
      id = local.size;
      local.set(unit, id);
      attrCount += (data.unitStarts[unit + 1] as number) - (data.unitStarts[unit] as number);
    }
    tokenUnits[i] = id;
  }
  const unitStarts = new Int32Array(local.size + 1);
  const unitAttrs = new Int32Array(attrCount);
  let at = 0;
  for (const [unit, id] of local) {
    unitStarts[id] = at;
    const end = data.unitStarts[unit + 1] as number;
    for (let k = data.unitStarts[unit] as number; k < end; k++) unitAttrs[at++] = data.unitAttrs[k] as number;
  }
  unitStarts[local.size] = at;
  return { labelCount: structure.labelCount, featureStarts: structure.featureStarts, featureLabels: structure.featureLabels, tokenStarts, tokenUnits, unitStarts, unitAttrs };
}

/**
 * One shard's part of the objective (see CrfObjective): forward–backward over its utterances.
 * Scores and expectations go through the shard's units: a token's scores are the sum of its
 * units' score rows, and a feature's expectation is the sum, over the units holding its
 * attribute, of the marginals those units saw.
 */
export class CrfShardObjective {
  readonly size: number;
  private readonly stateCount: number;
  private readonly lattice: Lattice;
  private readonly state: Float64Array;
  private readonly expTrans: Float64Array;
  /** Units × labels: each unit's summed state weights, then the marginals summed over its tokens. */
  private readonly unitScores: Float64Array;
  private readonly unitExpected: Float64Array;
  /** Per unit, its row's maximum, and exp(row − maximum): a token's exp scores are then a product of five rows, with no exp per token. */
  private readonly unitMax: Float64Array;
  private readonly unitExp: Float64Array;
  /** Σ over tokens of α̂_t(i) Ŝ_{t+1}(j) β̂_{t+1}(j), L × L (see Lattice.runScaled). */
  private readonly pairSums: Float64Array;

  constructor(private readonly shard: CrfShardData) {
    const L = shard.labelCount;
    this.stateCount = shard.featureLabels.length;
    this.size = this.stateCount + L * L;
    this.lattice = new Lattice(L);
    let longest = 1;
    for (let u = 0; u + 1 < shard.tokenStarts.length; u++) {
      longest = Math.max(longest, (shard.tokenStarts[u + 1] as number) - (shard.tokenStarts[u] as number));
    }
    this.lattice.reserve(longest);
    this.state = new Float64Array(longest * L);
    this.expTrans = new Float64Array(L * L);
    const units = shard.unitStarts.length - 1;
    this.unitScores = new Float64Array(units * L);
    this.unitExpected = new Float64Array(units * L);
    this.unitMax = new Float64Array(units);
    this.unitExp = new Float64Array(units * L);
    this.pairSums = new Float64Array(L * L);
  }

  /** Σ log Z into the return value, the expected counts into `expected` (overwritten, `size` long). */
  evaluate(weights: Float64Array, expected: Float64Array): number {
    const { shard, lattice, state, expTrans, stateCount, unitScores, unitExpected, unitMax, unitExp, pairSums } = this;
    const { featureStarts, featureLabels, tokenStarts, tokenUnits } = shard;
    const L = shard.labelCount;
    for (let c = 0; c < L * L; c++) expTrans[c] = Math.exp(weights[stateCount + c] as number);
    lattice.transitionsSet(expTrans);
    unitScoresFill(featureStarts, featureLabels, weights, L, shard.unitStarts, shard.unitAttrs, unitScores);
    unitRowsExp(unitScores, L, unitMax, unitExp);
    unitExpected.fill(0);
    pairSums.fill(0);
    expected.fill(0);
    let logZSum = 0;
    for (let u = 0; u + 1 < tokenStarts.length; u++) {
      const first = tokenStarts[u] as number;
      const tokens = (tokenStarts[u + 1] as number) - first;
      if (tokens === 0) continue;
      let shift = tokenExpFill(tokenUnits, unitMax, unitExp, L, first, tokens, lattice.expState);
      if (Number.isNaN(shift)) {
        // Some token's product underflowed (weights far apart): the plain way, exp per token of the summed scores.
        tokenScoresSum(tokenUnits, unitScores, L, first, tokens, state);
        shift = stateExpFill(state, L, tokens, lattice.expState);
      }
      logZSum += shift + lattice.runScaled(tokens, expTrans, null, pairSums);
      marginalsToUnits(tokenUnits, lattice.marginals, L, first, tokens, unitExpected);
    }
    for (let c = 0; c < L * L; c++) expected[stateCount + c] = (pairSums[c] as number) * (expTrans[c] as number);
    unitRowsToFeatures(featureStarts, featureLabels, L, shard.unitStarts, shard.unitAttrs, unitExpected, expected);
    return logZSum;
  }
}

/** Each unit row's maximum, and exp(row − maximum) (every row then holds a 1, the rest in (0, 1]). */
function unitRowsExp(unitScores: Float64Array, labelCount: number, unitMax: Float64Array, unitExp: Float64Array): void {
  for (let u = 0; u < unitMax.length; u++) {
    const row = u * labelCount;
    let max = unitScores[row] as number;
    for (let j = 1; j < labelCount; j++) {
      const v = unitScores[row + j] as number;
      if (v > max) max = v;
    }
    unitMax[u] = max;
    for (let j = 0; j < labelCount; j++) unitExp[row + j] = Math.exp((unitScores[row + j] as number) - max);
  }
}

/**
 * A sequence's exp state scores (T × L) as products of its tokens' five unit rows, into `out`;
 * returns the shift (Σ of the rows' maxima) log Z must add back, or NaN when some token's row
 * fell below UNDERFLOW_GUARD everywhere, where forward–backward's scaling could lose it.
 */
function tokenExpFill(tokenUnits: Int32Array, unitMax: Float64Array, unitExp: Float64Array, labelCount: number, firstToken: number, tokenCount: number, out: Float64Array): number {
  let shift = 0;
  for (let t = 0; t < tokenCount; t++) {
    const at = (firstToken + t) * CRF_SPAN;
    const row = t * labelCount;
    const a0 = tokenUnits[at] as number;
    const a1 = tokenUnits[at + 1] as number;
    const a2 = tokenUnits[at + 2] as number;
    const a3 = tokenUnits[at + 3] as number;
    const a4 = tokenUnits[at + 4] as number;
    shift += (unitMax[a0] as number) + (unitMax[a1] as number) + (unitMax[a2] as number) + (unitMax[a3] as number) + (unitMax[a4] as number);
    const u0 = a0 * labelCount;
    const u1 = a1 * labelCount;
    const u2 = a2 * labelCount;
    const u3 = a3 * labelCount;
    const u4 = a4 * labelCount;
    let max = 0;
    for (let j = 0; j < labelCount; j++) {
      const v = (unitExp[u0 + j] as number) * (unitExp[u1 + j] as number) * (unitExp[u2 + j] as number) * (unitExp[u3 + j] as number) * (unitExp[u4 + j] as number);
      out[row + j] = v;
      if (v > max) max = v;
    }
    if (max < UNDERFLOW_GUARD) return Number.NaN;
  }
  return shift;
}

/** Far above the smallest normal double (~2.2e-308), so α's per-column scaling keeps full precision. */
const UNDERFLOW_GUARD = 1e-200;

/** exp(state − row maximum) into `out`; returns Σ of the maxima. */
function stateExpFill(state: Float64Array, labelCount: number, tokenCount: number, out: Float64Array): number {
  let shift = 0;
  for (let t = 0; t < tokenCount; t++) {
    const base = t * labelCount;
    let max = state[base] as number;
    for (let j = 1; j < labelCount; j++) {
      const v = state[base + j] as number;
      if (v > max) max = v;
    }
    shift += max;
    for (let j = 0; j < labelCount; j++) out[base + j] = Math.exp((state[base + j] as number) - max);
  }
  return shift;
}

/** The helper thread's side: keep the shards `load` hands over, answer `evaluate` for each in load order (fresh arrays, free to transfer). */
export function crfShardService(): { load(shards: CrfShardData[]): void; evaluate(weights: Float64Array): CrfShardValue[] } {
  let objectives: CrfShardObjective[] = [];
  return {
    load(shards) {
      objectives = shards.map((shard) => new CrfShardObjective(shard));
    },
    evaluate(weights) {
      return objectives.map((objective) => {
        const expected = new Float64Array(objective.size);
        return { logZ: objective.evaluate(weights, expected), expected };
      });
    },
  };
}

/** Each unit's row of state scores: Σ over its attributes' features of the weight, at the feature's label. */
export function unitScoresFill(
  featureStarts: Int32Array,
  featureLabels: Uint16Array,
  weights: Float64Array,
  labelCount: number,
  unitStarts: Int32Array,
  unitAttrs: Int32Array,
  out: Float64Array,
): void {
  out.fill(0);
  for (let u = 0; u + 1 < unitStarts.length; u++) {
    const row = u * labelCount;
    const end = unitStarts[u + 1] as number;
    for (let k = unitStarts[u] as number; k < end; k++) {
      const a = unitAttrs[k] as number;
      const stop = featureStarts[a + 1] as number;
      for (let f = featureStarts[a] as number; f < stop; f++) {
        const cell = row + (featureLabels[f] as number);
        out[cell] = (out[cell] as number) + (weights[f] as number);
      }
    }
  }
}

/** The reverse of unitScoresFill: add each unit row's value at a feature's label into that feature. */
export function unitRowsToFeatures(
  featureStarts: Int32Array,
  featureLabels: Uint16Array,
  labelCount: number,
  unitStarts: Int32Array,
  unitAttrs: Int32Array,
  rows: Float64Array,
  out: Float64Array,
): void {
  for (let u = 0; u + 1 < unitStarts.length; u++) {
    const row = u * labelCount;
    const end = unitStarts[u + 1] as number;
    for (let k = unitStarts[u] as number; k < end; k++) {
      const a = unitAttrs[k] as number;
      const stop = featureStarts[a + 1] as number;
      for (let f = featureStarts[a] as number; f < stop; f++) {
        out[f] = (out[f] as number) + (rows[row + (featureLabels[f] as number)] as number);
      }
    }
  }
}

/** A sequence's state scores (T × L): per token, the sum of its window units' rows (five places, CRF_SPAN). */
function tokenScoresSum(tokenUnits: Int32Array, unitScores: Float64Array, labelCount: number, firstToken: number, tokenCount: number, out: Float64Array): void {
  for (let t = 0; t < tokenCount; t++) {
    const at = (firstToken + t) * CRF_SPAN;
    const row = t * labelCount;
    const u0 = (tokenUnits[at] as number) * labelCount;
    const u1 = (tokenUnits[at + 1] as number) * labelCount;
    const u2 = (tokenUnits[at + 2] as number) * labelCount;
    const u3 = (tokenUnits[at + 3] as number) * labelCount;
    const u4 = (tokenUnits[at + 4] as number) * labelCount;
    for (let j = 0; j < labelCount; j++) {
      out[row + j] =
        (unitScores[u0 + j] as number) + (unitScores[u1 + j] as number) + (unitScores[u2 + j] as number) + (unitScores[u3 + j] as number) + (unitScores[u4 + j] as number);
    }
  }
}

/** Add each token's marginal row into each of its window units' rows. */
function marginalsToUnits(tokenUnits: Int32Array, marginals: Float64Array, labelCount: number, firstToken: number, tokenCount: number, out: Float64Array): void {
  for (let t = 0; t < tokenCount; t++) {
    const at = (firstToken + t) * CRF_SPAN;
    const row = t * labelCount;
    const u0 = (tokenUnits[at] as number) * labelCount;
    const u1 = (tokenUnits[at + 1] as number) * labelCount;
    const u2 = (tokenUnits[at + 2] as number) * labelCount;
    const u3 = (tokenUnits[at + 3] as number) * labelCount;
    const u4 = (tokenUnits[at + 4] as number) * labelCount;
    for (let j = 0; j < labelCount; j++) {
      const m = marginals[row + j] as number;
      out[u0 + j] = (out[u0 + j] as number) + m;
      out[u1 + j] = (out[u1 + j] as number) + m;
      out[u2 + j] = (out[u2 + j] as number) + m;
      out[u3 + j] = (out[u3 + j] as number) + m;
      out[u4 + j] = (out[u4 + j] as number) + m;
    }
  }
}
