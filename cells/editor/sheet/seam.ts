import { el } from "../dom/element";

/**
 * The thin gap between two cells (and after the last one) that offers to insert a
 * cell there. Only the button takes focus, so the column's tab order stays
 * cell, seam, cell, seam.
 */
export function seamElement(index: number, open: (anchor: HTMLElement, index: number) => void): HTMLElement {
  const button = el("button", {
    type: "button",
    class: "cp-seam-button",
    "data-testid": "insert-here",
    "aria-label": index === 0 ? "Insert a cell at the top" : "Insert a cell here",
    text: "+ insert",
  });
  button.addEventListener("click", () => open(button, index));
  return el("div", { class: "cp-seam", "data-index": index }, button);
}
