// Everything a solve reports about an entropic plan, computed from its potentials
// in one pass over C: P_ij = a_i b_j exp((f_i + g_j − C_ij)/ε) (our convention,
// /work/shared/REFERENCES.md).
import { fastExp } from "./fastexp";
import { generalizedKL } from "./kl";
import { logOf } from "./logsumexp";
import type { Matrix } from "./matrix";

/** Primal and dual numbers of an entropic (possibly unbalanced) plan. */
export interface EntropicEvaluation {
  /** ⟨C, P⟩. */
  readonly cost: number;
  /** Σ P_ij. */
  readonly mass: number;
  /** ε·KL(P ‖ a⊗b), generalised KL. */
  readonly entropic: number;
  /** ρ_a·KL(P1‖a) and ρ_b·KL(Pᵀ1‖b); 0 for a balanced side (ρ = Infinity). */
  readonly penalties: { readonly source: number; readonly target: number };
  /** cost + entropic + both penalties: the primal objective at this plan. */
  readonly objective: number;
  /**
   * Dual objective at (f, g): Σ a_i φ_a(f_i) + Σ b_j φ_b(g_j) − ε(ΣP − Σa·Σb), with
   * φ(f) = f when balanced and −ρ(e^(−f/ρ) − 1) otherwise (Chizat et al. 2018).
   * Equals the objective at convergence.
   */
  readonly dual: number;
  /**
   * max(‖P1 − a*‖₁/‖a‖₁, ‖Pᵀ1 − b*‖₁/‖b‖₁) with a* = a (balanced) or a·e^(−f/ρ_a),
   * b* likewise: the marginal error of core/result.ts.
   */
  readonly marginalError: number;
  readonly sourceMarginal: Float64Array;
  readonly targetMarginal: Float64Array;
}

/**
 * Evaluates the plan of potentials (f, g) at `epsilon` with mass penalties rhoA, rhoB
 * (Infinity = balanced side). One pass over C with one exponential per entry.
 * Rows with a_i = 0 and columns with b_j = 0 carry no mass.
 */
export function entropicValues(a: Float64Array, b: Float64Array, C: Matrix, f: Float64Array, g: Float64Array, epsilon: number, rhoA: number, rhoB: number): EntropicEvaluation {
  const n = a.length;
  const m = b.length;
  const ie = 1 / epsilon;
  const logA = logOf(a);
  const logB = logOf(b);
  const G = new Float64Array(m);
  for (let j = 0; j < m; j++) G[j] = g[j] * ie;
  const r = new Float64Array(n);
  const c = new Float64Array(m);
  const data = C.data;
  let cost = 0;
  let mass = 0;
  let logSum = 0; // Σ P_ij·log(P_ij/(a_i b_j)), computed per entry to avoid cancellation
  const sums = new Float64Array(3);
  for (let i = 0; i < n; i++) {
    if (!(a[i] > 0)) continue;
    planRowSums(data, i * m, m, ie, f[i] * ie, logA[i], G, logB, c, sums);
    r[i] = sums[0];
    mass += sums[0];
    cost += sums[1];
    logSum += sums[2];
  }
  let massA = 0;
  let massB = 0;
  for (let i = 0; i < n; i++) massA += a[i];
  for (let j = 0; j < m; j++) massB += b[j];
  const entropic = epsilon * (logSum - mass + massA * massB);
  const penalties = {
    source: rhoA === Infinity ? 0 : rhoA * generalizedKL(r, a),
    target: rhoB === Infinity ? 0 : rhoB * generalizedKL(c, b),
  };
  const dual = dualTerm(a, f, rhoA) + dualTerm(b, g, rhoB) - epsilon * (mass - massA * massB);
  const marginalError = Math.max(marginalGap(r, a, f, rhoA, massA), marginalGap(c, b, g, rhoB, massB));
  return {
    cost,
    mass,
    entropic,
    penalties,
    objective: cost + entropic + penalties.source + penalties.target,
    dual,
    marginalError,
    sourceMarginal: r,
    targetMarginal: c,
  };
}

/**
 * Row kernel (its own function so V8 optimises it per row rather than by on-stack
 * replacement): for P_ij = exp(y_ij + log a_i + log b_j), y_ij = F_i + G_j − C_ij/ε,
 * adds P_ij to c_j and writes [Σ_j P_ij, Σ_j P_ij·C_ij, Σ_j P_ij·y_ij] to `out`.
 */
function planRowSums(data: Float64Array, o: number, m: number, ie: number, Fi: number, la: number, G: Float64Array, logB: Float64Array, c: Float64Array, out: Float64Array): void {
  let rowMass = 0;
  let rowCost = 0;
  let rowLog = 0;
  for (let j = 0; j < m; j++) {
    const cij = data[o + j];
    const y = Fi + G[j] - cij * ie;
    const P = fastExp(y + la + logB[j]);
    if (P === 0) continue;
    rowMass += P;
    rowCost += P * cij;
    rowLog += P * y;
    c[j] += P;
  }
  out[0] = rowMass;
  out[1] = rowCost;
  out[2] = rowLog;
}

// Σ w_i φ(h_i): φ(h) = h when balanced, −ρ·(e^(−h/ρ) − 1) otherwise (expm1 keeps
// precision when ρ is huge and the term tends to h).
function dualTerm(w: Float64Array, h: Float64Array, rho: number): number {
  let s = 0;
  for (let i = 0; i < w.length; i++) {
    if (!(w[i] > 0)) continue;
    s += w[i] * (rho === Infinity ? h[i] : -rho * Math.expm1(-h[i] / rho));
  }
  return s;
}

function marginalGap(marginal: Float64Array, w: Float64Array, h: Float64Array, rho: number, total: number): number {
  let s = 0;
  for (let i = 0; i < w.length; i++) {
    if (!(w[i] > 0)) {
      s += marginal[i];
      continue;
    }
    const target = rho === Infinity ? w[i] : w[i] * Math.exp(-h[i] / rho);
    s += Math.abs(marginal[i] - target);
  }
  return s / total;
}
