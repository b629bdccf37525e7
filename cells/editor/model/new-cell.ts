import type { Cell, CellKindName, StudyDocument } from "../../document";
import { RESERVED_NAMES } from "../../document";

/** A name like `base`, `base2`, `base3`… that no cell of `study` has. */
export function freeCellName(study: StudyDocument, base: string): string {
  const taken = new Set(study.cells.map((c) => c.name).filter((n): n is string => typeof n === "string"));
  if (!taken.has(base) && !RESERVED_NAMES.has(base)) return base;
  for (let k = 2; ; k++) if (!taken.has(`${base}${k}`)) return `${base}${k}`;
}

/** Names of the cells of one kind, in study order. */
export function namesOfKind(study: StudyDocument, kind: CellKindName): string[] {
  return study.cells.filter((c) => c.kind === kind && typeof c.name === "string").map((c) => c.name as string);
}

/**
 * A new cell of `kind` with id `id`, ready to insert into `study`: valid settings
 * that do something sensible at once, and a fresh name where the kind needs one.
 * A transport takes the first two data cells, a sweep and a ready figure the last
 * transport cell, when there are such cells; otherwise they name cells that do not
 * exist yet, and the runtime says so until the user picks.
 */
export function newCell(kind: CellKindName, id: string, study: StudyDocument): Cell {
  const data = namesOfKind(study, "data");
  const transports = namesOfKind(study, "transport");
  const lastTransport = transports[transports.length - 1];
  switch (kind) {
    case "prose":
      return { id, kind, settings: { text: "Write what this part of the study shows. Show a live value with @{name}." } };
    case "parameter":
      return { id, kind, name: freeCellName(study, "knob"), settings: { control: "log-range", value: 0.05, min: 0.001, max: 1, label: "new setting" } };
    case "data":
      return {
        id,
        kind,
        name: freeCellName(study, "cloud"),
        settings: { from: "generator", generator: "gaussian-mixture", n: 200, components: [{ mean: [0, 0], scale: 1 }] },
      };
    case "transport":
      return {
        id,
        kind,
        name: freeCellName(study, "plan"),
        settings: {
          source: data[0] ?? "source",
          target: data[1] ?? data[0] ?? "target",
          method: "entropic",
          epsilon: { relative: 0.05, reference: "median" },
        },
      };
    case "sweep":
      return {
        id,
        kind,
        name: freeCellName(study, "sweep"),
        settings: { transport: lastTransport ?? "plan", vary: "epsilon", values: { from: 0.01, to: 1, count: 8, spacing: "log" } },
      };
    case "figure":
      return lastTransport
        ? { id, kind, settings: { view: "coupling-lines", of: [lastTransport] } }
        : { id, kind, settings: { view: "code", code: "// Return Plot options or an SVG element.\n({marks: [Plot.dot([[0, 0], [1, 1]])]})" } };
    case "code":
      return { id, kind, settings: { code: "// Other cells are in scope by name.\n1 + 1" } };
    case "table":
      return { id, kind, settings: { rows: [{ case: "first", value: 1 }] } };
  }
}

/**
 * A copy of `cell` with id `id` and, when it has a name, a fresh one (`plan` →
 * `plan2`), so the copy can sit beside the original. Settings are shared: the
 * study is immutable and updateStudy copies what it stores.
 */
export function duplicateCell(cell: Cell, id: string, study: StudyDocument): Cell {
  const copy: Record<string, unknown> = { ...cell, id };
  if (typeof cell.name === "string") copy.name = freeCellName(study, cell.name.replace(/\d+$/, "") || cell.name);
  return copy as unknown as Cell;
}
