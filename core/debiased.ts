// The Sinkhorn divergence (debiased entropic transport)
//   S_ε(a, b) = OT_ε(a, b) − ½·OT_ε(a, a) − ½·OT_ε(b, b) + (ε/2)·(m(a) − m(b))²
// (Ramdas, García Trillos & Cuturi 2017; Genevay, Peyré & Cuturi 2018; Feydy et al.
// 2019, AISTATS; unbalanced: Séjourné, Feydy, Vialard, Trouvé & Peyré 2019).
//
// The mass correction in our convention (OT_ε with ε·KL(P‖a⊗b), generalised KL
// Σ p log(p/q) − p + q, penalties ρ·KL(P1‖a), REFERENCES.md). The dual is
//   OT_ε(a, b) = max_{f,g} ⟨a, φ_a(f)⟩ + ⟨b, φ_b(g)⟩ − ε⟨a⊗b, e^((f⊕g−C)/ε) − 1⟩,
// φ(f) = f (balanced) or −ρ(e^(−f/ρ) − 1). Let f_a, f_b be the symmetric optimal
// potentials of the self terms OT_ε(a, a) (penalty ρ_a on both marginals) and
// OT_ε(b, b) (ρ_b on both). Plugging (f_a, f_b) into the cross dual gives a lower bound
// on OT_ε(a, b); the self terms are attained at (f_a, f_a) and (f_b, f_b). Subtracting,
// the φ terms cancel exactly, and what remains is
//   (ε/2)·‖α − β‖²_k  +  ε·[m(a)m(b) − ½m(a)² − ½m(b)²],
// with α = a·e^(f_a/ε), β = b·e^(f_b/ε), k = e^(−C/ε), and the constants coming from
// the "−1" (i.e. the +Σq of the generalised KL over the reference a⊗b, whose mass is
// m(a)m(b), m(a)², m(b)²). The bracket is −½(m(a) − m(b))², so
//   OT_ε(a,b) − ½OT_ε(a,a) − ½OT_ε(b,b) ≥ (ε/2)‖α − β‖²_k − (ε/2)(m(a) − m(b))²,
// and adding (ε/2)(m(a) − m(b))² makes S_ε ≥ 0 whenever k is a positive definite
// kernel (e.g. C = |x−y|^p, 0 < p ≤ 2). This is the correction of Séjourné et al.
// (their KL also carries the +Σq term); it vanishes for equal masses, so the balanced
// divergence needs none. A convention without the +Σq term would need none either
// but would lose the cancellation above. Note: with ρ_a ≠ ρ_b, S_ε(a, a) > 0 in
// general, since the cross term then penalises the two marginals differently.
import { type CostScale, type CostSpec, checkCost, costMatrix, costScale as computeCostScale } from "./cost";
import { TransportInputError } from "./errors";
import type { Measure } from "./measure";
import type { Diagnostics, SolveProgress, SolveOptions, SolveStatus, SolveWarning, TransportResult } from "./result";
import { checkEqualMass, resolveEpsilonOption, sinkhorn, sinkhornOptions } from "./sinkhorn";
import { sinkhornSymmetric } from "./sinkhorn-symmetric";
import { BALANCED, resolveMassPenalty } from "./unbalanced";

/**
 * Debiased entropic transport between two measures with a point-based cost
 * (sqeuclidean, euclidean or power; a user matrix cannot give the self costs).
 * Balanced unless `options.massPenalty` is given (then unbalanced, with the mass
 * correction derived above). Returns values.divergence = S_ε, values.objective =
 * OT_ε(a, b), values.selfTerms, the cross-term plan, and diagnostics combining the
 * three solves: worst status, summed iterations, largest marginal error, histories
 * concatenated (iteration numbers keep counting across the cross term, then the
 * source and target self terms). `maxIterations` caps each of the three solves; the
 * self terms run symmetric log-domain sweeps whatever `domain` says (it applies to
 * the cross term). `seconds` covers the whole call, cost matrices included.
 * Always warns "regularised-value". Throws
 * {@link TransportInputError} for a user-matrix cost, unequal masses when balanced,
 * and invalid options.
 */
export function solveDebiased(source: Measure, target: Measure, cost: CostSpec, options: SolveOptions, costScale?: CostScale): TransportResult {
  const started = performance.now();
  checkCost(cost);
  if (cost.kind === "matrix") {
    throw new TransportInputError("cost.kind", 'the debiased method compares each measure with itself, which needs a cost between points (sqeuclidean, euclidean or power), not a user matrix', cost.kind);
  }
  const a = source.mass;
  const b = target.mass;
  const Cab = costMatrix(source, target, cost);
  const scale = costScale ?? computeCostScale(Cab);
  const eps = resolveEpsilonOption(options, scale);
  const rho = options.massPenalty === undefined ? BALANCED : resolveMassPenalty(options.massPenalty);
  if (rho.source === Infinity && rho.target === Infinity) checkEqualMass(a, b);
  const base = sinkhornOptions(options, eps.absolute, rho, scale);

  const cross = sinkhorn(a, b, Cab, base);
  const selfOptions = (massPenalty: number, iterationOffset: number) => ({
    epsilon: eps.absolute,
    massPenalty,
    tolerance: base.tolerance,
    maxIterations: base.maxIterations,
    schedule: base.schedule,
    signal: base.signal,
    onProgress: base.onProgress as ((p: SolveProgress) => void) | undefined,
    progressEvery: base.progressEvery,
    iterationOffset,
  });
  const selfA = sinkhornSymmetric(a, costMatrix(source, source, cost), selfOptions(rho.source, cross.iterations));
  const selfB = sinkhornSymmetric(b, costMatrix(target, target, cost), selfOptions(rho.target, cross.iterations + selfA.iterations));

  let massA = 0;
  let massB = 0;
  for (let i = 0; i < a.length; i++) massA += a[i];
  for (let j = 0; j < b.length; j++) massB += b[j];
  const correction = 0.5 * eps.absolute * (massA - massB) ** 2;
  const divergence = cross.values.objective - 0.5 * selfA.values.objective - 0.5 * selfB.values.objective + correction;

  const parts = [
    { label: "cross term OT_ε(a, b)", d: cross },
    { label: "source self term OT_ε(a, a)", d: selfA },
    { label: "target self term OT_ε(b, b)", d: selfB },
  ];
  const warnings: SolveWarning[] = [
    {
      code: "regularised-value",
      message: "OT_ε itself is not a distance (OT_ε(a, a) > 0); compare measures with the divergence S_ε, which is ≥ 0 and 0 only for equal measures when e^(−C/ε) is a positive definite kernel (e.g. |x−y| or |x−y|²).",
    },
  ];
  // The cross term's warnings as they are; the self terms' prefixed with their name,
  // except epsilon warnings already given by an earlier solve (same regime, same advice).
  const codes = new Set<string>();
  for (const { label, d } of parts) {
    for (const w of d.warnings) {
      if (w.code.startsWith("epsilon-") && codes.has(w.code)) continue;
      codes.add(w.code);
      warnings.push(d === cross ? w : { code: w.code, message: `${label}: ${w.message}` });
    }
  }
  // Self-term iteration numbers already continue after the cross term's (iterationOffset).
  const total = parts.reduce((sum, { d }) => sum + d.history.length, 0);
  const history = new Float64Array(total);
  const historyIterations = new Int32Array(total);
  let offset = 0;
  for (const { d } of parts) {
    history.set(d.history, offset);
    historyIterations.set(d.historyIterations, offset);
    offset += d.history.length;
  }
  const diagnostics: Diagnostics = {
    status: worstStatus(parts.map(({ d }) => d.status)),
    iterations: cross.iterations + selfA.iterations + selfB.iterations,
    marginalError: Math.max(cross.marginalError, selfA.marginalError, selfB.marginalError),
    history,
    historyIterations,
    seconds: (performance.now() - started) / 1000,
    warnings,
  };
  return {
    method: "debiased",
    algorithm: `sinkhorn-divergence-${cross.algorithm === "sinkhorn-kernel" ? "kernel" : "log"}`,
    values: {
      ...cross.values,
      divergence,
      selfTerms: { source: selfA.values.objective, target: selfB.values.objective },
    },
    costScale: scale,
    epsilon: eps,
    ...(options.massPenalty === undefined ? {} : { massPenalty: rho }),
    potentials: { f: cross.f, g: cross.g },
    plan: {
      kind: "gibbs",
      rows: a.length,
      cols: b.length,
      epsilon: eps.absolute,
      f: Float64Array.from(cross.f),
      g: Float64Array.from(cross.g),
      sourceMass: Float64Array.from(a),
      targetMass: Float64Array.from(b),
    },
    diagnostics,
  };
}

function worstStatus(statuses: SolveStatus[]): SolveStatus {
  if (statuses.includes("cancelled")) return "cancelled";
  if (statuses.includes("not-converged")) return "not-converged";
  return "converged";
}
