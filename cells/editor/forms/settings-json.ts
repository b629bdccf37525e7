import { el, uniqueId } from "../dom/element";
import type { CellFormContext } from "./form-context";

/**
 * Every setting of a cell as JSON, for what the forms do not show (covariance
 * matrices, fields kept for other versions, options the views keep). Applies on
 * "Apply" or Ctrl/Cmd+Enter; a refused text stays in the box with the problem.
 */
export function settingsJson(context: CellFormContext): HTMLElement {
  const id = uniqueId("json");
  const area = el("textarea", { id, class: "cp-input cp-textarea cp-mono", rows: 8, spellcheck: "false" });
  area.value = JSON.stringify(context.cell.settings, null, 2);
  const problem = el("p", { class: "cp-field-problem", role: "alert", hidden: true });
  const apply = () => {
    let value: unknown;
    try {
      value = JSON.parse(area.value);
    } catch (error) {
      problem.hidden = false;
      problem.textContent = `not JSON: ${(error as Error).message}`;
      return;
    }
    if (typeof value !== "object" || value === null || Array.isArray(value)) {
      problem.hidden = false;
      problem.textContent = "settings are one JSON object { … }";
      return;
    }
    const message = context.replace(value as Record<string, unknown>, "edit settings as JSON");
    problem.hidden = message === undefined;
    problem.textContent = message ?? "";
  };
  area.addEventListener("keydown", (event) => {
    if (event.key === "Enter" && (event.ctrlKey || event.metaKey)) {
      event.preventDefault();
      apply();
    }
  });
  return el(
    "details",
    { class: "cp-json", "data-field": "settings-json" },
    el("summary", { text: "All settings as JSON" }),
    el("label", { for: id, class: "cp-field-hint", text: "Edit, then Apply (or Ctrl+Enter). Checked like the file itself." }),
    area,
    el("div", { class: "cp-row" }, el("button", { type: "button", class: "cp-small-button", text: "Apply", on: { click: apply } })),
    problem,
  );
}
