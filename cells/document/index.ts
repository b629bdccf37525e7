// The study document: types, reading, validating, migrating, writing and
// updating studies. Browser-safe; file loading and saving (Node only) live in
// ./study-file.
export { type StudyIssue, StudyFormatError, childPath, formatIssue } from "./study-issue";
export { type Cell, type CellOf, type CellKindName, type Receipt, type SettingsByKind, type StudyDocument, CURRENT_FORMAT_VERSION, STUDY_FORMAT, studySeed } from "./study-types";
export { CELL_KIND_NAMES, KIND_SETTINGS, isCellKindName } from "../kinds/settings-registry";
export { type ParseStudyOptions, assertValidStudy, parseStudy } from "./parse-study";
export { type StudyIssuesOptions, studyIssues } from "./study-issues";
export { MIGRATIONS, migrateStudy, rawFormatVersion } from "./migrate-study";
export { serializeStudy } from "./serialize-study";
export { type SettingPath, type StudyChange, type StudyUpdate, updateStudy } from "./update-study";
export { newStudyId } from "./new-study-id";
export { type CreateStudyOptions, createStudy } from "./create-study";
export { cellDependencies, referenceIssues } from "./study-references";
export { RESERVED_NAMES, isCellId, isCellName, isIdentifierName } from "./cell-name";
export { type NumberOrParam, type ParamRef, isParamRef } from "./references";
export { MAX_SEED, type SeedSetting, deriveCellSeed, deriveSeed, fnv1a32 } from "./seed";
export { type NumberNotation, MAX_DIGITS, NUMBER_NOTATIONS } from "./number-format";
export { type DuplicateKey, type JsonScan, type JsonSyntaxProblem, scanJson } from "./scan-json";
