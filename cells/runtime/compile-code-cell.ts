import type { Node, Program } from "acorn";
import { type CodeCellSyntaxError, findNode, parseCodeCell } from "./parse-code-cell";

/** Thrown by {@link compileCodeCell} for a cell that does not parse; carries the position. */
export class CodeCellCompileError extends SyntaxError {
  /** 1-based line, 1-based column and 0-based offset of the problem. */
  readonly line: number;
  readonly column: number;
  readonly offset: number;
  constructor(error: CodeCellSyntaxError) {
    super(`${error.message} (line ${error.line}, column ${error.column})`);
    this.name = "CodeCellCompileError";
    this.line = error.line;
    this.column = error.column;
    this.offset = error.offset;
  }
}

const AsyncFunction = Object.getPrototypeOf(async () => {}).constructor as new (...args: string[]) => (...args: unknown[]) => Promise<unknown>;

/**
 * Turns a code cell into an async function of its inputs. The body runs as a
 * strict async function whose parameters are `inputs` (usually the cell's
 * {@link freeNames} that other cells or the globals provide). Its value is what an
 * explicit `return` gives; a body with no `return` of its own (returns inside
 * nested functions do not count) gives the value of its last statement when that
 * statement is an expression (`x * 2` at the end of the cell), else undefined.
 * An object literal at the end needs parentheses, as anywhere in JavaScript:
 * `({a: 1})`. Throws {@link CodeCellCompileError} for a syntax error, and a
 * TypeError when an input is not usable as a parameter name.
 */
export function compileCodeCell(source: string, inputs: readonly string[]): (values: Record<string, unknown>) => Promise<unknown> {
  const parsed = parseCodeCell(source);
  if ("error" in parsed) throw new CodeCellCompileError(parsed.error);
  const names = [...new Set(inputs)];
  let run: (...args: unknown[]) => Promise<unknown>;
  try {
    // The newline before the closing brace ends a trailing line comment.
    run = new AsyncFunction(...names, `"use strict";\n${withImplicitReturn(source, parsed.program)}\n`);
  } catch (error) {
    throw new TypeError(`inputs: cannot compile with parameters (${names.join(", ")}): ${(error as Error).message}`);
  }
  return (values) => run(...names.map((name) => values[name]));
}

/** Nodes whose `return` statements belong to themselves, not to the cell. */
const FUNCTION_LIKE = new Set(["FunctionDeclaration", "FunctionExpression", "ArrowFunctionExpression", "ClassDeclaration", "ClassExpression"]);

/**
 * The cell's source with its last expression statement turned into a `return`,
 * using the parser's positions (the expression keeps its text; the statement's
 * trailing semicolon and comments inside the statement's range are replaced).
 * Unchanged if the body has a `return` of its own or ends with a non-expression.
 */
export function withImplicitReturn(source: string, program: Program): string {
  const ownsReturns = (node: Node) => FUNCTION_LIKE.has(node.type);
  if (findNode(program, (node) => node.type === "ReturnStatement", ownsReturns)) return source;
  const last = program.body[program.body.length - 1];
  if (!last || last.type !== "ExpressionStatement") return source;
  const { expression } = last;
  return `${source.slice(0, last.start)}return (${source.slice(expression.start, expression.end)});${source.slice(last.end)}`;
}
