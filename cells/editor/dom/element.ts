/** Attributes and properties accepted by {@link el}. */
export type ElementProps = {
  /** CSS classes, space separated. */
  class?: string;
  /** Text content (escaped by the DOM). */
  text?: string;
  /** Event listeners by event name without "on": `{click: () => …}`. */
  on?: { [event: string]: (event: Event) => void };
  /** Inline style properties. */
  style?: Partial<Record<string, string>>;
  /** DOM properties set directly (value, checked, disabled, …). */
  props?: Record<string, unknown>;
} & { [attribute: string]: string | number | boolean | undefined | null | object };

/** A child of {@link el}: a node, text, or nothing (skipped). */
export type Child = Node | string | number | null | undefined | false;

/**
 * Creates an element: `el("button", {class: "cp-small", "aria-label": "Delete"}, "✕")`.
 * Attributes with value `false`, null or undefined are left out, `true` gives an
 * empty attribute. Text is always inserted as text nodes, never parsed as HTML.
 */
export function el<K extends keyof HTMLElementTagNameMap>(tag: K, props: ElementProps = {}, ...children: Child[]): HTMLElementTagNameMap[K] {
  const node = document.createElement(tag);
  for (const [key, value] of Object.entries(props)) {
    if (value === undefined || value === null || value === false) continue;
    if (key === "class") node.className = String(value);
    else if (key === "text") node.textContent = String(value);
    else if (key === "on") for (const [event, listener] of Object.entries(value as Record<string, (e: Event) => void>)) node.addEventListener(event, listener);
    else if (key === "style") Object.assign(node.style, value);
    else if (key === "props") Object.assign(node, value);
    else node.setAttribute(key, value === true ? "" : String(value));
  }
  append(node, children);
  return node;
}

/** Appends children (text as text nodes; null, undefined and false skipped). */
export function append(parent: Node, children: readonly Child[]): void {
  for (const child of children) {
    if (child === null || child === undefined || child === false) continue;
    parent.appendChild(typeof child === "string" || typeof child === "number" ? document.createTextNode(String(child)) : child);
  }
}

/** Replaces all children of `parent`. */
export function replaceChildren(parent: Element, ...children: Child[]): void {
  parent.textContent = "";
  append(parent, children);
}

let counter = 0;

/** A document-unique id for label/field pairs: `cp-<prefix>-<n>`. */
export function uniqueId(prefix: string): string {
  counter += 1;
  return `cp-${prefix}-${counter}`;
}
