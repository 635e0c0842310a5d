/**
 * The interlock prover: rules over PLC bits, proved over every input combination and every
 * reachable state of a logic sheet, or refuted with the shortest counterexample. The
 * headless command lives in ./cli.ts (it reads files, so it is not exported here).
 */
export type { RuleCondition, InterlockRule, InterlockRuleInput, SignalLabels } from './rules';
export {
  ruleConditionSchema,
  interlockRuleSchema,
  interlockRulesSchema,
  describeRule,
  describeCondition,
  ruleAddresses,
  signalLabels,
  MAX_CONDITION_DEPTH,
  MAX_WITHIN_SCANS,
} from './rules';
export type { EncodingNote } from './system';
export type { ProveOptions, Counterexample, Verdict } from './prove';
export { proveRules, PROVE_DEFAULTS } from './prove';
export { counterexampleEvents, counterexampleFailsAtMs } from './counterexample-events';
