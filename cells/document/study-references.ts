import { isCellKindName, kindSettings } from "../kinds/settings-registry";
import { type StudyIssue } from "./study-issue";
import type { Cell, StudyDocument } from "./study-types";

/**
 * Names of the cells a cell's typed settings refer to (transport → source,
 * target and referenced parameters; prose → live values; …). Code is not
 * read here: the runtime finds the names code uses.
 */
export function cellDependencies(cell: Cell): string[] {
  return isCellKindName(cell.kind) ? kindSettings(cell.kind).dependencies(cell.settings) : [];
}

/**
 * References in typed settings that name no cell of the study, or the cell
 * itself: `cells[2].settings: refers to "shops", but no cell has that name`.
 * Not an error of the file (a study may be mid-edit and the runtime marks such
 * cells failed); shown by the editor and by the command line's checks.
 */
export function referenceIssues(study: StudyDocument): StudyIssue[] {
  const names = new Set(study.cells.map((c) => c.name).filter((n): n is string => n !== undefined));
  const issues: StudyIssue[] = [];
  study.cells.forEach((cell, i) => {
    for (const name of cellDependencies(cell)) {
      const path = `cells[${i}].settings`;
      if (name === cell.name) issues.push({ path, message: `refers to its own name ${JSON.stringify(name)}` });
      else if (!names.has(name)) issues.push({ path, message: `refers to ${JSON.stringify(name)}, but no cell has that name` });
    }
  });
  return issues;
}
