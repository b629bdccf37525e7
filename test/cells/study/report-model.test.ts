import * as Plot from "@observablehq/plot";
import { describe, expect, it } from "vitest";
import { pointMeasure } from "../../../core/measure";
import { solveTransport } from "../../../core/solve";
import { type ReportableOutcome, type ReportableRun, describeMeasure, receiptSummary, reportCell, shortFingerprint, studyReportModel, tableFrom } from "../../../cells/study/report-model";
import { convergenceFigure } from "../../../cells/views/figures/convergence";
import { couplingLinesFigure } from "../../../cells/views/figures/coupling-lines";
import { renderReport } from "../../../cells/views/report";

// scipy.stats.wasserstein_distance docstring example: W1([0, 1, 3], [5, 6, 8]) = 5.0.
const source = pointMeasure([[0], [1], [3]]);
const target = pointMeasure([[5], [6], [8]]);
const exact = solveTransport(source, target, { kind: "euclidean" }, { method: "exact" });
const entropic = solveTransport(source, target, { kind: "sqeuclidean" }, { method: "entropic", epsilon: { relative: 0.1, reference: "median" } });

const receipt = {
  fingerprint: "fnv1a:0badf00d",
  settings: { method: "exact" },
  coreVersion: "9.9.9",
  summary: { cost: 5, mass: 1, status: "converged" },
  seconds: 0.002,
  recordedAt: "2026-12-01T09:30:00.000Z",
};

function outcome(partial: Partial<ReportableOutcome> & Pick<ReportableOutcome, "cellId" | "kind">): ReportableOutcome {
  return { status: "done", seconds: 0.01, cautions: [], ...partial };
}

const run: ReportableRun = {
  study: { title: "Transect <probe> study", about: "Invented.", seed: 42 },
  seconds: 0.5,
  parameters: [
    { name: "eps", value: 0.2, control: "log range 0.001 – 1" },
    { name: "debias", value: true, control: "toggle" },
  ],
  outcomes: [
    outcome({ cellId: "p1", kind: "prose", value: { html: "<p>The value is <span>5</span>.</p>" } }),
    outcome({ cellId: "k1", kind: "parameter", name: "eps", value: 0.2 }),
    outcome({ cellId: "d1", kind: "data", name: "west", value: source }),
    outcome({ cellId: "t1", kind: "transport", name: "plan", value: { result: exact, source, target }, headline: "cost 5 (exact)", receipt }),
    outcome({
      cellId: "f1",
      kind: "figure",
      value: couplingLinesFigure({ source, target, plan: exact.plan!, title: "Transect", cautions: ["figure caution"] }),
      cautions: ["figure caution"],
    }),
    outcome({ cellId: "c1", kind: "code", name: "broken", status: "failed", seconds: 0, error: { message: "total is not defined", cause: "own error" } }),
    outcome({ cellId: "c3", kind: "code", name: "loop", status: "failed", seconds: 0, error: { message: "circular definition", cause: "cycle through loop, broken" } }),
    outcome({ cellId: "c4", kind: "code", name: "after", status: "failed", seconds: 0, error: { message: "broken failed: total is not defined", cause: 'failed input "broken"' } }),
    outcome({ cellId: "c2", kind: "code", name: "later", status: "held", seconds: 0, error: { message: "code cells held (--hold-code)", cause: "held" } }),
  ],
};

describe("studyReportModel", () => {
  const model = studyReportModel(run, { generatedAt: "2026-12-02T10:00:00.000Z", overridden: new Map([["eps", 0.05]]) });

  it("studyReportModel(run) lists the parameters as run and marks a command-line value with the file's value", () => {
    expect(model.parameters).toEqual([
      { name: "eps", value: 0.2, control: "log range 0.001 – 1 · set for this run (file: 0.05)" },
      { name: "debias", value: true, control: "toggle" },
    ]);
  });

  it("studyReportModel(run) keeps study order and shows parameter cells only in the parameter table", () => {
    expect(model.cells.map((c) => c.id)).toEqual(["p1", "d1", "t1", "f1", "c1", "c3", "c4", "c2"]);
    expect(model.seed).toBe(42);
    expect(model.coreVersion).toBe("9.9.9");
  });

  it("studyReportModel(run) puts each recorded receipt in the appendix with its summary in words", () => {
    expect(model.receipts).toEqual([{ cellId: "t1", fingerprint: "fnv1a:0badf00d", summary: "cost 5, mass 1, status converged", seconds: 0.002 }]);
  });

  it("studyReportModel(run) gives a transport cell a table of its numbers (W1 = 5, scipy's docstring example)", () => {
    const cell = model.cells.find((c) => c.id === "t1")!;
    expect(cell.headline).toBe("cost 5 (exact)");
    const rows = Object.fromEntries(cell.table!.rows.map((r) => [r[0], r[1]]));
    expect(rows["transport cost ⟨C, P⟩"]).toBeCloseTo(5, 12);
    expect(rows["mass transported"]).toBeCloseTo(1, 12);
    expect(rows.status).toBe("converged");
  });

  it("studyReportModel(run) draws a figure spec as inline SVG and does not repeat the cautions it draws itself", () => {
    const cell = model.cells.find((c) => c.id === "f1")!;
    expect(cell.svg).toMatch(/^<figure class="cf-figure"/);
    expect(cell.svg).toContain("<svg");
    expect(cell.svg).toContain("figure caution");
    expect(cell.cautions).toEqual([]);
    // Ids inside the figure carry the cell id, so two figures on one page never share one.
    for (const m of cell.svg!.matchAll(/\sid="([^"]+)"/g)) expect(m[1]).toMatch(/^f-f1-\d+$/);
  });

  it("studyReportModel(run) shows a failed cell's message, its cause when it adds something, and a held cell's reason", () => {
    const failed = model.cells.find((c) => c.id === "c1")!;
    expect(failed.status).toBe("failed");
    expect(failed.error).toBe("total is not defined");
    expect(failed.seconds).toBeUndefined();
    expect(model.cells.find((c) => c.id === "c3")!.error).toBe("circular definition\n(cause: cycle through loop, broken)");
    expect(model.cells.find((c) => c.id === "c4")!.error).toBe("broken failed: total is not defined");
    const held = model.cells.find((c) => c.id === "c2")!;
    expect(held.error).toBe("code cells held (--hold-code)");
    expect(held.seconds).toBeUndefined();
  });

  it("renderReport(studyReportModel(run)) is self-contained: inline SVG, no script, no external resource", () => {
    const html = renderReport(model);
    expect(html).toContain("<svg");
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/https?:\/\//);
    expect(html).toContain("Transect &lt;probe&gt; study");
    expect(html).toContain('<tr><th scope="row">eps</th><td class="cf-num">0.2</td>');
    expect(html).toContain("<p>The value is <span>5</span>.</p>");
  });
});

describe("reportCell", () => {
  it("reportCell(transport with a bare TransportResult value) also finds its numbers", () => {
    const cell = reportCell(outcome({ cellId: "t2", kind: "transport", value: entropic }));
    const labels = cell.table!.rows.map((r) => r[0]);
    expect(labels).toContain("objective");
    expect(labels).toContain("epsilon");
    expect(labels).toContain("marginal error");
  });

  it("reportCell(code returning a number or text) shows it as the headline", () => {
    expect(reportCell(outcome({ cellId: "c", kind: "code", value: 0.123456789 })).headline).toBe("0.123457");
    expect(reportCell(outcome({ cellId: "c", kind: "code", value: "north" })).headline).toBe("north");
  });

  it("reportCell(code returning an array of records) shows a table with every field", () => {
    const cell = reportCell(outcome({ cellId: "c", kind: "code", value: [{ a: 1, b: "x" }, { a: 2, c: true }] }));
    expect(cell.table).toEqual({ columns: ["a", "b", "c"], rows: [[1, "x", null], [2, null, true]], formats: [undefined, undefined, undefined] });
  });

  it("reportCell(code returning Plot options) draws them as SVG", () => {
    const cell = reportCell(outcome({ cellId: "c", kind: "code", value: { marks: [Plot.dot([[0, 0], [1, 1]])] } }));
    expect(cell.svg).toContain("<svg");
  });

  it("reportCell(code returning a DOM node) uses its SVG markup", () => {
    const node = { localName: "svg", outerHTML: '<svg width="10" height="10"><circle r="3"></circle></svg>' };
    expect(reportCell(outcome({ cellId: "c", kind: "code", value: node })).svg).toBe('<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><circle r="3"></circle></svg>');
  });

  it("reportCell(code returning another object) shows an escaped, shortened JSON preview", () => {
    const cell = reportCell(outcome({ cellId: "c", kind: "code", value: { tag: "<b>", weights: new Float64Array(60) } }), 120);
    expect(cell.html).toMatch(/^<pre class="cf-preview">\{/);
    expect(cell.html).toContain("&lt;b&gt;");
    expect(cell.html).toContain("more characters)");
  });

  it("reportCell(figure whose value is not a picture) says so as a caution", () => {
    expect(reportCell(outcome({ cellId: "f", kind: "figure", value: 3 })).cautions).toEqual(["this figure's value is not a picture the static report can draw"]);
  });

  it("reportCell(convergence figure spec) draws its error lines", () => {
    const spec = convergenceFigure({ histories: [{ label: "ε = 1", iterations: Int32Array.from([1, 2, 3]), errors: Float64Array.from([1, 0.1, 0.01]), tolerance: 0.001 }] });
    expect(reportCell(outcome({ cellId: "f", kind: "figure", value: spec })).svg).toContain('aria-description="error history"');
  });
});

describe("reportCell (sweeps and functions)", () => {
  it("reportCell(sweep with one replicate) leaves out the replicate column", () => {
    const value = { vary: "epsilon", replicates: 1, complete: true, columns: ["epsilon", "replicate", "cost"], rows: [{ value: 0.1, epsilon: 0.1, replicate: 0, cost: 2 }] };
    expect(reportCell(outcome({ cellId: "s", kind: "sweep", value })).table!.columns).toEqual(["epsilon", "cost"]);
  });

  it("reportCell(sweep with replicates) shows one row per value with the mean and sample standard deviation", () => {
    // Sample standard deviation (n − 1) of 1, 2, 3 is 1; of 10, 10, 10 is 0 (textbook arithmetic).
    const rows = [1, 2, 3].flatMap((c, r) => [
      { value: 0.1, epsilon: 0.1, replicate: r, cost: c, status: r === 2 ? "not-converged" : "converged" },
      { value: 1, epsilon: 1, replicate: r, cost: 10, status: "converged" },
    ]);
    const value = { vary: "epsilon", replicates: 3, complete: true, columns: ["epsilon", "replicate", "cost", "status"], rows };
    const table = reportCell(outcome({ cellId: "s", kind: "sweep", value })).table!;
    expect(table.columns).toEqual(["epsilon", "runs", "cost (mean)", "cost (sd)", "status"]);
    expect(table.rows).toEqual([
      [0.1, 3, 2, 1, "2 converged, 1 not-converged"],
      [1, 3, 10, 0, "converged"],
    ]);
    expect(table.caption).toBe("Mean and sample standard deviation over 3 replicates per value.");
  });

  it("reportCell(code returning a function) shows no preview", () => {
    const cell = reportCell(outcome({ cellId: "c", kind: "code", value: (x: number) => x, headline: "function" }));
    expect(cell.headline).toBe("function");
    expect(cell.html).toBeUndefined();
  });

  it("reportCell(figure whose headline only names the view) drops the headline", () => {
    const spec = convergenceFigure({ histories: [{ label: "a", iterations: Int32Array.from([1]), errors: Float64Array.from([0.1]) }] });
    expect(reportCell(outcome({ cellId: "f", kind: "figure", value: spec, headline: "convergence" })).headline).toBeUndefined();
  });
});

describe("tableFrom", () => {
  it("tableFrom({columns, rows}) maps the study's column notations to report formats", () => {
    const table = tableFrom({
      columns: [
        { field: "epsilon", label: "ε", digits: 3, notation: "significant" },
        { field: "cost", digits: 4, notation: "fixed" },
        { field: "mass", digits: 3, notation: "scientific" },
        { field: "status" },
      ],
      rows: [{ epsilon: 0.05, cost: 1.23456, mass: 0.000123456, status: "converged" }],
    })!;
    expect(table.columns).toEqual(["ε", "cost", "mass", "status"]);
    expect(table.formats).toEqual([{ significant: 3 }, { fixed: 4 }, undefined, undefined]);
    // Scientific with 3 digits after the point of the mantissa (docs/format.md, table).
    expect(table.rows).toEqual([[0.05, 1.23456, "1.235e\u22124", "converged"]]);
  });

  it("tableFrom({columns, rows as arrays}) reads rows by position", () => {
    expect(tableFrom({ columns: ["x", "y"], rows: [[1, 2]] })!.rows).toEqual([[1, 2]]);
  });

  it("tableFrom(not a table) is undefined", () => {
    expect(tableFrom(3)).toBeUndefined();
    expect(tableFrom([1, 2])).toBeUndefined();
  });
});

describe("describeMeasure", () => {
  it("describeMeasure(points) states size, dimension and total mass", () => {
    expect(describeMeasure(source)).toBe("3 points in 1-D, total mass 1");
    expect(describeMeasure({ kind: "grid", shape: [2, 3], origin: [0, 0], spacing: [1, 1], mass: new Float64Array(6).fill(0.5) })).toBe("a 2 × 3 grid histogram, total mass 3");
    expect(describeMeasure("no")).toBeUndefined();
  });
});

describe("receiptSummary", () => {
  it("receiptSummary(summary) writes numbers to 6 significant digits and shortens nested values", () => {
    expect(receiptSummary({ cost: 1.23456789, nested: { a: [1, 2, 3] }, none: null })).toBe('cost 1.23457, nested {"a":[1,2,3]}, none —');
    expect(receiptSummary({})).toBe("no summary recorded");
  });
});

describe("tableFrom (table cell values)", () => {
  it("tableFrom({columns, rows, text}) shows the text the table cell wrote in the study's notations", () => {
    const table = tableFrom({
      columns: [{ field: "epsilon", label: "ε", notation: "significant", digits: 3 }],
      rows: [{ epsilon: 0.05 }, { epsilon: null }],
      text: [["0.0500"], ["—"]],
    })!;
    expect(table).toEqual({ columns: ["ε"], rows: [["0.0500"], ["—"]], formats: ["text"] });
  });
});

describe("shortFingerprint", () => {
  it("shortFingerprint(sha256 text) keeps the method and 16 hex digits; short or other text is kept", () => {
    expect(shortFingerprint("sha256:c386c51cabeffe93e2c5eec6fa38e61c60dca03ed72226f80838b3089c00753d")).toBe("sha256:c386c51cabeffe93…");
    expect(shortFingerprint("fnv1a:3c9e51d2")).toBe("fnv1a:3c9e51d2");
  });
});

describe("receiptSummary (nested values)", () => {
  it("receiptSummary(summary) writes short number lists in brackets and counts records", () => {
    expect(receiptSummary({ mean: [1.0462399701413034, 0.11214636518306881], rows: [{ a: 1 }, { a: 2 }] })).toBe("mean (1.04624, 0.112146), rows 2 records");
  });
});
