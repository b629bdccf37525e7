/**
 * A run asked for something the study cannot do, found before anything computes:
 * an override naming no parameter, naming a cell that is not a parameter, or
 * giving a value outside the parameter's control (`eps: must be within [0.001, 1], got 3`).
 * The message names the parameter; the CLI shows it as a usage problem.
 */
export class StudyRunError extends Error {
  /** The parameter name the problem is about, when there is one. */
  readonly parameter?: string;
  constructor(message: string, parameter?: string) {
    super(message);
    this.name = "StudyRunError";
    if (parameter !== undefined) this.parameter = parameter;
  }
}
