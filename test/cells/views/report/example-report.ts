/*
 * An invented demo study for the report tests and for looking at the report in a
 * browser: two survey passes of soil-moisture probes in an orchard, the second pass
 * shifted by a drift. Numbers come from a small log-domain Sinkhorn written here (the
 * figures only need a plausible plan; the core's own solvers are tested elsewhere).
 */
import { costMatrix } from "../../../../core/cost";
import type { Matrix } from "../../../../core/matrix";
import { pointMeasure, type PointMeasure } from "../../../../core/measure";
import { normalDraw, seededRandom } from "../../../../core/random";
import type { GibbsPlan, SparsePlan } from "../../../../core/result";
import { convergenceFigure } from "../../../../cells/views/figures/convergence";
import { couplingLinesFigure } from "../../../../cells/views/figures/coupling-lines";
import { orderByCoordinate, planMatrixFigure } from "../../../../cells/views/figures/plan-matrix";
import { potentialsFigure } from "../../../../cells/views/figures/potentials";
import { sweepCurveFigure, type SweepRow } from "../../../../cells/views/figures/sweep-curve";
import { renderSvg } from "../../../../cells/views/render-svg";
import { renderMarkdown } from "../../../../cells/views/report/render-markdown";
import type { ReportModel } from "../../../../cells/views/report/report-model";

/** Two seeded 2-D clouds: n source probes, m target probes (second pass drifted by (1.2, 0.4)). */
export function orchardClouds(n: number, m: number, seed = 7): { source: PointMeasure; target: PointMeasure } {
  const random = seededRandom(seed);
  const src = Array.from({ length: n }, () => [normalDraw(random), 0.6 * normalDraw(random)]);
  const tgt = Array.from({ length: m }, () => [1.2 + 0.8 * normalDraw(random), 0.4 + 0.9 * normalDraw(random)]);
  return { source: pointMeasure(src), target: pointMeasure(tgt) };
}

/** Log-domain Sinkhorn for the demo; returns the plan and its error history. */
export function demoSinkhorn(a: Float64Array, b: Float64Array, C: Matrix, epsilon: number, iterations: number): { plan: GibbsPlan; history: Float64Array; at: Int32Array } {
  const n = a.length, m = b.length;
  const f = new Float64Array(n), g = new Float64Array(m);
  const history: number[] = [], at: number[] = [];
  const lse = (vals: number[]) => {
    const mx = Math.max(...vals);
    return mx + Math.log(vals.reduce((s, v) => s + Math.exp(v - mx), 0));
  };
  for (let it = 1; it <= iterations; it++) {
    for (let i = 0; i < n; i++) f[i] = -epsilon * lse(Array.from({ length: m }, (_, j) => Math.log(b[j]) + (g[j] - C.data[i * m + j]) / epsilon));
    for (let j = 0; j < m; j++) g[j] = -epsilon * lse(Array.from({ length: n }, (_, i) => Math.log(a[i]) + (f[i] - C.data[i * m + j]) / epsilon));
    // row marginal error (columns are exact after the g update)
    let err = 0;
    for (let i = 0; i < n; i++) {
      let row = 0;
      for (let j = 0; j < m; j++) row += a[i] * b[j] * Math.exp((f[i] + g[j] - C.data[i * m + j]) / epsilon);
      err += Math.abs(row - a[i]);
    }
    history.push(err);
    at.push(it);
  }
  return { plan: { kind: "gibbs", rows: n, cols: m, epsilon, f, g, sourceMass: a, targetMass: b }, history: Float64Array.from(history), at: Int32Array.from(at) };
}

/** The example report model: every figure kind, a table, a failed and a held cell, and hostile text. */
export function exampleReport(): ReportModel {
  const { source, target } = orchardClouds(60, 50);
  const C = costMatrix(source, target, { kind: "sqeuclidean" });
  const fine = demoSinkhorn(source.mass, target.mass, C, 0.05, 60);
  const coarse = demoSinkhorn(source.mass, target.mass, C, 0.5, 25);

  // 1-D exact monotone plan between two sorted samples of 12 points (north–south transect).
  const xs = Array.from({ length: 12 }, (_, i) => Math.sin(i * 1.7) * 2);
  const ys = Array.from({ length: 12 }, (_, i) => 1 + Math.cos(i * 2.3) * 1.5);
  const line1 = pointMeasure(xs), line2 = pointMeasure(ys);
  const o1 = orderByCoordinate(line1), o2 = orderByCoordinate(line2);
  const exact1d: SparsePlan = { kind: "sparse", rows: 12, cols: 12, from: Int32Array.from(o1), to: Int32Array.from(o2), mass: new Float64Array(12).fill(1 / 12) };

  const random = seededRandom(3);
  const sweepRows: SweepRow[] = [];
  for (const n of [25, 50, 100, 200, 400, 800]) {
    for (let r = 0; r < 5; r++) {
      sweepRows.push({ x: n, y: 0.9 / Math.sqrt(n) + 0.02 + 0.01 * normalDraw(random) / Math.sqrt(n / 25), replicate: r, series: "debiased" });
      sweepRows.push({ x: n, y: 1.6 / Math.pow(n, 0.5) + 0.11 + 0.015 * normalDraw(random) / Math.sqrt(n / 25), replicate: r, series: "entropic" });
    }
  }
  const values: Record<string, string> = { "shift.value": "0.412", epsilon: "0.05", n: "60" };
  const prose = renderMarkdown(
    "The second pass of probes reads **drier and further east**. With ε = @{ epsilon } the debiased divergence is @{ shift.value } over @{ n } probes.\n\n" +
      "- exact plans are sparse\n- entropic plans spread mass\n\n<img src=x onerror=alert(1)> <script>alert('x')</script>[click](javascript:alert(1))",
    (name) => values[name] ?? `⟨${name}?⟩`,
  );

  return {
    title: "Orchard probes: <second pass> drift & \"shift\"",
    about: "Two survey passes of 60 and 50 soil-moisture probes. How far did the readings move, and how much of that depends on epsilon?\n\nAll data here is invented for the demo.",
    generatedAt: "2025-01-01T00:00:00Z",
    coreVersion: "0.1.0",
    seed: 7,
    parameters: [
      { name: "epsilon", value: 0.05, control: "log range 0.001 – 1" },
      { name: "probes", value: 60, control: "integer 10 – 2000" },
      { name: "debias", value: true, control: "toggle" },
      { name: "label<script>", value: "<b>bold</b>", control: "text" },
    ],
    cells: [
      { id: "intro", kind: "prose", status: "done", html: prose, cautions: [] },
      {
        id: "shift",
        kind: "transport",
        name: "Entropic coupling of the two passes",
        status: "done",
        headline: "OT_ε = 1.87 (ε = 0.05 absolute; 0.031 × median cost)",
        svg: renderSvg(couplingLinesFigure({ source, target, plan: fine.plan, cost: C, maxLines: 200, title: "Who moved where" }), { idPrefix: "shift" }),
        cautions: ["Regularised value: not a distance (use the debiased divergence to compare)."],
        seconds: 0.412,
      },
      {
        id: "matrix",
        kind: "figure",
        name: "Plan matrix, probes ordered west to east",
        status: "done",
        svg: renderSvg(planMatrixFigure({ plan: fine.plan, cost: C, sourceOrder: orderByCoordinate(source), targetOrder: orderByCoordinate(target) }), { idPrefix: "matrix" }),
        cautions: [],
      },
      {
        id: "transect",
        kind: "figure",
        name: "Transect, exact 1-D coupling",
        status: "done",
        svg: renderSvg(couplingLinesFigure({ source: line1, target: line2, plan: exact1d })),
        cautions: [],
      },
      {
        id: "conv",
        kind: "figure",
        name: "Convergence",
        status: "done",
        svg: renderSvg(
          convergenceFigure({
            histories: [
              { label: "ε = 0.05", iterations: fine.at, errors: fine.history, tolerance: 1e-6 },
              { label: "ε = 0.5", iterations: coarse.at, errors: coarse.history, tolerance: 1e-6 },
            ],
          }),
        ),
        cautions: [],
      },
      {
        id: "potential",
        kind: "figure",
        name: "Source potential",
        status: "done",
        svg: renderSvg(potentialsFigure({ measure: source, potential: fine.plan.f, label: "f (source potential)" })),
        cautions: [],
      },
      {
        id: "sweep",
        kind: "sweep",
        name: "Sample size sweep",
        status: "done",
        headline: "Debiased values settle near 0.02; entropic ones keep a bias of about 0.11.",
        svg: renderSvg(sweepCurveFigure({ rows: sweepRows, xLabel: "probes per pass", yLabel: "value", logX: true })),
        table: {
          columns: ["probes", "debiased", "entropic", "share converged"],
          rows: [
            [25, 0.2011, 0.4312, 1],
            [100, 0.1102, 0.2714, 0.96],
            [800, 0.05193, 0.1665, null],
          ],
          formats: ["integer", { significant: 3 }, "scientific", "percent"],
          caption: "Means over 5 seeds.",
        },
        cautions: [],
        seconds: 12.5,
      },
      { id: "tail", kind: "transport", name: "Unbalanced <img src=x onerror=alert(1)>", status: "failed", error: "massPenalty: must be > 0, got -1 <script>alert(1)</script>", cautions: [] },
      { id: "after", kind: "table", name: "Summary of the unbalanced fit", status: "held", error: "its input 'tail' failed", cautions: [] },
    ],
    receipts: [
      { cellId: "shift", fingerprint: "sha256:3f1a9c0b7d2e4f6a8b9c0d1e2f3a4b5c6d7e8f9a0b1c2d3e4f5a6b7c8d9e0f1a", summary: "value 1.87, 60 iterations, not converged", seconds: 0.412 },
      { cellId: "sweep", fingerprint: "sha256:9e8d7c6b5a4f3e2d1c0b9a8f7e6d5c4b3a2f1e0d9c8b7a6f5e4d3c2b1a0f9e8d", summary: "60 solves", seconds: 12.5 },
    ],
  };
}
