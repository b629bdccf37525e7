import { describe, expect, it } from "vitest";
import type { SweepCellValue } from "../../../cells/kinds/sweep/sweep-value";
import { type TableCellValue, defineTableCell, describeTable } from "../../../cells/kinds/table/define";
import { makeStudy } from "../study/study-helpers";
import { cellOf, computeContext, defineContext } from "./define-helpers";

async function table(settings: object, inputs: Record<string, unknown> = {}): Promise<TableCellValue> {
  const study = makeStudy([{ id: "tb", kind: "table", settings }]);
  return (await defineTableCell(cellOf(study, "tb", "table"), defineContext(study)).compute(inputs, computeContext())) as TableCellValue;
}

describe("defineTableCell", () => {
  it("defineTableCell(inline rows) writes 0.05 with digits 3 as docs/format.md's notation table shows", async () => {
    // docs/format.md, "table": 0.05 with digits 3 → auto "0.0500", fixed "0.050",
    // significant "0.0500", scientific "5.000e-2" (JavaScript's toFixed/toPrecision/toExponential, ECMA-262).
    const columns = ["auto", "fixed", "significant", "scientific"].map((notation) => ({ field: "v", notation, digits: 3 }));
    const text = await Promise.all(columns.map(async (c) => (await table({ rows: [{ v: 0.05 }], columns: [c] })).text[0][0]));
    expect(text).toEqual(["0.0500", "0.050", "0.0500", "5.000e-2"]);
  });

  it("defineTableCell(inline rows, no columns) shows every field of the first row, labels defaulting to fields, null as a dash", async () => {
    const value = await table({ rows: [{ shop: "North", price: 2.5, open: true }, { shop: "Quay", price: null, open: false }] });
    expect(value.columns).toEqual([
      { field: "shop", label: "shop", notation: "auto" },
      { field: "price", label: "price", notation: "auto" },
      { field: "open", label: "open", notation: "auto" },
    ]);
    expect(value.text).toEqual([["North", "2.5", "true"], ["Quay", "—", "false"]]);
  });

  it("defineTableCell(of a sweep) takes its rows and, by default, its columns", async () => {
    const sweep = { columns: ["epsilon", "replicate", "cost"], rows: [{ value: 0.1, epsilon: 0.1, replicate: 0, cost: 1.23456 }], vary: "epsilon", complete: true } as unknown as SweepCellValue;
    const value = await table({ of: "sw" }, { sw: sweep });
    expect(value.columns.map((c) => c.field)).toEqual(["epsilon", "replicate", "cost"]);
    expect(value.rows).toEqual([{ epsilon: 0.1, replicate: 0, cost: 1.23456 }]);
    const chosen = await table({ of: "sw", columns: [{ field: "cost", label: "Cost", digits: 2, notation: "fixed" }, { field: "missing" }] }, { sw: sweep });
    expect(chosen.text).toEqual([["1.23", "—"]]);
    expect(chosen.columns[0].label).toBe("Cost");
  });

  it("defineTableCell(of an array of objects) shows objects inside as one line of text", async () => {
    const value = await table({ of: "xs" }, { xs: [{ a: 1, b: [1, 2] }] });
    expect(value.rows).toEqual([{ a: 1, b: "[2 items]" }]);
  });

  it("defineTableCell(of a number) fails saying the cell gives no rows", async () => {
    await expect(table({ of: "n" }, { n: 3 })).rejects.toThrow('of: "n" gives 3, not rows (an array of objects, or a sweep)');
  });

  it("describeTable(cell, value) counts rows and columns", async () => {
    const study = makeStudy([{ id: "tb", kind: "table", settings: { rows: [] } }]);
    expect(describeTable(cellOf(study, "tb", "table"), await table({ rows: [{ a: 1 }, { a: 2 }] })).headline).toBe("2 rows × 1 column");
  });
});
