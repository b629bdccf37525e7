import type { ScaleReference } from "../../../core/cost";
import type { TransportMethod } from "../../../core/result";
import { checkCellName } from "../../document/cell-name";
import { type NameMapper, type NumberOrParam, type ParamRef, checkNumberOrParam, collectReferences, isParamRef, mapField, mapParamRef } from "../../document/references";
import { type StudyIssue, childPath } from "../../document/study-issue";
import { type JsonObject, checkBoolean, checkNumber, checkObject, checkOneOf, checkPresent, isJsonObject, jsonTypeName } from "../../document/value-checks";

/**
 * Ground cost: |x−y|² (`sqeuclidean`, no ½), |x−y| (`euclidean`), |x−y|^p
 * (`power`, p > 0), or a user matrix held by another cell (`matrix`, rows =
 * source points, cols = target points).
 */
export type CostSetting =
  | { readonly kind: "sqeuclidean"; readonly [extra: string]: unknown }
  | { readonly kind: "euclidean"; readonly [extra: string]: unknown }
  | { readonly kind: "power"; readonly p: NumberOrParam; readonly [extra: string]: unknown }
  | { readonly kind: "matrix"; readonly cell: string; readonly [extra: string]: unknown };

/**
 * Epsilon in cost units (`absolute`), or as a multiple of a statistic of the
 * cost matrix (`relative` × max | median | mean; reference default "max").
 * Both values > 0.
 */
export type EpsilonSetting =
  | { readonly absolute: NumberOrParam; readonly [extra: string]: unknown }
  | { readonly relative: NumberOrParam; readonly reference?: ScaleReference; readonly [extra: string]: unknown };

/**
 * A KL marginal penalty ρ > 0, or `"balanced"` for ρ = ∞ (that marginal is
 * enforced exactly). JSON has no Infinity, hence the word.
 */
export type PenaltySetting = number | "balanced" | ParamRef;

/** One penalty for both sides, or one per side. */
export type MassPenaltySetting = PenaltySetting | { readonly source: PenaltySetting; readonly target: PenaltySetting; readonly [extra: string]: unknown };

/** Epsilon scaling: start at `start` (default: the cost max) and shrink by `factor` (0 < factor < 1) down to epsilon. */
export interface ScheduleSetting {
  readonly factor?: number;
  readonly start?: EpsilonSetting;
  readonly [extra: string]: unknown;
}

/** Settings of a transport cell: which two data cells, which cost, which formulation, which solver limits. */
export interface TransportSettings {
  /** Name of the cell giving the source measure. */
  readonly source: string;
  /** Name of the cell giving the target measure. */
  readonly target: string;
  /** Default {"kind": "sqeuclidean"}. */
  readonly cost?: CostSetting;
  readonly method: TransportMethod;
  /** Required by entropic, unbalanced and debiased; kept but unused by exact. */
  readonly epsilon?: EpsilonSetting;
  /** Required by unbalanced; optional for debiased (makes it unbalanced); kept but unused otherwise. */
  readonly massPenalty?: MassPenaltySetting;
  /** Stop when the relative L1 marginal error <= tolerance (> 0). Default 1e-6. */
  readonly tolerance?: NumberOrParam;
  /** Iteration cap, a positive integer. Default 10000. */
  readonly maxIterations?: NumberOrParam;
  /** Epsilon scaling. Default false. */
  readonly schedule?: boolean | ScheduleSetting;
  /** Start from this cell's previous potentials when its settings change. Default false. */
  readonly warmStart?: boolean;
  /** Rescale both measures to total mass 1 before solving (compare shapes only). Default false. */
  readonly normalize?: boolean;
  /** Exact method's algorithm. Default "auto". */
  readonly exactAlgorithm?: "auto" | "sorting" | "network-simplex" | "assignment";
  /** Entropic computation domain. Default "auto". */
  readonly domain?: "auto" | "log" | "kernel";
  readonly [extra: string]: unknown;
}

/** Values of `method` (the core's TransportMethod). */
export const TRANSPORT_METHODS: readonly TransportMethod[] = ["exact", "entropic", "unbalanced", "debiased"];
/** Values of `cost.kind`. */
export const COST_KINDS = ["sqeuclidean", "euclidean", "power", "matrix"] as const;
/** Values of `epsilon.reference`: the cost statistic a relative epsilon multiplies. */
export const SCALE_REFERENCES: readonly ScaleReference[] = ["max", "median", "mean"];
/** Values of `exactAlgorithm`. */
export const EXACT_ALGORITHMS = ["auto", "sorting", "network-simplex", "assignment"] as const;
/** Values of `domain`. */
export const ENTROPIC_DOMAINS = ["auto", "log", "kernel"] as const;

/** Values used when a setting is omitted (they match the core's own defaults). */
export const TRANSPORT_DEFAULTS = {
  cost: { kind: "sqeuclidean" } as CostSetting,
  reference: "max" as ScaleReference,
  tolerance: 1e-6,
  maxIterations: 10000,
  schedule: false,
  warmStart: false,
  normalize: false,
  exactAlgorithm: "auto",
  domain: "auto",
} as const;

function checkCost(value: unknown, path: string, issues: StudyIssue[]): void {
  if (!checkObject(value, path, issues)) return;
  if (!checkPresent(value, "kind", path, issues) || !checkOneOf(value.kind, COST_KINDS, childPath(path, "kind"), issues)) return;
  if (value.kind === "power" && checkPresent(value, "p", path, issues, 'when kind is "power"')) {
    checkNumberOrParam(value.p, childPath(path, "p"), issues, { above: 0 });
  }
  if (value.kind === "matrix" && checkPresent(value, "cell", path, issues, 'when kind is "matrix"')) checkCellName(value.cell, childPath(path, "cell"), issues);
}

/** Checks an epsilon setting at `path` (also used by sweeps and schedules). */
export function checkEpsilon(value: unknown, path: string, issues: StudyIssue[]): void {
  if (!checkObject(value, path, issues)) return;
  const hasAbsolute = value.absolute !== undefined;
  const hasRelative = value.relative !== undefined;
  if (hasAbsolute && hasRelative) {
    issues.push({ path, message: 'give either "absolute" or "relative", not both' });
    return;
  }
  if (!hasAbsolute && !hasRelative) {
    issues.push({ path, message: 'must hold "absolute" (cost units) or "relative" (× a cost statistic)' });
    return;
  }
  if (hasAbsolute) {
    checkNumberOrParam(value.absolute, childPath(path, "absolute"), issues, { above: 0 });
    if (value.reference !== undefined) issues.push({ path: childPath(path, "reference"), message: 'only applies to a "relative" epsilon' });
    return;
  }
  checkNumberOrParam(value.relative, childPath(path, "relative"), issues, { above: 0 });
  if (value.reference !== undefined) checkOneOf(value.reference, SCALE_REFERENCES, childPath(path, "reference"), issues);
}

/** Checks one penalty: a number > 0, "balanced" or a reference. */
export function checkPenalty(value: unknown, path: string, issues: StudyIssue[]): void {
  if (value === "balanced") return;
  if (typeof value === "number" || isParamRef(value)) {
    checkNumberOrParam(value, path, issues, { above: 0 });
    return;
  }
  issues.push({ path, message: `must be a number > 0, "balanced" or a reference {"param": name}, got ${jsonTypeName(value)}` });
}

function checkMassPenalty(value: unknown, path: string, issues: StudyIssue[]): void {
  if (isJsonObject(value) && !isParamRef(value)) {
    for (const side of ["source", "target"]) if (checkPresent(value, side, path, issues)) checkPenalty(value[side], childPath(path, side), issues);
    return;
  }
  checkPenalty(value, path, issues);
}

function checkSchedule(value: unknown, path: string, issues: StudyIssue[]): void {
  if (typeof value === "boolean") return;
  if (!isJsonObject(value)) {
    issues.push({ path, message: `must be true, false or an object {factor, start}, got ${jsonTypeName(value)}` });
    return;
  }
  if (value.factor !== undefined && checkNumber(value.factor, childPath(path, "factor"), issues, { above: 0 }) && !(value.factor < 1)) {
    issues.push({ path: childPath(path, "factor"), message: `must be < 1 (epsilon shrinks by this factor each stage), got ${value.factor}` });
  }
  if (value.start !== undefined) checkEpsilon(value.start, childPath(path, "start"), issues);
}

/**
 * Validates transport settings at `path`: source and target names, cost,
 * method, epsilon (required unless exact), mass penalty (required when
 * unbalanced), tolerance > 0, maxIterations a positive integer, schedule,
 * warmStart, exactAlgorithm and domain. Settings that only other methods use
 * are still checked, so switching methods back never meets a bad value.
 */
export function validateTransportSettings(settings: unknown, path: string): StudyIssue[] {
  const issues: StudyIssue[] = [];
  if (!checkObject(settings, path, issues)) return issues;
  const s: JsonObject = settings;
  const at = (key: string) => childPath(path, key);
  for (const side of ["source", "target"]) if (checkPresent(s, side, path, issues)) checkCellName(s[side], at(side), issues);
  if (s.cost !== undefined) checkCost(s.cost, at("cost"), issues);
  const method = checkPresent(s, "method", path, issues) && checkOneOf(s.method, TRANSPORT_METHODS, at("method"), issues) ? s.method : undefined;
  if (s.epsilon !== undefined) checkEpsilon(s.epsilon, at("epsilon"), issues);
  else if (method && method !== "exact") checkPresent(s, "epsilon", path, issues, `when method is "${method}"`);
  if (s.massPenalty !== undefined) checkMassPenalty(s.massPenalty, at("massPenalty"), issues);
  else if (method === "unbalanced") checkPresent(s, "massPenalty", path, issues, 'when method is "unbalanced"');
  if (s.tolerance !== undefined) checkNumberOrParam(s.tolerance, at("tolerance"), issues, { above: 0 });
  if (s.maxIterations !== undefined) checkNumberOrParam(s.maxIterations, at("maxIterations"), issues, { integer: true, atLeast: 1 });
  if (s.schedule !== undefined) checkSchedule(s.schedule, at("schedule"), issues);
  if (s.warmStart !== undefined) checkBoolean(s.warmStart, at("warmStart"), issues);
  if (s.normalize !== undefined) checkBoolean(s.normalize, at("normalize"), issues);
  if (s.exactAlgorithm !== undefined) checkOneOf(s.exactAlgorithm, EXACT_ALGORITHMS, at("exactAlgorithm"), issues);
  if (s.domain !== undefined) checkOneOf(s.domain, ENTROPIC_DOMAINS, at("domain"), issues);
  return issues;
}

/** Renames the references inside an epsilon setting. */
export function mapEpsilonReferences(value: unknown, rename: NameMapper): unknown {
  if (!isJsonObject(value)) return value;
  return mapField(mapField(value, "absolute", (v) => mapParamRef(v, rename)), "relative", (v) => mapParamRef(v, rename));
}

/** Renames source, target, a cost matrix cell and every number reference. */
export function mapTransportReferences(settings: TransportSettings, rename: NameMapper): TransportSettings {
  const name = (v: unknown) => (typeof v === "string" ? rename(v) : v);
  const ref = (v: unknown) => mapParamRef(v, rename);
  let out: JsonObject = mapField(mapField(settings, "source", name), "target", name);
  out = mapField(out, "cost", (c) => (isJsonObject(c) ? mapField(mapField(c, "p", ref), "cell", name) : c));
  out = mapField(out, "epsilon", (e) => mapEpsilonReferences(e, rename));
  out = mapField(out, "massPenalty", (m) => (isJsonObject(m) && !isParamRef(m) ? mapField(mapField(m, "source", ref), "target", ref) : ref(m)));
  out = mapField(out, "tolerance", ref);
  out = mapField(out, "maxIterations", ref);
  out = mapField(out, "schedule", (sc) => (isJsonObject(sc) ? mapField(sc, "start", (e) => mapEpsilonReferences(e, rename)) : sc));
  return out as TransportSettings;
}

/**
 * Names of the cells a transport depends on: source, target, a cost matrix
 * cell, and cells referenced in place of numbers (in first-use order).
 * A warm start reads this cell's own previous result, which is not a dependency.
 */
export function transportDependencies(settings: TransportSettings): string[] {
  return collectReferences(settings, mapTransportReferences);
}
