import { type Measure, measureDimension, measurePoints, supportSize, totalMass } from "../../core/measure";
import { CORE_VERSION } from "../../core/version";
import { isParamRef } from "../document/references";
import { deriveCellSeed } from "../document/seed";
import type { Cell, Receipt } from "../document/study-types";
import { isJsonObject } from "../document/value-checks";
import { dataUsesStudySeed } from "../kinds/data/settings";
import { isMeasure } from "../kinds/measure-input";
import { type SweepCellValue, isSweepValue } from "../kinds/sweep/sweep-value";
import { type TransportCellValue, isTransportValue } from "../kinds/transport/transport-value";
import { fingerprint } from "./fingerprint";

/** Kinds whose cells get receipts: the ones that compute from data. */
export const RECEIPT_KINDS: readonly string[] = ["data", "transport", "sweep"];

/** What a receipt needs besides the cell and its value. */
export interface ReceiptContext {
  /** Values of the run's cells by name, to write references out as the values they had. */
  readonly valuesByName: ReadonlyMap<string, unknown>;
  readonly studySeed: number;
  /** Wall-clock seconds of the cell's computation. */
  readonly seconds: number;
  /** ISO 8601 date-time with a zone, e.g. "2026-12-01T09:30:00.000Z". */
  readonly recordedAt: string;
}

/**
 * The receipt of a computing cell's value (docs/format.md, "Receipts"; choices in
 * docs/cells.md), or undefined for other kinds or a value of the wrong shape.
 * - data: settings with references and a "study" seed written as the values
 *   used; fingerprint of those settings and the measure's bytes; summary: support
 *   size, dimension, total mass, mean.
 * - transport: settings = the resolved solver options, cost and input names;
 *   fingerprint of the options, the cost (a user matrix's bytes included) and both
 *   measures' bytes; summary: method, algorithm, status, iterations, the values
 *   (cost, objective, divergence, mass), marginal error, epsilon, tolerance.
 * - sweep: settings = vary, the expanded values, replicates, resolved seed,
 *   outputs; fingerprint of those and of the transport's problem; summary: method,
 *   tolerance and every row without its `seconds`.
 * Numbers that JSON cannot hold are written as text ("Infinity"); a balanced
 * penalty as "balanced".
 */
export function createReceipt(cell: Cell, value: unknown, context: ReceiptContext): Receipt | undefined {
  const base = { coreVersion: CORE_VERSION, seconds: Math.max(0, context.seconds), recordedAt: context.recordedAt };
  if (cell.kind === "data" && isMeasure(value)) {
    const settings = withReferences(cell.settings, context.valuesByName) as Record<string, unknown>;
    if (dataUsesStudySeed(cell.settings)) settings.seed = deriveCellSeed(context.studySeed, cell.id);
    return { fingerprint: fingerprint({ kind: "data", settings, measure: value }), settings: jsonSafe(settings), summary: measureSummary(value), ...base };
  }
  if (cell.kind === "transport" && isTransportValue(value)) {
    const settings = {
      source: value.names.source,
      target: value.names.target,
      ...(value.normalized ? { normalize: true } : {}),
      cost: costSetting(value, cell.settings.cost),
      ...value.solveOptions,
    };
    return { fingerprint: transportFingerprint(value), settings: jsonSafe(settings), summary: transportSummary(value), ...base };
  }
  if (cell.kind === "sweep" && isSweepValue(value)) {
    const settings = { transport: value.transportName, vary: value.vary, values: value.values, replicates: value.replicates, seed: value.seed, record: value.record };
    return {
      fingerprint: fingerprint({ kind: "sweep", settings, transport: transportFingerprint(value.transport) }),
      settings: jsonSafe(settings),
      summary: sweepSummary(value),
      ...base,
    };
  }
  return undefined;
}

function transportFingerprint(value: TransportCellValue): string {
  return fingerprint({ kind: "transport", options: value.solveOptions, cost: value.costSpec, source: value.source, target: value.target });
}

function costSetting(value: TransportCellValue, written: unknown): unknown {
  // A user matrix is in the fingerprint; the settings name the cell that gave it.
  if (value.costSpec.kind === "matrix") return { kind: "matrix", cell: isJsonObject(written) ? written.cell : undefined };
  return value.costSpec;
}

function measureSummary(measure: Measure): Record<string, unknown> {
  const n = supportSize(measure);
  const d = measureDimension(measure);
  const x = measurePoints(measure);
  const mass = totalMass(measure);
  const mean = new Array<number>(d).fill(0);
  for (let i = 0; i < n; i++) for (let k = 0; k < d; k++) mean[k] += (measure.mass[i] * x[i * d + k]) / mass;
  const shape = measure.kind === "grid" ? { shape: [...measure.shape] } : {};
  return { kind: measure.kind, points: n, dim: d, ...shape, totalMass: mass, mean };
}

function transportSummary(value: TransportCellValue): Record<string, unknown> {
  const { values, diagnostics } = value;
  return jsonSafe({
    method: value.method,
    algorithm: value.algorithm,
    status: diagnostics.status,
    iterations: diagnostics.iterations,
    cost: values.cost,
    objective: values.objective,
    ...(values.divergence === undefined ? {} : { divergence: values.divergence }),
    mass: values.mass,
    marginalError: diagnostics.marginalError,
    ...(value.epsilon ? { epsilon: value.epsilon.absolute } : {}),
    ...(value.solveOptions.tolerance === undefined ? {} : { tolerance: value.solveOptions.tolerance }),
  }) as Record<string, unknown>;
}

function sweepSummary(value: SweepCellValue): Record<string, unknown> {
  const rows = value.rows.map((row) => {
    const { seconds: _seconds, [value.vary]: _same, ...rest } = row as Record<string, unknown>;
    return rest;
  });
  return jsonSafe({
    method: value.transport.method,
    ...(value.transport.solveOptions.tolerance === undefined ? {} : { tolerance: value.transport.solveOptions.tolerance }),
    vary: value.vary,
    complete: value.complete,
    rows,
  }) as Record<string, unknown>;
}

/** Settings with every `{"param": name}` replaced by the value `name` had in the run (kept as written when unknown). */
function withReferences(settings: unknown, values: ReadonlyMap<string, unknown>): unknown {
  if (isParamRef(settings)) return values.has(settings.param) ? values.get(settings.param) : settings;
  if (Array.isArray(settings)) return settings.map((item) => withReferences(item, values));
  if (isJsonObject(settings)) return Object.fromEntries(Object.entries(settings).map(([k, v]) => [k, withReferences(v, values)]));
  return settings;
}

/** A copy JSON can hold: non-finite numbers as text ("Infinity", "NaN"), a penalty of Infinity as "balanced", typed arrays as arrays. */
function jsonSafe(value: unknown, key = ""): Record<string, unknown> & unknown {
  const walk = (item: unknown, at: string): unknown => {
    if (typeof item === "number") return Number.isFinite(item) ? item : at.startsWith("massPenalty") && item === Infinity ? "balanced" : String(item);
    if (ArrayBuffer.isView(item)) return Array.from(item as unknown as ArrayLike<number>, (v) => walk(v, at));
    if (Array.isArray(item)) return item.map((v) => walk(v, at));
    if (isJsonObject(item)) return Object.fromEntries(Object.entries(item).filter(([, v]) => v !== undefined).map(([k, v]) => [k, walk(v, at ? `${at}.${k}` : k)]));
    return item;
  };
  return walk(value, key) as Record<string, unknown>;
}

/** One difference between a saved receipt and a fresh one. */
export interface ReceiptDrift {
  /** Where: "fingerprint", "summary.cost", "summary.rows[3].divergence", "summary.status". */
  readonly field: string;
  readonly saved: unknown;
  readonly fresh: unknown;
  /** The tolerance applied: relative for values, absolute (iterations) for counts, 0 for exact matches. */
  readonly tolerance: number;
  /**
   * - `inputs`: the fingerprints differ: the cell computed from other inputs (data,
   *   settings, parameter values), so its numbers are not comparable ("inputs changed");
   * - `value`: a number moved by more than its tolerance;
   * - `count`: an iteration count moved by more than its slack;
   * - `mismatch`: text, a true/false, a missing field or a different row count differs.
   */
  readonly kind: "inputs" | "value" | "count" | "mismatch";
}

/** The outcome of {@link compareReceipt}. */
export interface ReceiptComparison {
  readonly ok: boolean;
  readonly drifts: readonly ReceiptDrift[];
  /** The fresh receipt was computed by another core version (not a drift in itself). */
  readonly coreVersionChanged: boolean;
}

/** Tolerance of exact values (exact transport, data summaries), relative. */
export const EXACT_TOLERANCE = 1e-9;
/** Values within this of zero in absolute terms always agree (rounding noise around 0). */
export const ABSOLUTE_FLOOR = 1e-12;
/** Factor between an iterative solve's marginal tolerance and the relative tolerance on its values. */
export const ITERATIVE_FACTOR = 10;

/**
 * Compares a saved receipt with a fresh one of the same cell (docs/cells.md, "Checking").
 * - Different fingerprints: one drift of kind "inputs" and nothing else is compared.
 * - Numbers in the summary agree when |saved − fresh| ≤ tol · max(|saved|, |fresh|)
 *   or ≤ 1e-12: tol = 1e-9 for exact methods and data; for entropic, unbalanced
 *   and debiased solves (and sweeps of them) tol = max(10 · tolerance, 1e-9), with
 *   the transport's marginal tolerance (from the summary, else `cellSettings.tolerance`,
 *   else 1e-6; a row of a tolerance sweep uses its own value): a marginal error
 *   ≤ tolerance leaves the values uncertain by about that much, relative, and the
 *   factor 10 absorbs different iteration paths (warm starts, the wasm or JS kernel).
 * - Iteration counts agree within max(2, 10 %) — warm starts and kernels change them.
 * - `marginalError` and `seconds` are not compared (noise below the tolerance, machine speed).
 * - Text and true/false must be equal; a field or row present on one side only is a mismatch.
 */
export function compareReceipt(saved: Receipt, fresh: Receipt, cellSettings?: unknown): ReceiptComparison {
  const coreVersionChanged = saved.coreVersion !== fresh.coreVersion;
  if (saved.fingerprint !== fresh.fingerprint) {
    return { ok: false, drifts: [{ field: "fingerprint", saved: saved.fingerprint, fresh: fresh.fingerprint, tolerance: 0, kind: "inputs" }], coreVersionChanged };
  }
  const summary = saved.summary as Record<string, unknown>;
  const method = typeof summary.method === "string" ? summary.method : undefined;
  const writtenTolerance = isJsonObject(cellSettings) && typeof cellSettings.tolerance === "number" ? cellSettings.tolerance : undefined;
  const baseTolerance = typeof summary.tolerance === "number" ? summary.tolerance : (writtenTolerance ?? 1e-6);
  const relative = (marginal: number) => (method === undefined || method === "exact" ? EXACT_TOLERANCE : Math.max(ITERATIVE_FACTOR * marginal, EXACT_TOLERANCE));
  const drifts: ReceiptDrift[] = [];
  const compare = (a: unknown, b: unknown, field: string, key: string, marginal: number): void => {
    if (key === "seconds" || key === "marginalError") return;
    if (typeof a === "number" && typeof b === "number") {
      if (key === "iterations") {
        const slack = Math.max(2, 0.1 * Math.max(Math.abs(a), Math.abs(b)));
        if (Math.abs(a - b) > slack) drifts.push({ field, saved: a, fresh: b, tolerance: slack, kind: "count" });
        return;
      }
      const tol = relative(marginal);
      const gap = Math.abs(a - b);
      if (!(gap <= tol * Math.max(Math.abs(a), Math.abs(b)) || gap <= ABSOLUTE_FLOOR || a === b)) drifts.push({ field, saved: a, fresh: b, tolerance: tol, kind: "value" });
      return;
    }
    if (Array.isArray(a) && Array.isArray(b)) {
      if (a.length !== b.length) {
        drifts.push({ field: `${field}.length`, saved: a.length, fresh: b.length, tolerance: 0, kind: "mismatch" });
        return;
      }
      a.forEach((item, k) => {
        // A row of a tolerance sweep is held to its own tolerance.
        const rowTolerance = summary.vary === "tolerance" && key === "rows" && isJsonObject(item) && typeof item.value === "number" ? item.value : marginal;
        compare(item, b[k], `${field}[${k}]`, key, rowTolerance);
      });
      return;
    }
    if (isJsonObject(a) && isJsonObject(b)) {
      for (const k of new Set([...Object.keys(a), ...Object.keys(b)])) compare(a[k], b[k], `${field}.${k}`, k, marginal);
      return;
    }
    if (a !== b) drifts.push({ field, saved: a, fresh: b, tolerance: 0, kind: "mismatch" });
  };
  compare(saved.summary, fresh.summary, "summary", "summary", baseTolerance);
  return { ok: drifts.length === 0, drifts, coreVersionChanged };
}
