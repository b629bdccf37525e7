// Types for the parts of @observablehq/runtime@6.0.1 that Couplet uses. The
// package ships no types; this covers its public API only (read from its
// src/runtime.js, module.js, variable.js). Keep it in step with the pinned version.
declare module "@observablehq/runtime" {
  /** Receives a variable's life cycle. Every callback is optional. */
  export interface Observer {
    /** The variable starts (re)computing: called before its inputs resolve. */
    pending?(): void;
    /** A value arrived (once per computation; once per yield for generators). */
    fulfilled?(value: unknown, name: string | null): void;
    /** The computation, or one of its inputs, failed. */
    rejected?(error: unknown, name: string | null): void;
  }

  export class Variable {
    /** Defines or redefines this variable; inputs are names resolved in its module. */
    define(name: string | null, inputs: readonly string[], definition: (...inputs: any[]) => unknown): this;
    /** Removes the definition; references to the name become unresolved. */
    delete(): this;
  }

  export class Module {
    /** A new variable; without an observer it is never computed. */
    variable(observer?: Observer | boolean): Variable;
    /** The value of a named variable once it settles (computes it if needed). */
    value(name: string): Promise<unknown>;
  }

  /** Thrown for failed inputs, circular and duplicate definitions; `input` names the failed input. */
  export class RuntimeError extends Error {
    constructor(message: string, input?: string);
    readonly input?: string;
  }

  export class Runtime {
    /**
     * @param builtins values every module can reference by name
     * @param global resolves names no variable or builtin defines; throw to mark a name undefined
     */
    constructor(builtins?: Record<string, unknown> | null, global?: (name: string) => unknown);
    module(): Module;
    /** Invalidates every variable (resolving their `invalidation` promises) and stops computing. */
    dispose(): void;
  }
}
