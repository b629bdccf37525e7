import type { CostScale, EpsilonSpec, ResolvedEpsilon } from "./cost";

/** The four formulations a transport computation can use. */
export type TransportMethod = "exact" | "entropic" | "unbalanced" | "debiased";

/** How a solve ended. Non-convergence is an outcome, never an exception. */
export type SolveStatus = "converged" | "not-converged" | "cancelled";

/**
 * A sparse plan: mass `mass[k]` moves from source point `from[k]` to target
 * point `to[k]`. Exact solvers return at most n+m−1 entries.
 */
export interface SparsePlan {
  readonly kind: "sparse";
  readonly rows: number;
  readonly cols: number;
  readonly from: Int32Array;
  readonly to: Int32Array;
  readonly mass: Float64Array;
}

/**
 * An entropic plan kept as its potentials, so that n×m is never stored:
 * P_ij = a_i b_j exp((f_i + g_j − C_ij) / ε). Evaluate with the functions in plan.ts.
 */
export interface GibbsPlan {
  readonly kind: "gibbs";
  readonly rows: number;
  readonly cols: number;
  readonly epsilon: number;
  readonly f: Float64Array;
  readonly g: Float64Array;
  readonly sourceMass: Float64Array;
  readonly targetMass: Float64Array;
}

export type TransportPlan = SparsePlan | GibbsPlan;

/** A named, explained caution attached to a result. */
export interface SolveWarning {
  /** Stable machine-readable code, e.g. "not-converged", "epsilon-tiny". */
  readonly code: string;
  /** One sentence a practitioner can act on. */
  readonly message: string;
}

/**
 * How a solve went. `marginalError` is the relative L1 distance of the plan's
 * marginals from the marginals the optimality conditions require (a and b when
 * balanced; a·e^(−f/ρ) and b·e^(−g/ρ) when unbalanced), the larger of the two sides:
 * max(‖P1 − a*‖₁ / ‖a‖₁, ‖Pᵀ1 − b*‖₁ / ‖b‖₁).
 */
export interface Diagnostics {
  readonly status: SolveStatus;
  readonly iterations: number;
  readonly marginalError: number;
  /** marginalError after each iteration (or after each check when checks are spaced). */
  readonly history: Float64Array;
  /** Iteration number of each entry of `history`. */
  readonly historyIterations: Int32Array;
  readonly seconds: number;
  readonly warnings: readonly SolveWarning[];
}

/** The numbers a solve produces. */
export interface TransportValues {
  /** Transport cost ⟨C, P⟩. */
  readonly cost: number;
  /**
   * The method's own objective: exact ⟨C,P⟩; entropic ⟨C,P⟩ + ε·KL(P‖a⊗b);
   * unbalanced that plus ρ_a·KL(P1‖a) + ρ_b·KL(Pᵀ1‖b); debiased the cross term OT_ε(a,b).
   */
  readonly objective: number;
  /** Dual objective (⟨f,a⟩ + ⟨g,b⟩ when balanced). */
  readonly dual?: number;
  /** Debiased only: S_ε(a,b) = OT_ε(a,b) − ½OT_ε(a,a) − ½OT_ε(b,b) (+ mass correction if unbalanced). */
  readonly divergence?: number;
  /** Transported mass Σ P_ij. */
  readonly mass: number;
  /** Entropic term ε·KL(P‖a⊗b). */
  readonly entropic?: number;
  /** Unbalanced marginal penalty terms ρ_a·KL(P1‖a) and ρ_b·KL(Pᵀ1‖b). */
  readonly penalties?: { readonly source: number; readonly target: number };
  /** Debiased only: the self terms OT_ε(a,a) and OT_ε(b,b). */
  readonly selfTerms?: { readonly source: number; readonly target: number };
}

/** The one result shape every method returns. Plain data: it crosses worker boundaries. */
export interface TransportResult {
  readonly method: TransportMethod;
  /** The algorithm that actually ran, e.g. "network-simplex", "sinkhorn-log". */
  readonly algorithm: string;
  readonly values: TransportValues;
  readonly costScale: CostScale;
  readonly epsilon?: ResolvedEpsilon;
  /** Mass penalties actually used (Infinity = that side balanced). */
  readonly massPenalty?: { readonly source: number; readonly target: number };
  /** Dual potentials f (source, length n) and g (target, length m). */
  readonly potentials?: { readonly f: Float64Array; readonly g: Float64Array };
  readonly plan: TransportPlan | null;
  readonly diagnostics: Diagnostics;
}

/** What a progress callback receives, at most every `progressEvery` iterations. */
export interface SolveProgress {
  readonly iteration: number;
  readonly marginalError: number;
  /** Current epsilon (changes during an epsilon schedule). */
  readonly epsilon?: number;
}

/** Caller-side control of a running solve. */
export interface SolveControl {
  /** Aborting ends the solve with status "cancelled" (not an exception). */
  readonly signal?: AbortSignal;
  readonly onProgress?: (progress: SolveProgress) => void;
  /** Iterations between progress reports. Default 10. */
  readonly progressEvery?: number;
}

/** Everything a solve can be told. Only `method` is required (epsilon too for non-exact methods). */
export interface SolveOptions extends SolveControl {
  readonly method: TransportMethod;
  readonly epsilon?: EpsilonSpec;
  /** Unbalanced: ρ for both sides, or per side; Infinity makes that side balanced. Debiased: makes it unbalanced. */
  readonly massPenalty?: number | { readonly source: number; readonly target: number };
  /** Stop when marginalError ≤ tolerance. Default 1e-6. */
  readonly tolerance?: number;
  /** Iteration cap. Default 10 000. */
  readonly maxIterations?: number;
  /** Epsilon scaling: start large and shrink geometrically to the target. Default off. */
  readonly schedule?: boolean | { readonly factor?: number; readonly start?: EpsilonSpec };
  /** Warm start from potentials (e.g. a previous result's). */
  readonly warmStart?: { readonly f: Float64Array; readonly g: Float64Array };
  /** Exact only: which algorithm; "auto" picks sorting in 1-D, assignment for uniform equal sizes, else network simplex. */
  readonly exactAlgorithm?: "auto" | "sorting" | "network-simplex" | "assignment";
  /** Entropic only: "auto" uses the kernel fast path when safe, else the log domain. */
  readonly domain?: "auto" | "log" | "kernel";
}
