import { gaussianMixture, gridHistogram, ring, subsample, twoMoons, uniformBox } from "../../../core/generators";
import { type Measure, gridMeasure, pointMeasure } from "../../../core/measure";
import { seededRandom } from "../../../core/random";
import { CellSettingError } from "../cell-error";
import type { MeasureFileReader } from "../define-context";
import { type CellInputs, resolveNumber, resolveOptionalNumber, resolveSeed, shortDescription } from "../resolve-number";
import { type ResolvedComponent, mixtureDensity } from "./grid-density";
import type { NumberOrParam } from "../../document/references";
import type { DataSettings, MixtureComponentSettings } from "./settings";

/** Where a data cell runs: its identity and what it may read. */
export interface DataEnvironment {
  readonly cellId: string;
  /** The cell's name, used in file error messages. */
  readonly name?: string;
  readonly studySeed: number;
  readonly studyFolder?: string;
  readonly readMeasureFile?: MeasureFileReader;
}

/**
 * The measure a data cell's settings describe (docs/format.md, "data").
 * Randomness: one generator seeded with the cell's seed (see `resolveSeed`) draws
 * the points first (generators) and then the subsample, so a cell's draws depend
 * only on its seed and settings. Grids and inline points keep their masses as
 * written; generated points have mass 1/n; a subsample keeps relative masses and
 * the total (core `subsample`). Throws CellSettingError (bad resolved values),
 * TransportInputError from the core (fields named as in the settings) or
 * DataImportError from the file reader.
 */
export function drawData(settings: DataSettings, inputs: CellInputs, env: DataEnvironment): Measure {
  const seed = resolveSeed(settings.seed, inputs, env.studySeed, env.cellId);
  const random = seededRandom(seed);
  let measure = baseMeasure(settings, inputs, env, random);
  if (settings.subsample !== undefined) {
    const k = resolveNumber(settings.subsample, inputs, "subsample", { integer: true, atLeast: 1 });
    let available = 0;
    for (const w of measure.mass) if (w > 0) available++;
    if (k > available) throw new CellSettingError("subsample", `asks for ${k} points, but the measure has ${available} with positive mass`);
    measure = subsample(measure, k, random);
  }
  return measure;
}

function baseMeasure(s: DataSettings, inputs: CellInputs, env: DataEnvironment, random: () => number): Measure {
  if (s.from === "inline") return pointMeasure(s.points, s.mass, { name: "points" });
  if (s.from === "file") {
    if (!env.readMeasureFile) throw new CellSettingError("path", "data files cannot be read here (no file access); run the study where its files are");
    return env.readMeasureFile(s.path, { format: s.format, columns: s.columns, mass: s.mass, relativeTo: env.studyFolder, name: env.name });
  }
  const count = (n: NumberOrParam) => resolveNumber(n, inputs, "n", { integer: true, atLeast: 1 });
  switch (s.generator) {
    case "gaussian-mixture":
      return gaussianMixture({ n: count(s.n), components: resolveComponents(s.components, inputs, "components"), random });
    case "uniform-box":
      return uniformBox({ n: count(s.n), lower: s.lower, upper: s.upper, random });
    case "ring":
      return ring({
        n: count(s.n),
        center: s.center,
        radius: resolveOptionalNumber(s.radius, 1, inputs, "radius", { atLeast: 0 }),
        noise: resolveOptionalNumber(s.noise, 0, inputs, "noise", { atLeast: 0 }),
        random,
      });
    case "two-moons":
      return twoMoons({ n: count(s.n), noise: resolveOptionalNumber(s.noise, 0, inputs, "noise", { atLeast: 0 }), random });
    case "grid-histogram": {
      const grid = { origin: s.origin, spacing: s.spacing };
      const density = s.density as { readonly values?: readonly number[]; readonly components?: readonly MixtureComponentSettings[]; readonly cell?: string };
      if (density.values !== undefined) return gridMeasure(s.shape, density.values, { ...grid, name: "density.values" });
      if (density.components !== undefined) {
        const axes = s.shape.length === 1 ? 1 : 2;
        const components = resolveComponents(density.components, inputs, "density.components");
        return gridHistogram({ shape: s.shape, ...grid, density: mixtureDensity(components, axes, "density.components") });
      }
      const name = density.cell ?? "";
      const fn = inputs[name];
      if (typeof fn !== "function") {
        throw new CellSettingError("density.cell", `"${name}" gives ${shortDescription(fn)}, not a function (x) or (x, y) of the cell centre`);
      }
      return gridHistogram({ shape: s.shape, ...grid, density: fn as (x: number, y?: number) => number });
    }
  }
}

function resolveComponents(components: readonly MixtureComponentSettings[], inputs: CellInputs, path: string): ResolvedComponent[] {
  return components.map((c, i) => {
    const at = `${path}[${i}]`;
    const given = c.scale;
    const scale = given === undefined || isNumberList(given) ? given : resolveNumber(given, inputs, `${at}.scale`, { atLeast: 0 });
    return {
      weight: resolveOptionalNumber(c.weight, 1, inputs, `${at}.weight`, { atLeast: 0 }),
      mean: c.mean,
      ...(c.covariance === undefined ? {} : { covariance: c.covariance }),
      ...(scale === undefined ? {} : { scale }),
    };
  });
}

function isNumberList(value: unknown): value is readonly number[] {
  return Array.isArray(value);
}
