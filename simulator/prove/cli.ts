/**
 * The headless `prove` command, for the runner in scripts/cell-cli/cell.ts to dispatch to:
 *
 *   prove <cell.json> <rules.json> [--max-depth <n>] [--budget <n>] [--timer-horizon <n>]
 *   prove <cell.json> --rules <rules.json> [...]
 *
 * Prints `{ ok, summary, verdicts }` as JSON on stdout; each violated verdict carries the
 * `events` that replay its counterexample (`run <cell.json> --events <file>`). Exit codes
 * as the runner's: 0 nothing violated, 1 a rule is violated or the files hold problems,
 * 2 usage error or unreadable file. Undecided rules do not fail the command; the summary
 * counts them. File reading and the output streams are injected (`io`): the runner passes
 * the file system, tests pass memory, and the engine itself never touches either.
 */
import type { Problem } from '@/simulator/shared/result';
import { documentTooLarge } from '@/simulator/schema/validate';
import { counterexampleEvents } from './counterexample-events';
import { PROVE_DEFAULTS, proveRules, type ProveOptions } from './prove';

/** Where the command reads files and writes its output. */
export type ProveIo = {
  readFile(path: string): string;
  stdout(text: string): void;
  stderr(text: string): void;
};

/** Usage text of the command. */
export const PROVE_USAGE = `usage:
  npm run cell -- prove <cell.json> <rules.json> [--max-depth <n>] [--budget <n>] [--timer-horizon <n>]
  (or --rules <rules.json>); defaults: --max-depth ${PROVE_DEFAULTS.maxDepth}, --budget ${PROVE_DEFAULTS.budget} clauses per rule, --timer-horizon ${PROVE_DEFAULTS.timerHorizonScans} scans`;

const FLAGS: Record<string, keyof ProveOptions | 'rules'> = {
  'max-depth': 'maxDepth',
  budget: 'budget',
  'timer-horizon': 'timerHorizonScans',
  rules: 'rules',
};

type Read = { ok: true; value: unknown } | { ok: false; problem: Problem };

function readJson(io: ProveIo, path: string, what: string): Read {
  let text: string;
  try {
    text = io.readFile(path);
  } catch (e) {
    return { ok: false, problem: { path: [], code: 'unreadable_file', message: `cannot read ${what} ${path}: ${(e as Error).message}` } };
  }
  const big = documentTooLarge(text);
  if (big) return { ok: false, problem: { ...big, message: `${what}: ${big.message}` } };
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch (e) {
    return { ok: false, problem: { path: [], code: 'invalid_json', message: `${what} ${path} is not JSON: ${(e as Error).message}` } };
  }
}

/**
 * Runs `prove` with the arguments after the subcommand name; returns the exit code
 * (0 nothing violated, 1 a violation or problems in the files, 2 usage or unreadable file).
 */
export function proveCommand(argv: string[], io: ProveIo): 0 | 1 | 2 {
  const positional: string[] = [];
  const options: ProveOptions = {};
  let rulesPath: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (!a.startsWith('--')) {
      positional.push(a);
      continue;
    }
    const name = FLAGS[a.slice(2)];
    const value = argv[i + 1];
    i++;
    if (!name || value === undefined || value.startsWith('--')) {
      io.stderr(`${name ? `missing value for ${a}` : `unknown option ${a}`}\n${PROVE_USAGE}\n`);
      return 2;
    }
    if (name === 'rules') {
      rulesPath = value;
      continue;
    }
    const n = Number(value);
    if (!/^\d+$/.test(value) || !Number.isSafeInteger(n) || (name === 'maxDepth' && n > 10_000)) {
      io.stderr(`${a} takes a whole number${name === 'maxDepth' ? ' up to 10000' : ''}, not "${value}"\n`);
      return 2;
    }
    options[name] = n;
  }
  if (rulesPath === undefined && positional.length === 2) rulesPath = positional.pop();
  if (positional.length !== 1 || rulesPath === undefined) {
    io.stderr(`${PROVE_USAGE}\n`);
    return 2;
  }
  const print = (value: unknown) => io.stdout(`${JSON.stringify(value, null, 2)}\n`);
  const cell = readJson(io, positional[0], 'cell');
  const rules = readJson(io, rulesPath, 'rules');
  if (!cell.ok || !rules.ok) {
    print({ ok: false, problems: [cell, rules].flatMap((x) => (x.ok ? [] : [x.problem])) });
    return 2;
  }
  const result = proveRules(cell.value, rules.value, options);
  if (!result.ok) {
    print({ ok: false, problems: result.errors.map((p) => ({ ...p, at: p.path.join('.') })) });
    return 1;
  }
  const document = cell.value as { plc: { sheet: { scanPeriodMs: number } } };
  const verdicts = result.value.map((v) => (v.status === 'violated' ? { ...v, events: counterexampleEvents(v.counterexample, document) } : v));
  const count = (s: string) => verdicts.filter((v) => v.status === s).length;
  const summary = { proved: count('proved'), violated: count('violated'), undecided: count('undecided') };
  print({ ok: summary.violated === 0, summary, verdicts });
  return summary.violated === 0 ? 0 : 1;
}
