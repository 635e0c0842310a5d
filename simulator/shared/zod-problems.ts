import type { z } from 'zod';
import type { Problem } from './result';

/** A validator's own code for a zod issue it names differently, or undefined to keep zod's. */
export type IssueCode = (issue: z.core.$ZodIssue, path: (string | number)[]) => string | undefined;

/**
 * Turns zod issues into Problems with stable codes: the issue's path behind `prefix`; a custom
 * refinement's own `params.code` (else `invalid_value`); any other issue's code as `codeFor`
 * maps it, or zod's own code.
 */
export function issuesToProblems(issues: readonly z.core.$ZodIssue[], prefix: (string | number)[], codeFor: IssueCode): Problem[] {
  return issues.map((issue) => {
    const path = [...prefix, ...issue.path.map((p) => (typeof p === 'number' ? p : String(p)))];
    let code: string;
    if (issue.code === 'custom') {
      const c = (issue.params as { code?: unknown } | undefined)?.code;
      code = typeof c === 'string' ? c : 'invalid_value';
    } else code = codeFor(issue, path) ?? issue.code;
    return { path, code, message: issue.message };
  });
}
