import { deepFreeze } from "./deep-freeze";
import { assertValidStudy } from "./parse-study";
import { CURRENT_FORMAT_VERSION, STUDY_FORMAT, type StudyDocument } from "./study-types";

/** Options of {@link createStudy}. */
export interface CreateStudyOptions {
  /** Default "". */
  readonly title?: string;
  /** Integer in [0, 4294967295]. Default 0. */
  readonly seed?: number;
  readonly about?: string;
}

/**
 * An empty study of the current format version, with fields in the canonical
 * order (format, formatVersion, title, about, seed, cells). Add cells with
 * updateStudy. Throws a StudyFormatError for a bad title or seed.
 */
export function createStudy(options: CreateStudyOptions = {}): StudyDocument {
  const { title = "", seed = 0, about } = options;
  const study = {
    format: STUDY_FORMAT,
    formatVersion: CURRENT_FORMAT_VERSION,
    title,
    ...(about === undefined ? {} : { about }),
    seed,
    cells: [],
  };
  assertValidStudy(study);
  return deepFreeze(study);
}
