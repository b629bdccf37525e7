import { describe, expect, it } from "vitest";
import { type ProseCellValue, defineProseCell, describeProse } from "../../../cells/kinds/prose/define";
import { makeStudy } from "../study/study-helpers";
import { cellOf, computeContext, defineContext } from "./define-helpers";

// The live-value syntax and formats are the study format's (docs/format.md, "prose");
// numbers are written by JavaScript's toFixed/toPrecision/toExponential (ECMA-262).
async function prose(text: string, inputs: Record<string, unknown>) {
  const study = makeStudy([{ id: "p1", kind: "prose", settings: { text } }]);
  const def = defineProseCell(cellOf(study, "p1", "prose"), defineContext(study));
  return { def, value: (await def.compute(inputs, computeContext())) as ProseCellValue, cell: cellOf(study, "p1", "prose") };
}

const span = (name: string, text: string) => `<span class="cf-value" data-name="${name}">${text}</span>`;

describe("defineProseCell", () => {
  it("defineProseCell(text) depends on the cells its live values name", async () => {
    const { def } = await prose("@{eps:3f} and @{plan.values.cost:4} and @{eps}", { eps: 0.05, plan: { values: { cost: 1.2841 } } });
    expect(def.inputs).toEqual(["eps", "plan"]);
  });

  it("defineProseCell(text) formats live values fixed, significant and scientific as written", async () => {
    const { value } = await prose("ε = @{eps:3f}, cost @{plan.values.cost:4}, @{ plan.values.cost : 2e }, rows @{rows.0.n}", { eps: 0.05, plan: { values: { cost: 1.284149 } }, rows: [{ n: 12 }] });
    expect(value.html).toBe(`<p>ε = ${span("eps", "0.050")}, cost ${span("plan.values.cost", "1.284")}, ${span("plan.values.cost", "1.28e+0")}, rows ${span("rows.0.n", "12")}</p>\n`);
    expect(value.missing).toEqual([]);
  });

  it("defineProseCell(text) shows numbers without a format to 6 significant digits and other values as one line", async () => {
    const { value } = await prose("@{a} @{b} @{c} @{d} @{c.length}", { a: 1 / 3, b: 300, c: "north", d: true });
    expect(value.html).toBe(`<p>${span("a", "0.333333")} ${span("b", "300")} ${span("c", "north")} ${span("d", "true")} ${span("c.length", "5")}</p>\n`);
  });

  it("defineProseCell(text with a missing field) shows a dash and describeProse cautions it", async () => {
    const { value, cell } = await prose("n = @{ovens.length}", { ovens: { n: 3 } });
    expect(value.html).toBe(`<p>n = ${span("ovens.length", "—")}</p>\n`);
    expect(describeProse(cell, value).cautions).toEqual(['@{ovens.length}: no such field; shown as "—".']);
  });

  it("defineProseCell(text) writes an escaped \\@{name} as it reads and renders Markdown", async () => {
    const { value, def } = await prose("# Title\n\nescaped: \\@{not_a_value}, **bold** @{x}", { x: 2 });
    expect(def.inputs).toEqual(["x"]);
    expect(value.html).toBe(`<h1>Title</h1>\n<p>escaped: @{not_a_value}, <strong>bold</strong> ${span("x", "2")}</p>\n`);
  });
});
