import type { Node, Program } from "acorn";
import { type CodeCellSyntaxError, childNodes, parseCodeCell } from "./parse-code-cell";

/**
 * The free names of a code cell: identifiers it reads or assigns that it does not
 * declare itself — the names it needs from other cells or the globals. Property
 * keys, member names (`a.b` gives only `a`), labels and `new.target` are not names.
 * `arguments` is never free: a code cell runs as a function, so it is bound.
 * Names come in order of first use. A cell that does not parse (see
 * {@link parseCodeCell}: an async function body with top-level await and return)
 * gives `names: []` and the error with its 1-based line and column.
 */
export function freeNames(source: string): { names: string[]; error?: CodeCellSyntaxError } {
  const parsed = parseCodeCell(source);
  if ("error" in parsed) return { names: [], error: parsed.error };
  return { names: programFreeNames(parsed.program) };
}

/** A lexical scope: `functionScope` marks where `var` and parameters live. */
class Scope {
  readonly names = new Set<string>();
  constructor(
    readonly parent: Scope | null,
    readonly functionScope: boolean,
  ) {}

  /** The nearest function scope (the cell body counts as one), where `var` hoists. */
  hoistTarget(): Scope {
    let scope: Scope = this;
    while (!scope.functionScope && scope.parent) scope = scope.parent;
    return scope;
  }

  declares(name: string): boolean {
    for (let scope: Scope | null = this; scope; scope = scope.parent) if (scope.names.has(name)) return true;
    return false;
  }
}

// Loose view of ESTree nodes: the walker reads fields by node type.
type AnyNode = Node & Record<string, any>;

/**
 * Walks the program once, declaring bindings in their scopes (ECMA-262 §14: `var`
 * and function parameters per function, `let`/`const`/`class`/function declarations
 * per block — code cells are strict, so block functions are block scoped) and
 * recording each identifier reference with its scope. References are resolved
 * only after the walk, so hoisted and later declarations count.
 */
function programFreeNames(program: Program): string[] {
  const references: { name: string; scope: Scope }[] = [];
  const root = new Scope(null, true);

  const visitAll = (nodes: readonly (AnyNode | null)[], scope: Scope) => {
    for (const node of nodes) if (node) visit(node, scope);
  };

  function declarePattern(node: AnyNode, target: Scope, scope: Scope): void {
    switch (node.type) {
      case "Identifier":
        target.names.add(node.name);
        return;
      case "ObjectPattern":
        for (const property of node.properties) {
          if (property.type === "RestElement") declarePattern(property.argument, target, scope);
          else {
            if (property.computed) visit(property.key, scope);
            declarePattern(property.value, target, scope);
          }
        }
        return;
      case "ArrayPattern":
        for (const element of node.elements) if (element) declarePattern(element, target, scope);
        return;
      case "RestElement":
        declarePattern(node.argument, target, scope);
        return;
      case "AssignmentPattern":
        declarePattern(node.left, target, scope);
        visit(node.right, scope);
        return;
      default:
        visit(node, scope); // not a binding: walk it as an expression
    }
  }

  function visitFunction(node: AnyNode, outer: Scope): void {
    let scope = outer;
    if (node.type === "FunctionExpression" && node.id) {
      // A named function expression sees its own name, in a scope of its own.
      scope = new Scope(outer, false);
      scope.names.add(node.id.name);
    }
    const inner = new Scope(scope, true);
    for (const param of node.params) declarePattern(param, inner, inner);
    if (node.body.type === "BlockStatement") visitAll(node.body.body, inner);
    else visit(node.body, inner);
  }

  function visitClass(node: AnyNode, outer: Scope): void {
    const scope = new Scope(outer, false);
    if (node.id) scope.names.add(node.id.name);
    if (node.superClass) visit(node.superClass, scope);
    for (const member of node.body.body as AnyNode[]) {
      if (member.type === "StaticBlock") {
        visitAll(member.body, new Scope(scope, true));
        continue;
      }
      if (member.computed) visit(member.key, scope);
      if (!member.value) continue;
      if (member.type === "MethodDefinition") visitFunction(member.value, scope);
      else visit(member.value, new Scope(scope, true)); // a field initialiser runs like a method body
    }
  }

  function visit(node: AnyNode, scope: Scope): void {
    switch (node.type) {
      case "Identifier":
        if (node.name !== "arguments") references.push({ name: node.name, scope });
        return;
      case "VariableDeclaration": {
        const target = node.kind === "var" ? scope.hoistTarget() : scope;
        for (const declarator of node.declarations) {
          declarePattern(declarator.id, target, scope);
          if (declarator.init) visit(declarator.init, scope);
        }
        return;
      }
      case "FunctionDeclaration":
        scope.names.add(node.id.name);
        visitFunction(node, scope);
        return;
      case "FunctionExpression":
      case "ArrowFunctionExpression":
        visitFunction(node, scope);
        return;
      case "ClassDeclaration":
        scope.names.add(node.id.name);
        visitClass(node, scope);
        return;
      case "ClassExpression":
        visitClass(node, scope);
        return;
      case "BlockStatement":
        visitAll(node.body, new Scope(scope, false));
        return;
      case "ForStatement":
      case "ForInStatement":
      case "ForOfStatement": {
        // `let`/`const` in the head are scoped to the loop; `var` hoists as usual.
        const loop = new Scope(scope, false);
        visitAll([node.init, node.test, node.update, node.left, node.right, node.body], loop);
        return;
      }
      case "CatchClause": {
        const handler = new Scope(scope, false);
        if (node.param) declarePattern(node.param, handler, handler);
        visit(node.body, handler);
        return;
      }
      case "SwitchStatement": {
        visit(node.discriminant, scope);
        const cases = new Scope(scope, false); // all cases share one block
        for (const clause of node.cases) visitAll([clause.test, ...clause.consequent], cases);
        return;
      }
      case "LabeledStatement":
        visit(node.body, scope);
        return;
      case "BreakStatement":
      case "ContinueStatement":
      case "MetaProperty":
        return;
      case "MemberExpression":
        visit(node.object, scope);
        if (node.computed) visit(node.property, scope);
        return;
      case "Property":
        // In object literals and assignment patterns alike, a plain key is not a name.
        if (node.computed) visit(node.key, scope);
        visit(node.value, scope);
        return;
      default:
        visitAll(childNodes(node), scope);
    }
  }

  visitAll(program.body as AnyNode[], root);
  const free: string[] = [];
  const seen = new Set<string>();
  for (const { name, scope } of references) {
    if (seen.has(name) || scope.declares(name)) continue;
    seen.add(name);
    free.push(name);
  }
  return free;
}
