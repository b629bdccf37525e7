import { closeBrackets, closeBracketsKeymap } from "@codemirror/autocomplete";
import { defaultKeymap, history, historyKeymap, indentWithTab } from "@codemirror/commands";
import { javascript } from "@codemirror/lang-javascript";
import { markdown } from "@codemirror/lang-markdown";
import { HighlightStyle, bracketMatching, indentOnInput, syntaxHighlighting } from "@codemirror/language";
import { EditorState, type Extension, Transaction } from "@codemirror/state";
import { EditorView, drawSelection, keymap, lineNumbers, placeholder as placeholderText } from "@codemirror/view";
import { tags } from "@lezer/highlight";
import { FONT_MONO, INK, MUTED, SOURCE_COLOR, TARGET_COLOR } from "../../views/theme";

/** Options of {@link createTextEditor}. */
export interface TextEditorOptions {
  /** JavaScript (code cells, code figures) or Markdown (prose). */
  readonly language: "javascript" | "markdown";
  readonly text: string;
  /** Accessible name of the text area, e.g. "Code of cell plan". */
  readonly label: string;
  /** Called with the text on Ctrl/Cmd+Enter and when the editor loses focus with changes. */
  readonly onCommit: (text: string) => void;
  /** Called after each change (typing), with the text. */
  readonly onInput?: (text: string) => void;
  /** Escape: leave the editor (the cell takes focus back). */
  readonly onLeave?: () => void;
  /** Text shown while empty. */
  readonly placeholder?: string;
}

/** A CodeMirror 6 text editor for one cell. */
export interface TextEditor {
  /** The editor's element, to place in the cell. */
  readonly dom: HTMLElement;
  /** The current text. */
  text(): string;
  /**
   * Replaces the text when it differs (undo/redo of the study, a reload), keeping
   * the cursor where it can; not added to the editor's own undo history.
   */
  setText(text: string): void;
  focus(): void;
  destroy(): void;
}

// Our own colours for code: lake blue for keywords, terracotta for literals, muted comments.
const highlight = HighlightStyle.define([
  { tag: [tags.keyword, tags.controlKeyword, tags.operatorKeyword, tags.modifier], color: SOURCE_COLOR, fontWeight: "600" },
  { tag: [tags.string, tags.special(tags.string), tags.regexp], color: "#8a4a21" },
  { tag: [tags.number, tags.bool, tags.null, tags.atom], color: TARGET_COLOR },
  { tag: [tags.comment, tags.lineComment, tags.blockComment], color: MUTED, fontStyle: "italic" },
  { tag: [tags.definition(tags.variableName), tags.function(tags.variableName)], color: "#2f5a3a" },
  { tag: [tags.propertyName], color: "#4b3f6b" },
  { tag: tags.heading, fontWeight: "700", color: INK },
  { tag: tags.emphasis, fontStyle: "italic" },
  { tag: tags.strong, fontWeight: "700" },
  { tag: [tags.link, tags.url], color: SOURCE_COLOR, textDecoration: "underline" },
  { tag: tags.monospace, fontFamily: FONT_MONO, color: "#4b3f6b" },
  { tag: tags.invalid, color: "#a8402a" },
]);

const look = EditorView.theme({
  "&": { fontSize: "13.5px", backgroundColor: "#fffdf8", border: "1px solid #d8d2c4", borderRadius: "3px" },
  "&.cm-focused": { outline: `2px solid ${SOURCE_COLOR}`, outlineOffset: "1px" },
  ".cm-content": { fontFamily: FONT_MONO, caretColor: INK, padding: "6px 0" },
  ".cm-gutters": { backgroundColor: "#f4f0e6", color: "#8b8f94", border: "none", borderRight: "1px solid #e3ddcf" },
  ".cm-activeLine": { backgroundColor: "transparent" },
  ".cm-selectionBackground, &.cm-focused .cm-selectionBackground": { backgroundColor: "#cfe0ea !important" },
  ".cm-matchingBracket": { backgroundColor: "#e7dcc2", outline: "none" },
  ".cm-placeholder": { color: "#9a9ea3" },
});

/**
 * A text editor for prose (Markdown, wrapped lines) or code (JavaScript, line
 * numbers, bracket help). Its own undo history covers typing; edits reach the
 * study on commit (Ctrl/Cmd+Enter or leaving the editor), where the study's
 * history takes over. Tab indents; Escape then Tab leaves (CodeMirror's own rule:
 * Escape makes the next Tab move focus), and `onLeave` hands focus to the cell.
 */
export function createTextEditor(options: TextEditorOptions): TextEditor {
  const { language, text, label, onCommit, onInput, onLeave, placeholder } = options;
  let committed = text;
  let applyingOutside = false;
  const commit = (view: EditorView) => {
    const now = view.state.doc.toString();
    if (now !== committed) {
      committed = now;
      onCommit(now);
    }
    return true;
  };
  const extensions: Extension[] = [
    history(),
    drawSelection(),
    indentOnInput(),
    bracketMatching(),
    closeBrackets(),
    syntaxHighlighting(highlight),
    look,
    keymap.of([
      { key: "Mod-Enter", run: commit },
      { key: "Shift-Enter", run: commit },
      {
        key: "Escape",
        run: (view) => {
          commit(view);
          onLeave?.();
          return onLeave !== undefined;
        },
      },
      ...closeBracketsKeymap,
      ...defaultKeymap,
      ...historyKeymap,
      indentWithTab,
    ]),
    EditorView.contentAttributes.of({ "aria-label": label, "aria-multiline": "true" }),
    EditorView.updateListener.of((update) => {
      if (update.docChanged && !applyingOutside) onInput?.(update.state.doc.toString());
      if (update.focusChanged && !update.view.hasFocus) commit(update.view);
    }),
    EditorView.lineWrapping,
    language === "javascript" ? [javascript(), lineNumbers()] : markdown(),
  ];
  if (placeholder) extensions.push(placeholderText(placeholder));
  const view = new EditorView({ state: EditorState.create({ doc: text, extensions }) });
  view.dom.classList.add("cp-text-editor", `cp-text-${language}`);
  return {
    dom: view.dom,
    text: () => view.state.doc.toString(),
    setText(next: string) {
      committed = next;
      const current = view.state.doc.toString();
      if (current === next) return;
      applyingOutside = true;
      const head = Math.min(view.state.selection.main.head, next.length);
      view.dispatch({ changes: { from: 0, to: current.length, insert: next }, selection: { anchor: head }, annotations: Transaction.addToHistory.of(false) });
      applyingOutside = false;
    },
    focus: () => view.focus(),
    destroy: () => view.destroy(),
  };
}
