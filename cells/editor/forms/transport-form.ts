import { type NumberOrParam, isParamRef } from "../../document";
import {
  ENTROPIC_DOMAINS,
  EXACT_ALGORITHMS,
  type EpsilonSetting,
  type MassPenaltySetting,
  type PenaltySetting,
  SCALE_REFERENCES,
  TRANSPORT_DEFAULTS,
  TRANSPORT_METHODS,
  type TransportSettings,
} from "../../kinds/transport/settings";
import { el, uniqueId } from "../dom/element";
import { type Field, checkField, fieldGroup, numberField, numberOrLinkField, selectField } from "./fields";
import { type CellFormContext, linkableNames } from "./form-context";

const METHOD_WORDS: Record<string, string> = {
  exact: "exact — unregularised optimal transport",
  entropic: "entropic — Sinkhorn, value includes ε·KL",
  unbalanced: "unbalanced — mass may be created or destroyed at a KL price",
  debiased: "debiased — Sinkhorn divergence S_ε (a proper comparison)",
};

const COST_WORDS: Record<string, string> = {
  sqeuclidean: "|x − y|² (squared Euclidean)",
  euclidean: "|x − y| (Euclidean)",
  power: "|x − y|^p (power p)",
  matrix: "a matrix from another cell",
};

const REFERENCE_WORDS: Record<string, string> = { max: "× largest cost", median: "× median cost", mean: "× mean cost" };

/** The method choice as radio buttons (four short options read better than a drop-down). */
function methodChooser(context: CellFormContext, settings: TransportSettings): HTMLElement {
  const name = uniqueId("method");
  const group = el("fieldset", { class: "cp-group cp-methods", "data-field": "method" }, el("legend", { text: "Formulation" }));
  const problem = el("p", { class: "cp-field-problem", role: "alert", hidden: true });
  for (const method of TRANSPORT_METHODS) {
    const id = uniqueId("m");
    const input = el("input", { type: "radio", name, id, value: method, checked: settings.method === method });
    input.addEventListener("change", () => {
      if (!input.checked) return;
      const changes: [string, unknown][] = [["method", method]];
      // Methods that need settings the cell lacks get sensible ones, so the switch is one step.
      if (method !== "exact" && settings.epsilon === undefined) changes.push(["epsilon", { relative: 0.05, reference: "median" }]);
      if (method === "unbalanced" && settings.massPenalty === undefined) changes.push(["massPenalty", 1]);
      const next: Record<string, unknown> = { ...settings };
      for (const [key, value] of changes) next[key] = value;
      const message = changes.length === 1 ? context.set("method", method, `method ${method}`) : context.replace(next, `method ${method}`);
      problem.hidden = message === undefined;
      problem.textContent = message ?? "";
    });
    const [head, ...rest] = METHOD_WORDS[method].split(" — ");
    group.append(el("div", { class: "cp-radio" }, input, el("label", { for: id }, el("strong", { text: head }), rest.length ? ` — ${rest.join(" — ")}` : "")));
  }
  group.append(problem);
  return group;
}

function epsilonFields(context: CellFormContext, epsilon: EpsilonSetting | undefined, path: string, legend: string): HTMLElement {
  const relative = epsilon === undefined || "relative" in epsilon;
  const value = epsilon === undefined ? undefined : "relative" in epsilon ? (epsilon.relative as NumberOrParam) : (epsilon.absolute as NumberOrParam);
  const reference = String(epsilon && "relative" in epsilon ? (epsilon.reference ?? TRANSPORT_DEFAULTS.reference) : TRANSPORT_DEFAULTS.reference);
  const mode = selectField({
    label: "Given as",
    key: `${path}.mode`,
    value: relative ? "relative" : "absolute",
    choices: [
      { value: "relative", label: "relative to the cost scale" },
      { value: "absolute", label: "absolute, in cost units" },
    ],
    commit: (v) => {
      const number = value ?? 0.05;
      const next = v === "relative" ? { relative: number, reference } : { absolute: number };
      return context.set(path, next, `${legend} given ${v}`);
    },
  });
  const amount = numberOrLinkField({
    label: relative ? "Multiple" : "Value",
    key: `${path}.value`,
    value,
    linkable: linkableNames(context),
    valueOf: context.valueOf,
    hint: relative ? "ε = this × the chosen cost statistic; 0.01–0.1 is a usual range" : "ε in the units of the cost",
    commit: (v) => context.set(`${path}.${relative ? "relative" : "absolute"}`, v, `set ${legend}`),
  });
  const fields: (Field | null)[] = [mode, amount];
  if (relative) {
    fields.push(
      selectField({
        label: "Cost statistic",
        key: `${path}.reference`,
        value: reference,
        choices: SCALE_REFERENCES.map((r) => ({ value: r, label: REFERENCE_WORDS[r] })),
        commit: (v) => context.set(`${path}.reference`, v, `${legend} reference ${v}`),
      }),
    );
  }
  return fieldGroup(legend, ...fields);
}

function penaltyField(context: CellFormContext, value: PenaltySetting | undefined, path: string, label: string): HTMLElement {
  const balanced = value === "balanced";
  const id = uniqueId("bal");
  const check = el("input", { type: "checkbox", id, class: "cp-check", checked: balanced });
  const number = numberOrLinkField({
    label: `${label}: penalty ρ`,
    key: `${path}.rho`,
    value: balanced ? undefined : (value as NumberOrParam | undefined),
    linkable: linkableNames(context),
    valueOf: context.valueOf,
    placeholder: balanced ? "∞" : "",
    hint: "KL price of changing mass on this side; larger keeps the marginal closer",
    commit: (v) => context.set(path, v, `set ${label} penalty`),
  });
  const problem = el("p", { class: "cp-field-problem", role: "alert", hidden: true });
  check.addEventListener("change", () => {
    const message = context.set(path, check.checked ? "balanced" : 1, check.checked ? `${label} balanced` : `${label} penalised`);
    problem.hidden = message === undefined;
    problem.textContent = message ?? "";
  });
  const box = el(
    "div",
    { class: "cp-penalty", "data-field": `${path}.balanced` },
    el("div", { class: "cp-field cp-field-check" }, el("div", { class: "cp-field-control" }, check, el("label", { for: id, text: `${label}: balanced (mass kept exactly, ρ = ∞)` }))),
    problem,
  );
  if (!balanced) box.append(number.row);
  return box;
}

function massPenaltyFields(context: CellFormContext, settings: TransportSettings): HTMLElement {
  const mp = settings.massPenalty;
  const perSide = typeof mp === "object" && mp !== null && !isParamRef(mp);
  const sides = perSide ? (mp as { source: PenaltySetting; target: PenaltySetting }) : undefined;
  const shape = selectField({
    label: "Applies to",
    key: "massPenalty.shape",
    value: perSide ? "sides" : "both",
    choices: [
      { value: "both", label: "both sides alike" },
      { value: "sides", label: "each side on its own" },
    ],
    commit: (v) => {
      const one = (perSide ? sides!.source : (mp as PenaltySetting | undefined)) ?? 1;
      const next: MassPenaltySetting = v === "sides" ? { source: one, target: one } : one;
      return context.set("massPenalty", next, "mass penalty sides");
    },
  });
  const optional = settings.method === "debiased";
  const group = fieldGroup(
    optional ? "Mass penalty (optional: makes the divergence unbalanced)" : "Mass penalty",
    optional && mp !== undefined
      ? checkField({ label: "use a mass penalty", key: "massPenalty.on", checked: true, commit: () => context.set("massPenalty", undefined, "no mass penalty") })
      : null,
    optional && mp === undefined
      ? checkField({ label: "use a mass penalty", key: "massPenalty.on", checked: false, commit: () => context.set("massPenalty", 1, "mass penalty on") })
      : null,
  );
  if (mp === undefined && optional) return group;
  group.append(shape.row);
  if (perSide) {
    group.append(penaltyField(context, sides!.source, "massPenalty.source", "Source"));
    group.append(penaltyField(context, sides!.target, "massPenalty.target", "Target"));
  } else group.append(penaltyField(context, mp as PenaltySetting | undefined, "massPenalty", "Both sides"));
  return group;
}

/**
 * The settings form of a transport cell: the two measures, the cost, the
 * formulation, epsilon (absolute, or relative to max/median/mean cost), mass
 * penalties (one for both sides or per side, each a number, a link or balanced),
 * tolerance, iteration cap, epsilon schedule, warm start, and the algorithm or
 * computation domain. Fields another method would use stay in the file (and come
 * back when the method does) but are not shown.
 */
export function transportForm(context: CellFormContext): HTMLElement {
  const settings = context.cell.settings as TransportSettings;
  const data = context.names("data");
  const measures = data.map((n) => ({ value: n, label: n }));
  const form = el("div", { class: "cp-form cp-form-transport" });
  form.append(
    fieldGroup(
      "Measures",
      selectField({ label: "Source", key: "source", value: settings.source, choices: measures, commit: (v) => context.set("source", v, "source measure") }),
      selectField({ label: "Target", key: "target", value: settings.target, choices: measures, commit: (v) => context.set("target", v, "target measure") }),
      checkField({
        label: "Rescale both to total mass 1 (compare shapes only)",
        key: "normalize",
        checked: settings.normalize === true,
        hint: "lets a balanced method run on measures whose totals differ",
        commit: (v) => context.set("normalize", v ? true : undefined, v ? "normalise masses" : "keep masses"),
      }),
    ),
  );
  form.append(methodChooser(context, settings));
  const cost = settings.cost ?? TRANSPORT_DEFAULTS.cost;
  form.append(
    fieldGroup(
      "Ground cost",
      selectField({
        label: "Cost",
        key: "cost.kind",
        value: cost.kind,
        choices: Object.entries(COST_WORDS).map(([value, label]) => ({ value, label })),
        commit: (v) => context.set("cost", v === "power" ? { kind: v, p: 1.5 } : v === "matrix" ? { kind: v, cell: context.names("code")[0] ?? "costMatrix" } : { kind: v }, `cost ${v}`),
      }),
      cost.kind === "power"
        ? numberOrLinkField({ label: "Exponent p", key: "cost.p", value: cost.p as NumberOrParam, linkable: linkableNames(context), valueOf: context.valueOf, commit: (v) => context.set("cost.p", v, "cost exponent") })
        : null,
      cost.kind === "matrix"
        ? selectField({ label: "Matrix from", key: "cost.cell", value: cost.cell as string, choices: context.names("code").map((n) => ({ value: n, label: n })), commit: (v) => context.set("cost.cell", v, "cost matrix cell") })
        : null,
    ),
  );
  if (settings.method !== "exact") form.append(epsilonFields(context, settings.epsilon, "epsilon", "Epsilon"));
  if (settings.method === "unbalanced" || settings.method === "debiased") form.append(massPenaltyFields(context, settings));

  const stop = fieldGroup(
    "Stopping",
    numberOrLinkField({
      label: "Tolerance",
      key: "tolerance",
      value: settings.tolerance,
      optional: true,
      placeholder: String(TRANSPORT_DEFAULTS.tolerance),
      linkable: linkableNames(context),
      valueOf: context.valueOf,
      hint: "stop when the relative marginal error is at most this",
      commit: (v) => context.set("tolerance", v, "tolerance"),
    }),
    numberOrLinkField({
      label: "Iteration cap",
      key: "maxIterations",
      value: settings.maxIterations,
      optional: true,
      integer: true,
      placeholder: String(TRANSPORT_DEFAULTS.maxIterations),
      linkable: linkableNames(context),
      valueOf: context.valueOf,
      hint: "reaching it is reported as not converged",
      commit: (v) => context.set("maxIterations", v, "iteration cap"),
    }),
  );
  if (settings.method !== "exact") {
    const schedule = settings.schedule;
    const on = schedule === true || (typeof schedule === "object" && schedule !== null);
    stop.append(
      checkField({
        label: "Epsilon schedule: start large and shrink to ε",
        key: "schedule.on",
        checked: on,
        commit: (v) => context.set("schedule", v ? true : undefined, v ? "schedule on" : "schedule off"),
      }).row,
    );
    if (on) {
      const factor = typeof schedule === "object" && schedule !== null ? schedule.factor : undefined;
      stop.append(
        numberField({
          label: "Shrink factor per stage",
          key: "schedule.factor",
          value: factor,
          optional: true,
          placeholder: "solver default",
          hint: "0 < factor < 1; the start is the largest cost unless the file says otherwise",
          commit: (v) => context.set("schedule", v === undefined ? (typeof schedule === "object" && schedule.start ? { start: schedule.start } : true) : { ...(typeof schedule === "object" ? schedule : {}), factor: v }, "schedule factor"),
        }).row,
      );
    }
    stop.append(
      checkField({
        label: "Warm start from this cell's previous potentials",
        key: "warmStart",
        checked: settings.warmStart === true,
        commit: (v) => context.set("warmStart", v ? true : undefined, v ? "warm start on" : "warm start off"),
      }).row,
    );
    stop.append(
      selectField({
        label: "Computation",
        key: "domain",
        value: settings.domain ?? "auto",
        choices: ENTROPIC_DOMAINS.map((d) => ({ value: d, label: d === "auto" ? "automatic (kernel when safe)" : d === "log" ? "log domain (stable)" : "kernel (fast, may underflow)" })),
        commit: (v) => context.set("domain", v === "auto" ? undefined : v, `computation ${v}`),
      }).row,
    );
  } else {
    stop.append(
      selectField({
        label: "Algorithm",
        key: "exactAlgorithm",
        value: settings.exactAlgorithm ?? "auto",
        choices: EXACT_ALGORITHMS.map((a) => ({ value: a, label: a === "auto" ? "automatic" : a })),
        commit: (v) => context.set("exactAlgorithm", v === "auto" ? undefined : v, `algorithm ${v}`),
      }).row,
    );
  }
  form.append(stop);
  return form;
}
