export type { Problem, Result } from './result';
export { ok, fail, problem, prefixProblems } from './result';
