import { CELL_KIND_NAMES, type CellKindName } from "../../document";
import { el } from "../dom/element";

/** Each kind in one line, as the insert menu offers it. */
export const KIND_OFFERS: Readonly<Record<CellKindName, string>> = {
  prose: "Text — Markdown with live values",
  parameter: "Parameter — a control at the desk",
  data: "Data — points from a generator, a file or typed here",
  transport: "Transport — one problem between two data cells",
  sweep: "Sweep — one setting over a range of values",
  figure: "Figure — coupling lines, plan, convergence, potentials, sweep curve",
  code: "Code — JavaScript with other cells in scope",
  table: "Table — rows from a cell or typed here",
};

/**
 * A small menu of cell kinds that opens at `anchor`. Arrow keys move, Enter or a
 * click picks, Escape (or a click elsewhere) closes and gives focus back to `anchor`.
 * Calls `pick(kind)` with the chosen kind.
 */
export function openInsertMenu(anchor: HTMLElement, pick: (kind: CellKindName) => void): void {
  document.querySelector(".cp-insert-menu")?.remove();
  const items = CELL_KIND_NAMES.map((kind) => {
    const [head, rest] = KIND_OFFERS[kind].split(" — ");
    return el("button", { type: "button", role: "menuitem", class: "cp-menu-item", "data-kind": kind, "data-testid": `insert-${kind}`, tabindex: -1 }, el("strong", { text: head }), el("span", { text: rest }));
  });
  const menu = el("div", { class: "cp-insert-menu", role: "menu", "aria-label": "Kind of cell to insert", "data-testid": "insert-menu" }, ...items);
  const close = (refocus: boolean) => {
    menu.remove();
    document.removeEventListener("pointerdown", outside, true);
    if (refocus) anchor.focus();
  };
  const outside = (event: Event) => {
    if (!menu.contains(event.target as Node)) close(false);
  };
  items.forEach((item, k) => {
    item.addEventListener("click", () => {
      close(false);
      pick(CELL_KIND_NAMES[k]);
    });
  });
  menu.addEventListener("keydown", (event) => {
    const k = items.indexOf(document.activeElement as HTMLButtonElement);
    if (event.key === "ArrowDown" || event.key === "ArrowUp") {
      event.preventDefault();
      items[(k + (event.key === "ArrowDown" ? 1 : -1) + items.length) % items.length].focus();
    } else if (event.key === "Home" || event.key === "End") {
      event.preventDefault();
      items[event.key === "Home" ? 0 : items.length - 1].focus();
    } else if (event.key === "Escape" || event.key === "Tab") {
      event.preventDefault();
      event.stopPropagation();
      close(true);
    }
  });
  const box = anchor.getBoundingClientRect();
  menu.style.top = `${Math.round(box.bottom + window.scrollY + 4)}px`;
  menu.style.left = `${Math.round(Math.max(8, Math.min(box.left + window.scrollX, window.scrollX + document.documentElement.clientWidth - 360)))}px`;
  document.body.append(menu);
  document.addEventListener("pointerdown", outside, true);
  items[0].focus();
}
