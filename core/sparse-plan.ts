import type { Matrix } from "./matrix";
import type { SparsePlan } from "./result";

/**
 * A sparse plan from parallel entry arrays (copied into typed arrays).
 * Entry k moves `mass[k]` from source `from[k]` to target `to[k]`;
 * `rows` × `cols` is the shape of the full plan.
 */
export function sparsePlan(rows: number, cols: number, from: ArrayLike<number>, to: ArrayLike<number>, mass: ArrayLike<number>): SparsePlan {
  return { kind: "sparse", rows, cols, from: Int32Array.from(from), to: Int32Array.from(to), mass: Float64Array.from(mass) };
}

/** Row sums (length rows) and column sums (length cols) of a sparse plan. */
export function sparsePlanMarginals(plan: SparsePlan): { source: Float64Array; target: Float64Array } {
  const source = new Float64Array(plan.rows);
  const target = new Float64Array(plan.cols);
  for (let k = 0; k < plan.mass.length; k++) {
    source[plan.from[k]] += plan.mass[k];
    target[plan.to[k]] += plan.mass[k];
  }
  return { source, target };
}

/**
 * Balanced marginal error of a plan, as defined for {@link Diagnostics}:
 * max(‖P1 − a‖₁ / ‖a‖₁, ‖Pᵀ1 − b‖₁ / ‖b‖₁). Masses are non-negative, so ‖a‖₁ = Σa.
 */
export function sparsePlanMarginalError(plan: SparsePlan, a: Float64Array, b: Float64Array): number {
  const { source, target } = sparsePlanMarginals(plan);
  return Math.max(relativeL1(source, a), relativeL1(target, b));
}

function relativeL1(x: Float64Array, ref: Float64Array): number {
  let diff = 0;
  let total = 0;
  for (let i = 0; i < ref.length; i++) {
    diff += Math.abs(x[i] - ref[i]);
    total += Math.abs(ref[i]);
  }
  return total > 0 ? diff / total : diff;
}

/** Transport cost ⟨C, P⟩ = Σ_k mass[k]·C[from[k], to[k]], summed with Neumaier compensation. */
export function sparsePlanCost(plan: SparsePlan, C: Matrix): number {
  let sum = 0;
  let comp = 0;
  for (let k = 0; k < plan.mass.length; k++) {
    const term = plan.mass[k] * C.data[plan.from[k] * C.cols + plan.to[k]];
    const t = sum + term;
    comp += Math.abs(sum) >= Math.abs(term) ? sum - t + term : term - t + sum;
    sum = t;
  }
  return sum + comp;
}

/** Total transported mass Σ_k mass[k]. */
export function sparsePlanMass(plan: SparsePlan): number {
  let s = 0;
  for (let k = 0; k < plan.mass.length; k++) s += plan.mass[k];
  return s;
}
