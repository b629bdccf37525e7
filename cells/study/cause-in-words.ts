import type { StudyDocument } from "../document/study-types";
import type { FailureCause } from "../runtime/cell-definition";

/** A cell's name, or its id when it has none. */
export function cellNameOf(id: string, study: StudyDocument): string {
  return study.cells.find((c) => c.id === id)?.name ?? id;
}

/**
 * A failure's cause in the words the CLI, the report and the editor share:
 * "own error", `failed input "x"`, "cycle through a, b", `unknown name "q"`,
 * `name "p" is defined twice (cells …)`. Browser-safe (no Node modules).
 */
export function causeInWords(cause: FailureCause, study: StudyDocument): string {
  switch (cause.kind) {
    case "own-error":
      return "own error";
    case "upstream":
      return `failed input "${cause.name ?? (cause.cellId ? cellNameOf(cause.cellId, study) : "?")}"`;
    case "cycle":
      return `cycle through ${(cause.cycle ?? []).map((id) => cellNameOf(id, study)).join(", ")}`;
    case "unknown-name":
      return `unknown name "${cause.name}"`;
    case "duplicate-name":
      return `name "${cause.name}" is defined twice (cells ${(cause.cellIds ?? []).join(", ")})`;
  }
}
