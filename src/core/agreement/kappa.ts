/**
 * Chance-corrected agreement from sufficient statistics. Each works on exact integer counts where it
 * can (counts up to ~9e7 tokens keep n² below 2^53), dividing once at the end, and returns null with
 * a reason where the coefficient is undefined: never NaN or Infinity.
 */

export interface KappaFigure {
  value: number | null;
  reason?: string;
  /** Observed agreement P_o (or Fleiss' P̄); null when there is nothing to compare. */
  observed: number | null;
  /** Expected (chance) agreement P_e; null when there is nothing to compare. */
  expected: number | null;
  /** Items compared (tokens or utterances). */
  n: number;
}

export const REASON_EMPTY = 'nothing to compare: no item carries a value in both annotations';
export const REASON_EXPECTED_ONE =
  'expected agreement is 1: every value falls in one and the same category, so chance-corrected agreement is undefined';

/**
 * Cohen's kappa (Cohen 1960): κ = (P_o − P_e) / (1 − P_e) with P_o = agree / n and
 * P_e = Σ_k rowA_k · colB_k / n²; `chance` is that Σ_k rowA_k · colB_k.
 */
export function kappaFromCounts(n: number, agree: number, chance: number): KappaFigure {
  if (n <= 0) return { value: null, reason: REASON_EMPTY, observed: null, expected: null, n: 0 };
  const square = n * n;
  const observed = agree / n;
  const expected = chance / square;
  if (chance >= square) return { value: null, reason: REASON_EXPECTED_ONE, observed, expected: 1, n };
  return { value: (n * agree - chance) / (square - chance), observed, expected, n };
}

/**
 * Fleiss' kappa (Fleiss 1971) for N items each rated by all m raters: P̄ = 2·T / (N·m·(m−1)) where
 * T counts agreeing rater pairs over all items, P_e = Σ_j c_j² / (N·m)² where c_j counts category j.
 */
export function fleissFromCounts(items: number, raters: number, agreeingPairs: number, squares: number): KappaFigure {
  if (items <= 0 || raters < 2) return { value: null, reason: REASON_EMPTY, observed: null, expected: null, n: Math.max(0, items) };
  const total = items * raters;
  const square = total * total;
  const observed = (2 * agreeingPairs) / (items * raters * (raters - 1));
  const expected = squares / square;
  if (squares >= square) return { value: null, reason: REASON_EXPECTED_ONE, observed, expected: 1, n: items };
  // Scaled by (N·m)² so the subtraction happens on the larger, exactly summed numbers.
  const numerator = (2 * agreeingPairs * total) / (raters - 1) - squares;
  return { value: numerator / (square - squares), observed, expected, n: items };
}

export interface AlphaFigure {
  value: number | null;
  reason?: string;
  /** Observed and expected disagreement D_o, D_e; null when no unit is pairable. */
  observedDisagreement: number | null;
  expectedDisagreement: number | null;
  /** Pairable values n.. (values in units holding two or more). */
  n: number;
  /** Pairable units. */
  units: number;
}

export const REASON_NO_PAIRABLE = 'no unit holds two or more values, so no pair can be compared';

/**
 * Krippendorff's alpha for nominal data with missing values, from the coincidence matrix
 * (Krippendorff 2011, "Computing Krippendorff's Alpha-Reliability"): α = 1 − (n − 1) · (n − Σ_c o_cc)
 * / (n² − Σ_c n_c²), with n pairable values, o_cc = Σ_u n_uc(n_uc − 1)/(m_u − 1), n_c category totals.
 */
export function alphaFromCounts(n: number, units: number, coincidentSame: number, squares: number): AlphaFigure {
  if (n <= 1) {
    return { value: null, reason: REASON_NO_PAIRABLE, observedDisagreement: null, expectedDisagreement: null, n: Math.max(0, n), units };
  }
  const observedDisagreement = (n - coincidentSame) / n;
  const expectedDisagreement = (n * n - squares) / (n * (n - 1));
  if (squares >= n * n) {
    return { value: null, reason: REASON_EXPECTED_ONE, observedDisagreement, expectedDisagreement: 0, n, units };
  }
  const value = 1 - ((n - 1) * (n - coincidentSame)) / (n * n - squares);
  return { value, observedDisagreement, expectedDisagreement, n, units };
}
