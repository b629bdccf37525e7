/**
 * Generalised Kullback–Leibler divergence between non-negative vectors of equal
 * length: KL(p‖q) = Σ_i p_i·log(p_i/q_i) − p_i + q_i, with 0·log 0 = 0. It is ≥ 0,
 * 0 only when p = q, and Infinity when some p_i > 0 has q_i = 0. Used for the
 * unbalanced marginal penalties ρ·KL(P1‖a) (our convention, /work/shared/REFERENCES.md).
 */
export function generalizedKL(p: ArrayLike<number>, q: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < p.length; i++) {
    const pi = p[i];
    const qi = q[i];
    if (pi > 0) s += qi > 0 ? pi * Math.log(pi / qi) - pi + qi : Infinity;
    else s += qi;
  }
  return s;
}
