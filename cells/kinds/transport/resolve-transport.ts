import type { CostSpec, EpsilonSpec, ScaleReference } from "../../../core/cost";
import type { Matrix } from "../../../core/matrix";
import type { NumberOrParam } from "../../document/references";
import type { PortableSolveOptions } from "../../runtime/solve-protocol";
import { CellSettingError } from "../cell-error";
import { type CellInputs, resolveNumber, resolveOptionalNumber, shortDescription } from "../resolve-number";
import { type CostSetting, type EpsilonSetting, type PenaltySetting, TRANSPORT_DEFAULTS, type TransportSettings } from "./settings";

/**
 * The solver options a transport cell's settings stand for, every reference
 * resolved and checked with the document's bounds, defaults written out
 * (tolerance 1e-6, maxIterations 10000, schedule off, algorithm and domain
 * "auto"). Only the options the method uses are included: exact gets
 * `exactAlgorithm`; the others get epsilon, tolerance, maxIterations, schedule,
 * domain, and a mass penalty when unbalanced (or debiased with one given).
 * "balanced" becomes Infinity. Throws {@link CellSettingError} naming the setting.
 */
export function resolveSolveOptions(settings: TransportSettings, inputs: CellInputs): PortableSolveOptions {
  const { method } = settings;
  if (method === "exact") return { method, exactAlgorithm: settings.exactAlgorithm ?? TRANSPORT_DEFAULTS.exactAlgorithm };
  if (settings.epsilon === undefined) throw new CellSettingError("epsilon", `missing (required when method is "${method}")`);
  const options: { -readonly [K in keyof PortableSolveOptions]: PortableSolveOptions[K] } = {
    method,
    epsilon: resolveEpsilonSetting(settings.epsilon, inputs, "epsilon"),
  };
  if (method === "unbalanced" || (method === "debiased" && settings.massPenalty !== undefined)) {
    const mp = settings.massPenalty;
    if (mp === undefined) throw new CellSettingError("massPenalty", 'missing (required when method is "unbalanced")');
    options.massPenalty =
      typeof mp === "object" && "source" in mp
        ? { source: resolvePenalty(mp.source, inputs, "massPenalty.source"), target: resolvePenalty(mp.target, inputs, "massPenalty.target") }
        : resolvePenalty(mp, inputs, "massPenalty");
  }
  options.tolerance = resolveOptionalNumber(settings.tolerance, TRANSPORT_DEFAULTS.tolerance, inputs, "tolerance", { above: 0 });
  options.maxIterations = resolveOptionalNumber(settings.maxIterations, TRANSPORT_DEFAULTS.maxIterations, inputs, "maxIterations", { integer: true, atLeast: 1 });
  const schedule = settings.schedule ?? TRANSPORT_DEFAULTS.schedule;
  options.schedule =
    typeof schedule === "boolean"
      ? schedule
      : {
          ...(schedule.factor === undefined ? {} : { factor: schedule.factor }),
          ...(schedule.start === undefined ? {} : { start: resolveEpsilonSetting(schedule.start, inputs, "schedule.start") }),
        };
  options.domain = settings.domain ?? TRANSPORT_DEFAULTS.domain;
  return options;
}

/** An epsilon setting with its number resolved: `{absolute}` or `{relative, reference}` (reference default "max"). */
export function resolveEpsilonSetting(epsilon: EpsilonSetting, inputs: CellInputs, path: string): EpsilonSpec {
  const e = epsilon as { readonly absolute?: NumberOrParam; readonly relative?: NumberOrParam; readonly reference?: ScaleReference };
  if (e.absolute !== undefined) return { absolute: resolveNumber(e.absolute, inputs, `${path}.absolute`, { above: 0 }) };
  return { relative: resolveNumber(e.relative, inputs, `${path}.relative`, { above: 0 }), reference: e.reference ?? TRANSPORT_DEFAULTS.reference };
}

/** A penalty ρ: a number > 0 (or a reference to one), "balanced" = Infinity. */
export function resolvePenalty(penalty: PenaltySetting, inputs: CellInputs, path: string): number {
  return penalty === "balanced" ? Infinity : resolveNumber(penalty, inputs, path, { above: 0 });
}

/**
 * The ground cost a cost setting stands for (default squared Euclidean). A
 * `matrix` cost reads the named cell, whose value must be a matrix
 * `{data: Float64Array, rows, cols}` (row-major) or an array of equal-length rows
 * of numbers; the core checks its shape against the measures.
 */
export function resolveCost(cost: CostSetting | undefined, inputs: CellInputs): CostSpec {
  const c = cost ?? TRANSPORT_DEFAULTS.cost;
  switch (c.kind) {
    case "power":
      return { kind: "power", p: resolveNumber(c.p, inputs, "cost.p", { above: 0 }) };
    case "matrix":
      return { kind: "matrix", matrix: matrixInput(inputs[c.cell], c.cell) };
    case "euclidean":
      return { kind: "euclidean" };
    default:
      return { kind: "sqeuclidean" };
  }
}

function matrixInput(value: unknown, name: string): Matrix {
  if (typeof value === "object" && value !== null && (value as Matrix).data instanceof Float64Array) {
    const m = value as Matrix;
    if (Number.isInteger(m.rows) && Number.isInteger(m.cols)) return m;
  }
  if (Array.isArray(value) && value.length > 0 && value.every((row) => Array.isArray(row) || ArrayBuffer.isView(row))) {
    const rows = value as ArrayLike<number>[];
    const cols = rows[0].length;
    const data = new Float64Array(rows.length * cols);
    rows.forEach((row, i) => {
      if (row.length !== cols) throw new CellSettingError("cost.cell", `"${name}" gives rows of different lengths (row 0 has ${cols}, row ${i} has ${row.length})`);
      for (let j = 0; j < cols; j++) {
        const v = row[j];
        if (typeof v !== "number") throw new CellSettingError("cost.cell", `"${name}"[${i}][${j}] is ${shortDescription(v)}, not a number`);
        data[i * cols + j] = v;
      }
    });
    return { data, rows: rows.length, cols };
  }
  throw new CellSettingError("cost.cell", `"${name}" gives ${shortDescription(value)}, not a cost matrix ({data: Float64Array, rows, cols} or an array of rows)`);
}
