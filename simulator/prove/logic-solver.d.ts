/**
 * Types for the parts of `logic-solver` 2.0.1 (MiniSat compiled to JavaScript, MIT) the
 * prover uses; the package ships none. Names and behaviour follow its README.
 */
declare module 'logic-solver' {
  namespace Logic {
    /** A variable name or number, optionally negated (`"-x"`, `-3`). */
    type Term = string | number;
    /** A formula built by the functions below. */
    interface Formula {
      readonly type: string;
    }
    type Operand = Formula | Term;

    /** A solver: constraints are only ever added; `solveAssuming` adds one temporarily. */
    class Solver {
      constructor();
      /** The number of a variable name, allocating one on first use (0 with `noCreate` when unknown). */
      getVarNum(name: string, noCreate?: boolean): number;
      getVarName(num: number): string;
      require(...formulas: (Operand | Operand[])[]): void;
      forbid(...formulas: (Operand | Operand[])[]): void;
      solve(): Solution | null;
      solveAssuming(formula: Operand): Solution | null;
    }

    /** An assignment of every variable. */
    interface Solution {
      getMap(): Record<string, boolean>;
      getTrueVars(): string[];
      evaluate(formula: Operand): boolean;
    }

    const TRUE: string;
    const FALSE: string;
    function not(operand: Operand): Operand;
    function or(...operands: (Operand | Operand[])[]): Operand;
    function and(...operands: (Operand | Operand[])[]): Operand;
    function xor(...operands: (Operand | Operand[])[]): Operand;
    function implies(a: Operand, b: Operand): Operand;
    function equiv(a: Operand, b: Operand): Operand;
    function exactlyOne(...operands: (Operand | Operand[])[]): Operand;
    function atMostOne(...operands: (Operand | Operand[])[]): Operand;
    /** Runs `f` without the package's run-time argument checks (faster formula building). */
    function disablingAssertions<T>(f: () => T): T;
  }
  export = Logic;
}
