import { type NameMapper } from "../document/references";
import { type StudyIssue } from "../document/study-issue";
import { type CodeSettings, codeDependencies, mapCodeReferences, validateCodeSettings } from "./code/settings";
import { type DataSettings, dataDependencies, dataUsesStudySeed, mapDataReferences, validateDataSettings } from "./data/settings";
import { type FigureSettings, figureDependencies, mapFigureReferences, validateFigureSettings } from "./figure/settings";
import { type ParameterSettings, mapParameterReferences, parameterDependencies, validateParameterSettings } from "./parameter/settings";
import { type ProseSettings, mapProseReferences, proseDependencies, validateProseSettings } from "./prose/settings";
import { type SweepSettings, mapSweepReferences, sweepDependencies, sweepUsesStudySeed, validateSweepSettings } from "./sweep/settings";
import { type TableSettings, mapTableReferences, tableDependencies, validateTableSettings } from "./table/settings";
import { type TransportSettings, mapTransportReferences, transportDependencies, validateTransportSettings } from "./transport/settings";

/** The cell kinds, in the order the docs and the editor's menu list them. */
export const CELL_KIND_NAMES = ["prose", "parameter", "data", "transport", "sweep", "figure", "code", "table"] as const;

/** Name of a cell kind. */
export type CellKindName = (typeof CELL_KIND_NAMES)[number];

/** The settings type of each kind. */
export interface SettingsByKind {
  prose: ProseSettings;
  parameter: ParameterSettings;
  data: DataSettings;
  transport: TransportSettings;
  sweep: SweepSettings;
  figure: FigureSettings;
  code: CodeSettings;
  table: TableSettings;
}

/** What the document needs to know about one kind's settings. */
export interface KindSettings<S> {
  /** Issues with settings at `path` (e.g. "cells[3].settings"); [] when valid. */
  readonly validate: (settings: unknown, path: string) => StudyIssue[];
  /** Names of other cells the typed settings refer to. */
  readonly dependencies: (settings: S) => string[];
  /** The settings with referenced names renamed; the same object when nothing changes. */
  readonly mapReferences: (settings: S, rename: NameMapper) => S;
  /** Whether a cell of this kind must have a name (because others refer to its value). */
  readonly nameRequired: boolean;
  /** Whether the cell's randomness derives from the study seed (so a new study seed changes it). */
  readonly usesStudySeed: (settings: S) => boolean;
}

const never = () => false;

/** Settings knowledge of every kind, by kind name. */
export const KIND_SETTINGS: { readonly [K in CellKindName]: KindSettings<SettingsByKind[K]> } = {
  prose: { validate: validateProseSettings, dependencies: proseDependencies, mapReferences: mapProseReferences, nameRequired: false, usesStudySeed: never },
  parameter: { validate: validateParameterSettings, dependencies: parameterDependencies, mapReferences: mapParameterReferences, nameRequired: true, usesStudySeed: never },
  data: { validate: validateDataSettings, dependencies: dataDependencies, mapReferences: mapDataReferences, nameRequired: true, usesStudySeed: dataUsesStudySeed },
  transport: { validate: validateTransportSettings, dependencies: transportDependencies, mapReferences: mapTransportReferences, nameRequired: true, usesStudySeed: never },
  sweep: { validate: validateSweepSettings, dependencies: sweepDependencies, mapReferences: mapSweepReferences, nameRequired: true, usesStudySeed: sweepUsesStudySeed },
  figure: { validate: validateFigureSettings, dependencies: figureDependencies, mapReferences: mapFigureReferences, nameRequired: false, usesStudySeed: never },
  code: { validate: validateCodeSettings, dependencies: codeDependencies, mapReferences: mapCodeReferences, nameRequired: false, usesStudySeed: never },
  table: { validate: validateTableSettings, dependencies: tableDependencies, mapReferences: mapTableReferences, nameRequired: false, usesStudySeed: never },
};

/** True when `value` names a known cell kind. */
export function isCellKindName(value: unknown): value is CellKindName {
  return typeof value === "string" && (CELL_KIND_NAMES as readonly string[]).includes(value);
}

/** The settings entry of a kind, typed loosely for code that handles any cell. */
export function kindSettings(kind: CellKindName): KindSettings<unknown> {
  return KIND_SETTINGS[kind] as KindSettings<unknown>;
}
