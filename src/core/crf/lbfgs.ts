/**
 * Limited-memory BFGS (Nocedal 1980; Liu & Nocedal 1989): the two-loop recursion over the last m
 * steps, with a backtracking line search that halves the step until the Armijo condition
 * f(x + αd) ≤ f(x) + c₁·α·∇f·d holds (Nocedal & Wright 2006, Algorithm 3.1, c₁ = 10⁻⁴). Armijo alone
 * does not guarantee the curvature condition sᵀy > 0 in general, but the L2-regularised CRF
 * objective is strictly convex (sᵀy ≥ 2·c2·‖s‖² > 0), so every step gives a valid update; pairs
 * with sᵀy ≤ 0 (possible only through rounding) are skipped. Stopping tests are liblbfgs's, which
 * CRFsuite uses: ‖g‖ / max(1, ‖x‖) < ε, or relative decrease over `period` iterations < δ.
 */

export interface LbfgsOptions {
  memory?: number;
  maxIterations?: number;
  epsilon?: number;
  period?: number;
  delta?: number;
  maxLinesearch?: number;
  /** After each iteration; a returned promise is awaited (a worker yields there to read messages). */
  onIteration?: (info: LbfgsIteration) => void | Promise<void>;
  /** Checked after each iteration's callback. */
  isCancelled?: () => boolean;
}

export interface LbfgsIteration {
  iteration: number;
  loss: number;
  gradientNorm: number;
  step: number;
  evaluations: number;
}

export type LbfgsStop = 'converged' | 'no-progress' | 'max-iterations' | 'linesearch-failed' | 'cancelled';

export interface LbfgsResult {
  x: Float64Array;
  loss: number;
  iterations: number;
  evaluations: number;
  stopped: LbfgsStop;
}

const ARMIJO_C1 = 1e-4;

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += (a[i] as number) * (b[i] as number);
  return s;
}

/** Minimise `evaluate` (returns f, writes ∇f; may answer later, from other threads) from `start`; deterministic: no random choices. */
export async function lbfgsMinimise(
  evaluate: (x: Float64Array, gradient: Float64Array) => number | Promise<number>,
  start: Float64Array,
  options: LbfgsOptions = {},
): Promise<LbfgsResult> {
  const m = options.memory ?? 6;
  const maxIterations = options.maxIterations ?? 100;
  const epsilon = options.epsilon ?? 1e-5;
  const period = options.period ?? 10;
  const delta = options.delta ?? 1e-5;
  const maxLinesearch = options.maxLinesearch ?? 20;
  const n = start.length;
  const x = Float64Array.from(start);
  const g = new Float64Array(n);
  const xPrev = new Float64Array(n);
  const gPrev = new Float64Array(n);
  const d = new Float64Array(n);
  const s: Float64Array[] = [];
  const y: Float64Array[] = [];
  const rho: number[] = [];
  const alpha = new Float64Array(m);
  const history: number[] = [];
  let evaluations = 1;
  let f = await evaluate(x, g);
  const result = (stopped: LbfgsStop, iterations: number): LbfgsResult => ({ x, loss: f, iterations, evaluations, stopped });
  if (Math.sqrt(dot(g, g)) / Math.max(1, Math.sqrt(dot(x, x))) < epsilon) return result('converged', 0);
  for (let i = 0; i < n; i++) d[i] = -(g[i] as number);
  let step = 1 / Math.sqrt(dot(d, d));
  for (let k = 1; ; k++) {
    xPrev.set(x);
    gPrev.set(g);
    const fPrev = f;
    let slope = dot(g, d);
    if (!(slope < 0)) {
      // Not a descent direction (rounding): restart from steepest descent.
      for (let i = 0; i < n; i++) d[i] = -(g[i] as number);
      slope = -dot(g, g);
      s.length = y.length = rho.length = 0;
      step = 1 / Math.sqrt(-slope);
    }
    let accepted = false;
    for (let trial = 0; trial < maxLinesearch; trial++) {
      for (let i = 0; i < n; i++) x[i] = (xPrev[i] as number) + step * (d[i] as number);
      f = await evaluate(x, g);
      evaluations++;
      if (f <= fPrev + ARMIJO_C1 * step * slope) {
        accepted = true;
        break;
      }
      step *= 0.5;
    }
    if (!accepted) {
      x.set(xPrev);
      g.set(gPrev);
      f = fPrev;
      return result('linesearch-failed', k - 1);
    }
    const gradientNorm = Math.sqrt(dot(g, g));
    await options.onIteration?.({ iteration: k, loss: f, gradientNorm, step, evaluations });
    if (options.isCancelled?.() === true) return result('cancelled', k);
    if (gradientNorm / Math.max(1, Math.sqrt(dot(x, x))) < epsilon) return result('converged', k);
    history.push(f);
    if (history.length > period) {
      const before = history[history.length - 1 - period] as number;
      if ((before - f) / f < delta) return result('no-progress', k);
    }
    if (k >= maxIterations) return result('max-iterations', k);
    // New curvature pair; drop the oldest beyond m.
    const sk = s.length === m ? (s.shift() as Float64Array) : new Float64Array(n);
    const yk = y.length === m ? (y.shift() as Float64Array) : new Float64Array(n);
    if (rho.length === m) rho.shift();
    for (let i = 0; i < n; i++) {
      sk[i] = (x[i] as number) - (xPrev[i] as number);
      yk[i] = (g[i] as number) - (gPrev[i] as number);
    }
    const ys = dot(yk, sk);
    if (ys > 0) {
      s.push(sk);
      y.push(yk);
      rho.push(1 / ys);
    }
    // Two-loop recursion: d = -H g, with H₀ = (sᵀy / yᵀy) I from the newest pair.
    for (let i = 0; i < n; i++) d[i] = -(g[i] as number);
    for (let j = s.length - 1; j >= 0; j--) {
      const a = (rho[j] as number) * dot(s[j] as Float64Array, d);
      alpha[j] = a;
      const yj = y[j] as Float64Array;
      for (let i = 0; i < n; i++) d[i] = (d[i] as number) - a * (yj[i] as number);
    }
    if (s.length > 0) {
      const newest = s.length - 1;
      const yn = y[newest] as Float64Array;
      const gamma = 1 / ((rho[newest] as number) * dot(yn, yn));
      for (let i = 0; i < n; i++) d[i] = (d[i] as number) * gamma;
    }
    for (let j = 0; j < s.length; j++) {
      const b = (rho[j] as number) * dot(y[j] as Float64Array, d);
      const sj = s[j] as Float64Array;
      const a = alpha[j] as number;
      for (let i = 0; i < n; i++) d[i] = (d[i] as number) + (a - b) * (sj[i] as number);
    }
    step = 1;
  }
}
