// The two ways of running Sinkhorn sweeps at one epsilon, behind one small
// interface so that the driver (sinkhorn.ts) can switch between them mid-solve.
// Both keep the invariant that the target side is up to date (g is the target
// update of f), so every state they hold has exact target marginals and a plan
// bounded by them, and a sweep measures the source-side error for free.
import { fastExp } from "./fastexp";
import type { KernelBackend, KernelSweeper } from "./kernel-sweep";
import { type GibbsProblem, fusedSweep, logWork, targetUpdate } from "./logsumexp";

/** A Sinkhorn iteration at one epsilon. */
export interface SweepEngine {
  readonly domain: "log" | "kernel";
  /** Kernel only: which implementation of the kernel pass runs. */
  readonly backend?: KernelBackend;
  /**
   * Sets the state from source potentials `f` (absolute units) and brings the target
   * side up to date. Returns false (state unusable) if a kernel engine cannot
   * represent the scalings e^(f/ε) in floating point.
   */
  start(f: Float64Array): boolean;
  /**
   * Measures the marginal error of the current state and computes the next one
   * (one full sweep). Returns NaN when a kernel engine's scalings leave the safe
   * range; the current state is then unchanged.
   */
  sweep(): number;
  /** Makes the state computed by the last sweep current. */
  advance(): void;
  /** Writes the current potentials in absolute units. */
  read(f: Float64Array, g: Float64Array): void;
}

/** Log-domain engine on potentials in units of epsilon (see logsumexp.ts). */
export function logEngine(p: GibbsProblem): SweepEngine {
  const eps = 1 / p.invEpsilon;
  let F = new Float64Array(p.n);
  let G = new Float64Array(p.m);
  let Fn = new Float64Array(p.n);
  let Gn = new Float64Array(p.m);
  const work = logWork(p.m);
  return {
    domain: "log",
    start(f) {
      for (let i = 0; i < p.n; i++) F[i] = f[i] * p.invEpsilon;
      targetUpdate(p, F, G, work);
      return true;
    },
    sweep: () => fusedSweep(p, F, G, Fn, Gn, work),
    advance() {
      [F, Fn] = [Fn, F];
      [G, Gn] = [Gn, G];
    },
    read(f, g) {
      for (let i = 0; i < p.n; i++) f[i] = F[i] * eps;
      for (let j = 0; j < p.m; j++) g[j] = G[j] * eps;
    },
  };
}

/** Row kernel (own function: optimised per row, see logsumexp.ts): K_ij = exp((cmin − C_ij)/ε). */
function kernelRow(K: Float64Array, ok: number, C: Float64Array, o: number, m: number, cmin: number, ie: number): void {
  for (let j = 0; j < m; j++) K[ok + j] = fastExp((cmin - C[o + j]) * ie);
}

// Scalings must stay well inside the double range so that products such as
// u_i·K_ij·v_j·a_i·b_j neither overflow nor lose all digits to underflow.
const SCALING_LOW = 1e-280;
const SCALING_HIGH = 1e280;

/**
 * Kernel engine: K_ij = exp(−(C_ij − cmin)/ε), scalings u = e^(f/ε) and
 * v = e^((g − cmin)/ε), so that a_i b_j u_i K_ij v_j = a_i b_j e^((f_i+g_j−C_ij)/ε).
 * Shifting C by its minimum keeps K's largest entry at 1. Updates (Chizat et al. 2018
 * in scaling form): u ← (K(b∘v))^(−τ_a), v ← (Kᵀ(a∘u))^(−τ_b)·e^(−cmin/(ρ_b+ε)).
 * `sweeper` (from kernelSweeper(n, m)) holds the kernel; the engine overwrites it,
 * so one sweeper serves the stages of a schedule in turn.
 */
export function kernelEngine(p: GibbsProblem, cmin: number, sweeper: KernelSweeper): SweepEngine {
  const { n, m, a, b, tauA, tauB, epsOverRhoA, invEpsilon: ie } = p;
  const eps = 1 / ie;
  let u = new Float64Array(n);
  let v = new Float64Array(m);
  let un = new Float64Array(n);
  let vn = new Float64Array(m);
  // exp((τ_b − 1)·cmin/ε) = e^(−cmin/(ρ_b+ε)); 1 when balanced.
  const targetShift = tauB === 1 ? 1 : Math.exp(((tauB - 1) * cmin) / eps);
  let mode: "target" | "sweep" = "target";
  let error = 0;
  let failed = false;
  const scale = (i: number, t: number): number => {
    const ai = a[i];
    if (mode === "target") return ai * u[i];
    const ui = u[i];
    // Row marginal of the current plan over a_i is u_i·t_i; the optimality target is e^(−f_i/ρ_a) = u_i^(−ε/ρ_a).
    const target = epsOverRhoA === 0 ? 1 : Math.pow(ui, -epsOverRhoA);
    error += ai * Math.abs(ui * t - target);
    const next = tauA === 1 ? 1 / t : Math.pow(t, -tauA);
    if (!(next > SCALING_LOW && next < SCALING_HIGH)) failed = true;
    un[i] = next;
    return ai * next;
  };
  const { K, z, acc, stride } = sweeper;
  for (let i = 0; i < n; i++) kernelRow(K, i * stride, p.C, i * m, m, cmin, ie);
  // v from acc = Kᵀ(a∘u); false if out of range.
  const targetFromAcc = (out: Float64Array): boolean => {
    let ok = true;
    for (let j = 0; j < m; j++) {
      const s = acc[j];
      const x = tauB === 1 ? 1 / s : Math.pow(s, -tauB) * targetShift;
      if (!(x > SCALING_LOW && x < SCALING_HIGH)) ok = false;
      out[j] = x;
    }
    return ok;
  };
  return {
    domain: "kernel",
    backend: sweeper.backend,
    start(f) {
      for (let i = 0; i < n; i++) {
        const x = Math.exp(f[i] * ie);
        if (!(x > SCALING_LOW && x < SCALING_HIGH)) return false;
        u[i] = x;
      }
      mode = "target";
      z.fill(0);
      sweeper.sweep(scale);
      return targetFromAcc(v);
    },
    sweep() {
      for (let j = 0; j < m; j++) z[j] = b[j] * v[j];
      mode = "sweep";
      error = 0;
      failed = false;
      sweeper.sweep(scale);
      if (!targetFromAcc(vn) || failed) return NaN;
      return error / p.massA;
    },
    advance() {
      [u, un] = [un, u];
      [v, vn] = [vn, v];
    },
    read(f, g) {
      for (let i = 0; i < n; i++) f[i] = eps * Math.log(u[i]);
      for (let j = 0; j < m; j++) g[j] = eps * Math.log(v[j]) + cmin;
    },
  };
}
