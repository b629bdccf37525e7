import { el } from "../dom/element";

/** One keyboard shortcut, as the help dialog and docs/editor.md list it. */
export interface Shortcut {
  readonly keys: string;
  readonly does: string;
  /** Where it works. */
  readonly where: "anywhere" | "on a cell" | "in a text editor" | "in a menu";
}

/** Every shortcut of the editor. Ctrl means Cmd on a Mac. */
export const SHORTCUTS: readonly Shortcut[] = [
  { keys: "Ctrl+S", does: "save now", where: "anywhere" },
  { keys: "Ctrl+Z", does: "undo the last change to the study", where: "anywhere" },
  { keys: "Ctrl+Shift+Z or Ctrl+Y", does: "redo", where: "anywhere" },
  { keys: "F6", does: "move between the masthead, the cells and the control desk", where: "anywhere" },
  { keys: "Ctrl+/", does: "show this list", where: "anywhere" },
  { keys: "↑ / ↓", does: "go to the previous / next cell", where: "on a cell" },
  { keys: "Enter", does: "open the cell: edit its text or code, or its first setting", where: "on a cell" },
  { keys: "Alt+↑ / Alt+↓", does: "move the cell up / down", where: "on a cell" },
  { keys: "Alt+Shift+↓", does: "duplicate the cell", where: "on a cell" },
  { keys: "Alt+N", does: "insert a cell below (choose its kind)", where: "on a cell" },
  { keys: "Alt+Delete", does: "delete the cell (undo brings it back)", where: "on a cell" },
  { keys: "Escape", does: "leave the editor or field, back to its cell", where: "in a text editor" },
  { keys: "Ctrl+Enter", does: "run the code / apply the text", where: "in a text editor" },
  { keys: "Ctrl+Z", does: "undo typing inside the editor", where: "in a text editor" },
  { keys: "Escape, then Tab", does: "leave a code editor by Tab (Tab alone indents)", where: "in a text editor" },
  { keys: "↑ / ↓, Enter, Escape", does: "choose a kind of cell, or close", where: "in a menu" },
];

/** The keyboard help as a modal dialog; returns it (call showModal()). */
export function shortcutsDialog(): HTMLDialogElement {
  const rows = SHORTCUTS.map((s) => el("tr", {}, el("td", {}, el("kbd", { text: s.keys })), el("td", { text: s.does }), el("td", { class: "cp-muted", text: s.where })));
  const dialog: HTMLDialogElement = el(
    "dialog",
    { class: "cp-dialog", "aria-labelledby": "cp-keys-title", "data-testid": "keys-dialog" },
    el("h2", { id: "cp-keys-title", text: "Keyboard" }),
    el("p", { class: "cp-muted", text: "Ctrl means Cmd on a Mac. Every action also has a button; Tab reaches all of them." }),
    el("table", { class: "cp-table cp-keys" }, el("thead", {}, el("tr", {}, el("th", { scope: "col", text: "Keys" }), el("th", { scope: "col", text: "Does" }), el("th", { scope: "col", text: "Where" }))), el("tbody", {}, ...rows)),
    el("div", { class: "cp-row" }, el("button", { type: "button", class: "cp-button cp-button-primary", text: "Close", on: { click: () => dialog.close() } })),
  );
  return dialog;
}
