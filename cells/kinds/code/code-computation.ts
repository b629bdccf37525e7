import { CellHeldError } from "../cell-error";
import { compileCodeCell } from "../../runtime/compile-code-cell";
import { freeNames } from "../../runtime/free-names";

/**
 * A code cell's inputs and computation: the inputs are the code's free names
 * (other cells, or the globals `core`, `Plot` and the standard built-ins, which the
 * engine resolves); the computation runs the compiled code with them. Code that
 * does not parse gives no inputs and a computation that throws the syntax error
 * (with its line and column). With `runCode` false the computation throws
 * {@link CellHeldError} instead of running anything.
 */
export function codeComputation(code: string, runCode: boolean, what = "code"): { inputs: string[]; compute: (inputs: Record<string, unknown>) => Promise<unknown> } {
  if (!runCode) {
    // No inputs: a held cell is held whatever its inputs would have done.
    return {
      inputs: [],
      compute: async () => {
        throw new CellHeldError(what);
      },
    };
  }
  const { names } = freeNames(code);
  let run: (values: Record<string, unknown>) => Promise<unknown>;
  try {
    run = compileCodeCell(code, names);
  } catch (error) {
    return {
      inputs: [],
      compute: async () => {
        throw error;
      },
    };
  }
  return { inputs: names, compute: (inputs) => run(inputs) };
}
