import { type NumberOrParam, isParamRef } from "../../document";
import { drawSeed } from "../controls/draw-seed";
import { DATA_FILE_FORMATS, DATA_ORIGINS, type DataSettings, GENERATOR_NAMES, type MixtureComponentSettings } from "../../kinds/data/settings";
import { el } from "../dom/element";
import { checkField, fieldGroup, numberField, numberListField, numberOrLinkField, selectField, textField } from "./fields";
import { type CellFormContext, linkableNames } from "./form-context";

const GENERATOR_WORDS: Record<string, string> = {
  "gaussian-mixture": "Gaussian mixture",
  "uniform-box": "uniform in a box",
  ring: "ring (circle plus noise)",
  "two-moons": "two moons",
  "grid-histogram": "histogram on a grid",
};

/** Settings for a generator chosen afresh, keeping the cell's count, seed and subsample. */
export function generatorTemplate(generator: string, from: DataSettings): Record<string, unknown> {
  const keep: Record<string, unknown> = {};
  for (const key of ["seed", "subsample"]) if ((from as Record<string, unknown>)[key] !== undefined) keep[key] = (from as Record<string, unknown>)[key];
  const n = "n" in from && from.n !== undefined ? from.n : 200;
  switch (generator) {
    case "gaussian-mixture":
      return { from: "generator", generator, n, components: [{ mean: [0, 0], scale: 1 }], ...keep };
    case "uniform-box":
      return { from: "generator", generator, n, lower: [0, 0], upper: [1, 1], ...keep };
    case "ring":
      return { from: "generator", generator, n, radius: 1, noise: 0.05, ...keep };
    case "two-moons":
      return { from: "generator", generator, n, noise: 0.05, ...keep };
    default:
      return { from: "generator", generator: "grid-histogram", shape: [40], origin: [0], spacing: [0.25], density: { components: [{ mean: [5], scale: 1.5 }] }, ...keep };
  }
}

function originTemplate(origin: string, from: DataSettings): Record<string, unknown> {
  if (origin === "generator") return generatorTemplate("gaussian-mixture", from);
  const keep: Record<string, unknown> = {};
  for (const key of ["seed", "subsample"]) if ((from as Record<string, unknown>)[key] !== undefined) keep[key] = (from as Record<string, unknown>)[key];
  if (origin === "file") return { from: "file", path: "points.csv", ...keep };
  return { from: "inline", points: [[0, 0], [1, 0], [0, 1]], ...keep };
}

function componentFields(context: CellFormContext, components: readonly MixtureComponentSettings[], path: string): HTMLElement {
  const box = el("div", { class: "cp-components" });
  components.forEach((component, i) => {
    const at = `${path}.${i}`;
    const scaleIsList = Array.isArray(component.scale);
    const group = fieldGroup(
      `Component ${i + 1}`,
      numberOrLinkField({
        label: "Weight",
        key: `${at}.weight`,
        value: component.weight,
        optional: true,
        placeholder: "1",
        linkable: linkableNames(context),
        valueOf: context.valueOf,
        commit: (v) => context.set([...path.split("."), i, "weight"], v, "component weight"),
      }),
      numberListField({ label: "Mean", key: `${at}.mean`, value: component.mean, commit: (v) => context.set([...path.split("."), i, "mean"], v, "component mean") }),
      component.covariance !== undefined
        ? textField({
            label: "Covariance (JSON rows)",
            key: `${at}.covariance`,
            value: JSON.stringify(component.covariance),
            mono: true,
            commit: (v) => {
              try {
                return context.set([...path.split("."), i, "covariance"], JSON.parse(String(v)), "component covariance");
              } catch {
                return "write the rows as JSON, e.g. [[1, 0], [0, 1]]";
              }
            },
          })
        : scaleIsList
          ? numberListField({ label: "Spread per axis", key: `${at}.scale`, value: component.scale as readonly number[], commit: (v) => context.set([...path.split("."), i, "scale"], v, "component spread") })
          : numberOrLinkField({
              label: "Spread (standard deviation)",
              key: `${at}.scale`,
              value: component.scale as NumberOrParam | undefined,
              optional: true,
              placeholder: "1",
              linkable: linkableNames(context),
              valueOf: context.valueOf,
              commit: (v) => context.set([...path.split("."), i, "scale"], v, "component spread"),
            }),
    );
    if (components.length > 1) {
      group.append(
        el("button", {
          type: "button",
          class: "cp-link-button",
          text: `Remove component ${i + 1}`,
          on: { click: () => void context.set(path.split("."), components.filter((_, k) => k !== i), "remove component") },
        }),
      );
    }
    box.append(group);
  });
  box.append(
    el("button", {
      type: "button",
      class: "cp-link-button",
      text: "Add a component",
      on: {
        click: () => {
          const d = components[0]?.mean.length ?? 2;
          void context.set(path.split("."), [...components, { mean: new Array(d).fill(1), scale: 0.5 }], "add component");
        },
      },
    }),
  );
  return box;
}

function seedFields(context: CellFormContext, seed: unknown): HTMLElement {
  const mode = seed === undefined || seed === "study" ? "study" : isParamRef(seed) ? "link" : "fixed";
  const group = fieldGroup(
    "Randomness",
    selectField({
      label: "Seed",
      key: "seed.mode",
      value: mode === "link" ? `link:${(seed as { param: string }).param}` : mode,
      choices: [
        { value: "study", label: "from the study seed and this cell" },
        { value: "fixed", label: "a fixed number" },
        ...context.names("parameter").map((n) => ({ value: `link:${n}`, label: `from ${n}` })),
      ],
      commit: (v) => {
        const choice = String(v);
        if (choice === "study") return context.set("seed", undefined, "seed from study");
        if (choice === "fixed") return context.set("seed", typeof seed === "number" ? seed : 1, "fixed seed");
        if (choice.startsWith("link:")) return context.set("seed", { param: choice.slice(5) }, "seed linked");
        return undefined;
      },
    }),
  );
  if (mode === "fixed") {
    const field = numberField({ label: "Seed number", key: "seed.value", value: seed as number, integer: true, commit: (v) => context.set("seed", v, "seed") });
    field.row.querySelector(".cp-field-control")?.append(
      el("button", {
        type: "button",
        class: "cp-small-button",
        text: "New draw",
        "aria-label": "Draw a new seed",
        on: { click: () => void context.set("seed", drawSeed(), "new seed") },
      }),
    );
    group.append(field.row);
  }
  return group;
}

/** Rows of numbers, one point per line, coordinates separated by commas or spaces. */
function pointsText(points: readonly (readonly number[])[]): string {
  return points.map((row) => row.join(", ")).join("\n");
}

/**
 * The settings form of a data cell: where the points come from (a generator, a
 * file beside the study, or points written here), the generator's fields (count,
 * mixture components, box corners, ring radius and noise, moon noise, grid shape),
 * the file's path, format, columns and mass column, inline points and masses,
 * an optional subsample, and the seed (from the study seed, fixed with a
 * "new draw" button, or linked to a parameter).
 */
export function dataForm(context: CellFormContext): HTMLElement {
  const s = context.cell.settings as DataSettings;
  const form = el("div", { class: "cp-form cp-form-data" });
  const origin = selectField({
    label: "Points come from",
    key: "from",
    value: s.from,
    choices: DATA_ORIGINS.map((o) => ({ value: o, label: o === "generator" ? "a generator (synthetic)" : o === "file" ? "a file beside the study" : "points written here" })),
    commit: (v) => context.replace(originTemplate(String(v), s), `data from ${v}`),
  });
  const main = fieldGroup("Origin", origin);
  form.append(main);
  const linkable = linkableNames(context);
  if (s.from === "generator") {
    main.append(
      selectField({
        label: "Generator",
        key: "generator",
        value: s.generator,
        choices: GENERATOR_NAMES.map((g) => ({ value: g, label: GENERATOR_WORDS[g] })),
        commit: (v) => context.replace(generatorTemplate(String(v), s), `generator ${v}`),
      }).row,
    );
    if (s.generator !== "grid-histogram") {
      main.append(
        numberOrLinkField({ label: "Points (n)", key: "n", value: s.n, integer: true, linkable, valueOf: context.valueOf, commit: (v) => context.set("n", v, "number of points") }).row,
      );
    }
    switch (s.generator) {
      case "gaussian-mixture":
        form.append(componentFields(context, s.components, "components"));
        break;
      case "uniform-box":
        form.append(
          fieldGroup(
            "Box",
            numberListField({ label: "Lower corner", key: "lower", value: s.lower, commit: (v) => context.set("lower", v, "box lower corner") }),
            numberListField({ label: "Upper corner", key: "upper", value: s.upper, commit: (v) => context.set("upper", v, "box upper corner") }),
          ),
        );
        break;
      case "ring":
        form.append(
          fieldGroup(
            "Ring",
            numberListField({ label: "Centre", key: "center", value: s.center, optional: true, placeholder: "0, 0", commit: (v) => context.set("center", v, "ring centre") }),
            numberOrLinkField({ label: "Radius", key: "radius", value: s.radius, optional: true, placeholder: "1", linkable, valueOf: context.valueOf, commit: (v) => context.set("radius", v, "ring radius") }),
            numberOrLinkField({ label: "Noise", key: "noise", value: s.noise, optional: true, placeholder: "0", linkable, valueOf: context.valueOf, commit: (v) => context.set("noise", v, "ring noise") }),
          ),
        );
        break;
      case "two-moons":
        form.append(
          fieldGroup(
            "Moons",
            numberOrLinkField({ label: "Noise", key: "noise", value: s.noise, optional: true, placeholder: "0", linkable, valueOf: context.valueOf, commit: (v) => context.set("noise", v, "moon noise") }),
          ),
        );
        break;
      case "grid-histogram": {
        const grid = fieldGroup(
          "Grid",
          numberListField({ label: "Shape (cells per axis)", key: "shape", value: s.shape, commit: (v) => context.set("shape", v, "grid shape") }),
          numberListField({ label: "Origin (centre of the first cell)", key: "origin", value: s.origin, optional: true, placeholder: "0 per axis", commit: (v) => context.set("origin", v, "grid origin") }),
          numberListField({ label: "Spacing", key: "spacing", value: s.spacing, optional: true, placeholder: "1 per axis", commit: (v) => context.set("spacing", v, "grid spacing") }),
        );
        form.append(grid);
        const density = s.density;
        if ("components" in density && Array.isArray(density.components)) form.append(componentFields(context, density.components, "density.components"));
        else if ("values" in density && Array.isArray(density.values)) {
          grid.append(numberListField({ label: "Mass per cell (row-major)", key: "density.values", value: density.values, commit: (v) => context.set("density.values", v, "grid masses") }).row);
        } else if ("cell" in density) {
          grid.append(selectField({ label: "Density from", key: "density.cell", value: String(density.cell), choices: context.names("code").map((n) => ({ value: n, label: n })), commit: (v) => context.set("density.cell", v, "grid density cell") }).row);
        }
        break;
      }
    }
  } else if (s.from === "file") {
    main.append(
      textField({ label: "Path (relative to the study's folder)", key: "path", value: s.path, mono: true, commit: (v) => context.set("path", v, "data file path") }).row,
      selectField({
        label: "Format",
        key: "format",
        value: s.format ?? "auto",
        choices: [{ value: "auto", label: "from the extension" }, ...DATA_FILE_FORMATS.map((f) => ({ value: f, label: f.toUpperCase() }))],
        commit: (v) => context.set("format", v === "auto" ? undefined : v, "file format"),
      }).row,
      textField({
        label: "Coordinate columns",
        key: "columns",
        value: s.columns?.join(", "),
        optional: true,
        placeholder: "all but the mass column",
        mono: true,
        commit: (v) => context.set("columns", v === undefined ? undefined : String(v).split(/\s*,\s*/).filter(Boolean), "file columns"),
      }).row,
      textField({ label: "Mass column", key: "mass", value: s.mass, optional: true, placeholder: "\"mass\" if present, else equal masses", mono: true, commit: (v) => context.set("mass", v, "mass column") }).row,
    );
  } else {
    main.append(
      textField({
        label: "Points (one per line)",
        key: "points",
        value: pointsText(s.points),
        multiline: true,
        mono: true,
        commit: (v) => {
          const rows = String(v)
            .split("\n")
            .map((line) => line.trim())
            .filter(Boolean)
            .map((line) => line.split(/[\s,;]+/).map(Number));
          if (rows.some((r) => r.some((x) => !Number.isFinite(x)))) return "every coordinate must be a number";
          return context.set("points", rows, "inline points");
        },
      }).row,
      numberListField({ label: "Masses", key: "mass", value: s.mass, optional: true, placeholder: "equal masses", commit: (v) => context.set("mass", v, "inline masses") }).row,
    );
  }
  const sub = fieldGroup(
    "Subsample",
    checkField({
      label: "keep only some points, drawn without replacement",
      key: "subsample.on",
      checked: s.subsample !== undefined,
      commit: (v) => context.set("subsample", v ? 100 : undefined, v ? "subsample on" : "subsample off"),
    }),
    s.subsample !== undefined
      ? numberOrLinkField({ label: "Points kept", key: "subsample", value: s.subsample, integer: true, linkable, valueOf: context.valueOf, commit: (v) => context.set("subsample", v, "subsample size") })
      : null,
  );
  form.append(sub);
  const random = (s.from === "generator" && s.generator !== "grid-histogram") || s.subsample !== undefined;
  if (random) form.append(seedFields(context, s.seed));
  return form;
}
