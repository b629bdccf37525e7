import { type Node, type Program, getLineInfo, parse } from "acorn";

/**
 * Where and why a code cell does not parse. `line` and `column` are 1-based, as an
 * editor shows them; `offset` is the 0-based index into the source.
 */
export interface CodeCellSyntaxError {
  readonly message: string;
  readonly line: number;
  readonly column: number;
  readonly offset: number;
}

/**
 * Parses a code cell. A code cell is the body of an async function: it may use
 * top-level `await` and `return`, and it is strict code (parsed as a module,
 * which is always strict, so `with`, octal literals and the like are errors here
 * just as they would be when the cell runs under "use strict"). Module syntax
 * (`import`/`export` declarations, `import.meta`) has no meaning in a function
 * body and is reported as an error; so is dynamic `import()`, which would reach
 * modules (and, in Node, the file system) outside what the study puts in scope.
 * This narrows what a cell can reach by accident; it is not a sandbox.
 */
export function parseCodeCell(source: string): { program: Program } | { error: CodeCellSyntaxError } {
  let program: Program;
  try {
    program = parse(source, { ecmaVersion: "latest", sourceType: "module", allowReturnOutsideFunction: true });
  } catch (error) {
    const pos = (error as { pos?: unknown }).pos;
    if (!(error instanceof SyntaxError) || typeof pos !== "number") throw error;
    // acorn appends " (line:column)" to its message; the position is returned separately.
    return { error: syntaxError(source, error.message.replace(/ \(\d+:\d+\)$/, ""), pos) };
  }
  for (const statement of program.body) {
    if (statement.type === "ImportDeclaration" || statement.type.startsWith("Export")) {
      return { error: syntaxError(source, `${statement.type.startsWith("Export") ? "export" : "import"} declarations have no meaning in a code cell; other cells' names are in scope already`, statement.start) };
    }
  }
  const meta = findNode(program, (node) => node.type === "MetaProperty" && (node as Node & { meta: { name: string } }).meta.name === "import");
  if (meta) return { error: syntaxError(source, "import.meta has no meaning in a code cell", meta.start) };
  const dynamic = findNode(program, (node) => node.type === "ImportExpression");
  if (dynamic) return { error: syntaxError(source, "import() is not available in a code cell; use the names in scope (core, Plot and other cells)", dynamic.start) };
  return { program };
}

function syntaxError(source: string, message: string, offset: number): CodeCellSyntaxError {
  const { line, column } = getLineInfo(source, offset);
  return { message, line, column: column + 1, offset };
}

/**
 * The first node (depth first, in source order) for which `test` holds, not
 * descending into nodes for which `skip` holds. Walks every child generically,
 * so it needs no list of node types.
 */
export function findNode(root: Node, test: (node: Node) => boolean, skip: (node: Node) => boolean = () => false): Node | null {
  const stack: Node[] = [root];
  while (stack.length) {
    const node = stack.pop()!;
    if (test(node)) return node;
    if (node !== root && skip(node)) continue;
    const children = childNodes(node);
    for (let k = children.length - 1; k >= 0; k--) stack.push(children[k]);
  }
  return null;
}

/** The child nodes of an ESTree node, in source order. */
export function childNodes(node: Node): Node[] {
  const out: Node[] = [];
  for (const key in node) {
    if (key === "type" || key === "start" || key === "end" || key === "loc" || key === "range") continue;
    const value = (node as unknown as Record<string, unknown>)[key];
    if (Array.isArray(value)) {
      for (const item of value) if (isNode(item)) out.push(item);
    } else if (isNode(value)) out.push(value);
  }
  return out;
}

function isNode(value: unknown): value is Node {
  return typeof value === "object" && value !== null && typeof (value as Node).type === "string";
}
