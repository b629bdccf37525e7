import { el } from "../dom/element";

/** How a notice looks: a caution (amber), a failure (brick) or plain information. */
export type NoticeTone = "caution" | "failure" | "info";

/** One action offered by a notice. */
export interface NoticeAction {
  readonly label: string;
  readonly run: () => void;
  /** The main choice is drawn stronger. */
  readonly primary?: boolean;
  readonly testid?: string;
}

/** A notice to show at the top of the page. */
export interface Notice {
  /** Stable key: showing a notice with the same key replaces the old one. */
  readonly key: string;
  readonly tone: NoticeTone;
  readonly title: string;
  readonly text?: string;
  readonly actions?: readonly NoticeAction[];
  /** Shows a "Dismiss" button. */
  readonly dismissible?: boolean;
}

/**
 * The band of notices under the masthead: trust, save problems, conflicts,
 * drafts, deletions to undo. Each is a region with its own heading, so a screen
 * reader can list them; failures are announced at once (role alert), the rest
 * politely.
 */
export class NoticeBand {
  readonly root: HTMLElement;
  private readonly shown = new Map<string, HTMLElement>();

  constructor() {
    this.root = el("div", { class: "cp-notices", "data-testid": "notices" });
  }

  /** Shows (or replaces) a notice. */
  show(notice: Notice): void {
    const actions = el("div", { class: "cp-notice-actions" });
    for (const action of notice.actions ?? []) {
      actions.append(el("button", { type: "button", class: action.primary ? "cp-button cp-button-primary" : "cp-button", text: action.label, "data-testid": action.testid ?? "", on: { click: action.run } }));
    }
    if (notice.dismissible) actions.append(el("button", { type: "button", class: "cp-button cp-button-quiet", text: "Dismiss", on: { click: () => this.hide(notice.key) } }));
    const box = el(
      "section",
      { class: `cp-notice cp-notice-${notice.tone}`, role: notice.tone === "failure" ? "alert" : "status", "data-notice": notice.key, "data-testid": `notice-${notice.key}`, "aria-label": notice.title },
      el("p", { class: "cp-notice-title", text: notice.title }),
      notice.text ? el("p", { class: "cp-notice-text", text: notice.text }) : null,
      actions.childElementCount > 0 ? actions : null,
    );
    const old = this.shown.get(notice.key);
    if (old) old.replaceWith(box);
    else this.root.append(box);
    this.shown.set(notice.key, box);
  }

  /** Removes the notice with `key`, if shown. */
  hide(key: string): void {
    this.shown.get(key)?.remove();
    this.shown.delete(key);
  }

  has(key: string): boolean {
    return this.shown.has(key);
  }

  /** The first button of a notice, to move focus to it. */
  firstAction(key: string): HTMLButtonElement | null {
    return this.shown.get(key)?.querySelector("button") ?? null;
  }
}
