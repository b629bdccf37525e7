import type { Cell } from "../document/study-types";
import type { CellDefinition } from "../runtime/cell-definition";
import { defineCodeCell, describeCode } from "./code/define";
import { defineDataCell, describeData } from "./data/define";
import type { DefineContext } from "./define-context";
import { defineFigureCell, describeFigure } from "./figure/define";
import type { CellDescription, KindRuntime } from "./kind-runtime";
import { defineParameterCell, describeParameter } from "./parameter/define";
import { defineProseCell, describeProse } from "./prose/define";
import { type CellKindName, KIND_SETTINGS, type KindSettings, type SettingsByKind } from "./settings-registry";
import { defineSweepCell, describeSweep } from "./sweep/define";
import { defineTableCell, describeTable } from "./table/define";
import { defineTransportCell, describeTransport } from "./transport/define";

/** How each kind runs (define + describe), by kind name. */
export const KIND_RUNTIME: { readonly [K in CellKindName]: KindRuntime<K> } = {
  prose: { define: defineProseCell, describe: describeProse },
  parameter: { define: defineParameterCell, describe: describeParameter },
  data: { define: defineDataCell, describe: describeData },
  transport: { define: defineTransportCell, describe: describeTransport },
  sweep: { define: defineSweepCell, describe: describeSweep },
  figure: { define: defineFigureCell, describe: describeFigure },
  code: { define: defineCodeCell, describe: describeCode },
  table: { define: defineTableCell, describe: describeTable },
};

/** Everything about one kind: its settings knowledge (document) and how it runs. */
export type CellKind<K extends CellKindName> = KindSettings<SettingsByKind[K]> & KindRuntime<K>;

/** Every kind, settings and runtime together, by kind name. */
export const CELL_KINDS: { readonly [K in CellKindName]: CellKind<K> } = Object.fromEntries(
  (Object.keys(KIND_RUNTIME) as CellKindName[]).map((kind) => [kind, { ...KIND_SETTINGS[kind], ...KIND_RUNTIME[kind] }]),
) as { readonly [K in CellKindName]: CellKind<K> };

/** The engine definition of any cell, by its kind. */
export function defineCell(cell: Cell, context: DefineContext): CellDefinition {
  return (KIND_RUNTIME[cell.kind] as KindRuntime<CellKindName>).define(cell as never, context);
}

/** Headline and cautions of a value any cell computed, by its kind. */
export function describeCell(cell: Cell, value: unknown): CellDescription {
  return (KIND_RUNTIME[cell.kind] as KindRuntime<CellKindName>).describe(cell as never, value);
}
