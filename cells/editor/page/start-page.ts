import { el, replaceChildren } from "../dom/element";
import type { StudyServer } from "../save/server-api";

/**
 * The page shown when the server was opened on a folder rather than one study:
 * the studies in it (trusted ones marked) and a way to start a new one from the
 * starter study. Choosing one loads `?study=PATH`.
 */
export async function showStartPage(mount: HTMLElement, server: StudyServer, folder: string, open: (path: string) => void): Promise<void> {
  const list = el("ul", { class: "cp-study-list", "data-testid": "study-list" });
  const problem = el("p", { class: "cp-field-problem", role: "alert", hidden: true });
  const nameBox = el("input", { type: "text", class: "cp-input", id: "cp-new-name", placeholder: "my-study", autocomplete: "off", spellcheck: "false" });
  const create = async () => {
    const base = nameBox.value.trim().replace(/\.couplet\.json$/, "");
    if (!/^[\w.-][\w .-]*$/.test(base)) {
      problem.hidden = false;
      problem.textContent = "a file name: letters, digits, spaces, dots, dashes or underscores";
      return;
    }
    try {
      const made = await server.createStudy(`${base}.couplet.json`);
      open(made.path);
    } catch (error) {
      problem.hidden = false;
      problem.textContent = (error as Error).message;
    }
  };
  replaceChildren(
    mount,
    el(
      "main",
      { class: "cp-start", "aria-labelledby": "cp-start-title" },
      el("div", { class: "cp-mark cp-mark-large", "aria-hidden": "true" }, el("span", { class: "cp-mark-a" }), el("span", { class: "cp-mark-b" })),
      el("h1", { id: "cp-start-title", text: `Studies in ${folder}` }),
      list,
      el(
        "section",
        { class: "cp-start-new", "aria-label": "New study" },
        el("h2", { text: "Start a new study" }),
        el("label", { for: "cp-new-name", class: "cp-field-label", text: "File name (.couplet.json is added)" }),
        el("div", { class: "cp-row" }, nameBox, el("button", { type: "button", class: "cp-button cp-button-primary", text: "Create", on: { click: () => void create() } })),
        problem,
      ),
    ),
  );
  try {
    const files = await server.listFiles();
    if (files.studies.length === 0) list.append(el("li", { class: "cp-muted", text: "No .couplet.json files here yet." }));
    for (const study of files.studies) {
      list.append(
        el(
          "li",
          {},
          el("button", { type: "button", class: "cp-link-button", text: study.path, on: { click: () => open(study.path) } }),
          study.trusted ? el("span", { class: "cp-badge", text: "trusted" }) : null,
        ),
      );
    }
  } catch (error) {
    list.append(el("li", { class: "cp-field-problem", text: (error as Error).message }));
  }
}
