// Pieces of unbalanced transport shared by the solvers: the KL mass penalties
// ρ_a·KL(P1‖a) + ρ_b·KL(Pᵀ1‖b) added to the entropic objective (Chizat, Peyré,
// Schmitzer & Vialard 2018, Math. Comp. 87; Séjourné et al. 2019). ρ = Infinity
// makes that side a hard constraint (balanced).
import { TransportInputError, describeValue } from "./errors";

/** Mass penalties per side, in cost units (> 0; Infinity = that side balanced). */
export interface MassPenalty {
  readonly source: number;
  readonly target: number;
}

/** Both sides balanced: ρ_a = ρ_b = Infinity. */
export const BALANCED: MassPenalty = { source: Infinity, target: Infinity };

/**
 * Validates a mass penalty given as one number (both sides) or per side.
 * Each value must be > 0 and not NaN; Infinity is allowed. Throws
 * {@link TransportInputError} naming `field` (e.g. "massPenalty.source").
 */
export function resolveMassPenalty(spec: number | { readonly source: number; readonly target: number } | undefined, field = "massPenalty"): MassPenalty {
  if (typeof spec === "number") {
    checkRho(spec, field);
    return { source: spec, target: spec };
  }
  if (spec === null || typeof spec !== "object") {
    throw new TransportInputError(field, `must be a number > 0 (Infinity = balanced) or {source, target}, got ${describeValue(spec)}`, spec);
  }
  checkRho(spec.source, `${field}.source`);
  checkRho(spec.target, `${field}.target`);
  return { source: spec.source, target: spec.target };
}

function checkRho(rho: unknown, field: string): void {
  if (typeof rho !== "number" || !(rho > 0)) {
    throw new TransportInputError(field, `must be > 0 (Infinity = balanced side), got ${describeValue(rho)}`, rho);
  }
}

/**
 * Damping factor τ = ρ/(ρ + ε) of the unbalanced Sinkhorn update
 * f ← −τ·ε·log Σ_j b_j exp((g_j − C_ij)/ε); 1 when ρ = Infinity.
 */
export function dampingFactor(rho: number, epsilon: number): number {
  return rho === Infinity ? 1 : rho / (rho + epsilon);
}
