import type { Measure } from "../../../core/measure";
import { type CellOf, studySeed } from "../../document/study-types";
import type { CellDefinition } from "../../runtime/cell-definition";
import type { DefineContext } from "../define-context";
import { type CellDescription, versionKey } from "../kind-runtime";
import { describeMeasure, isMeasure } from "../measure-input";
import { drawData } from "./draw-data";
import { dataDependencies, dataUsesStudySeed } from "./settings";

/**
 * A data cell's definition: inputs are the cells its settings refer to (number and
 * seed references, a grid density cell); its value is a core Measure (PointMeasure
 * or GridMeasure), drawn by {@link drawData}. It recomputes when its settings
 * change, when the study seed changes and the cell derives its seed from it, and
 * (file data) when the study folder changes.
 */
export function defineDataCell(cell: CellOf<"data">, context: DefineContext): CellDefinition {
  const { settings } = cell;
  const seed = studySeed(context.study);
  const extra = {
    seed: dataUsesStudySeed(settings) ? seed : null,
    folder: settings.from === "file" ? (context.studyFolder ?? null) : null,
  };
  return {
    id: cell.id,
    name: cell.name ?? null,
    inputs: dataDependencies(settings),
    version: versionKey(cell, extra),
    compute: (inputs): Measure =>
      drawData(settings, inputs, {
        cellId: cell.id,
        name: cell.name,
        studySeed: seed,
        studyFolder: context.studyFolder,
        readMeasureFile: context.readMeasureFile,
      }),
  };
}

/** Headline "300 points in 2-D" (or the grid's shape); no cautions. */
export function describeData(_cell: CellOf<"data">, value: unknown): CellDescription {
  return { headline: isMeasure(value) ? describeMeasure(value) : undefined, cautions: [] };
}
