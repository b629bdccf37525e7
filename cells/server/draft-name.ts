import { STUDY_SUFFIX } from "./content-types";

/**
 * The file name of draft `n` of a study: `harbour.couplet.json`, 2 →
 * `harbour (draft 2).couplet.json`. A name that is already a draft is numbered
 * afresh rather than nested: `harbour (draft 2).couplet.json`, 3 →
 * `harbour (draft 3).couplet.json`. Used to "keep both" when a save conflicts.
 *
 * @param fileName a study file name without folders, ending in `.couplet.json`.
 * @param n the draft number, an integer ≥ 2.
 */
export function draftName(fileName: string, n: number): string {
  if (!fileName.endsWith(STUDY_SUFFIX) || fileName.includes("/")) throw new RangeError(`draftName: expected a study file name ending in ${STUDY_SUFFIX}, got ${JSON.stringify(fileName)}`);
  if (!(Number.isInteger(n) && n >= 2)) throw new RangeError(`draftName: n must be an integer >= 2, got ${n}`);
  const base = fileName.slice(0, -STUDY_SUFFIX.length).replace(/ \(draft \d+\)$/, "");
  return `${base} (draft ${n})${STUDY_SUFFIX}`;
}
