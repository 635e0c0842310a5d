/**
 * Headless runner: `npm run cell -- <subcommand> ...` (docs/engine.md, "Headless runner").
 * It reads and writes files, so it lives outside the pure engine and uses the engine's entry
 * (`@/simulator`) like any other caller.
 *
 *   validate <cell.json>
 *   run <cell.json> --events <events.json> --for <duration> [--trace <sig,sig>] [--rules <rules.json>]
 *       [--faults <faults.json>] [--seed <n>]
 *   signals <cell.json>
 *   schema [<out-dir>]
 *
 * Output is JSON on stdout. Exit codes: 0 success, 1 problems found or a rule failed,
 * 2 usage error or unreadable file. The runner owns the file system and the process streams;
 * the `prove` and `diff` commands get them injected.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { CELL_LIMITS, checkRules, diffCommand, hashTrace, proveCommand, replay, ruleSignals, rulesSchema, signalNamesOf, validateCellDocument, type Problem } from '@/simulator';
import { cellJsonSchemas } from './json-schema';

type Exit = 0 | 1 | 2;

const USAGE = `usage:
  npm run cell -- validate <cell.json>
  npm run cell -- run <cell.json> --events <events.json> --for <duration> [--trace <sig,sig>] [--rules <rules.json>] [--faults <faults.json>] [--seed <n>]
  npm run cell -- signals <cell.json>
  npm run cell -- schema [<out-dir>]
  npm run cell -- prove <cell.json> <rules.json>        (interlock rules → verdicts; exit 1 on a violation)
  npm run cell -- diff <base.json> <proposed.json> [--io-sheet]
durations: 500ms, 30s, 2m, 1h (a bare number is milliseconds)`;

function print(value: unknown): void {
  process.stdout.write(`${JSON.stringify(value, null, 2)}\n`);
}

/** Parses 500ms / 30s / 2m / 1h / 1500 into whole milliseconds, or null. */
export function parseDuration(text: string): number | null {
  const m = /^(\d+(?:\.\d+)?)(ms|s|m|h)?$/.exec(text.trim());
  if (!m) return null;
  const scale = { ms: 1, s: 1000, m: 60_000, h: 3_600_000 }[(m[2] ?? 'ms') as 'ms' | 's' | 'm' | 'h'];
  const ms = Number(m[1]) * scale;
  return Number.isFinite(ms) && Number.isInteger(ms) ? ms : null;
}

function readJson(path: string, what: string): { ok: true; value: unknown } | { ok: false; problem: Problem } {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    return { ok: false, problem: { path: [], code: 'unreadable_file', message: `cannot read ${what} ${path}: ${(e as Error).message}` } };
  }
  if (text.length > CELL_LIMITS.documentChars) {
    return { ok: false, problem: { path: [], code: 'too_large', message: `${what}: the document has ${text.length} characters; the limit is ${CELL_LIMITS.documentChars}` } };
  }
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch (e) {
    return { ok: false, problem: { path: [], code: 'invalid_json', message: `${what} ${path} is not JSON: ${(e as Error).message}` } };
  }
}

function options(args: string[]): { positional: string[]; flags: Record<string, string> } | string {
  const positional: string[] = [];
  const flags: Record<string, string> = {};
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a.startsWith('--')) {
      const v = args[i + 1];
      if (v === undefined || v.startsWith('--')) return `missing value for ${a}`;
      flags[a.slice(2)] = v;
      i++;
    } else positional.push(a);
  }
  return { positional, flags };
}

function validate(file: string): Exit {
  const doc = readJson(file, 'cell');
  if (!doc.ok) {
    print({ ok: false, problems: [doc.problem] });
    return 2;
  }
  const r = validateCellDocument(doc.value);
  if (r.ok) {
    // Warnings (IEC 60204-1 panel colours, the supply's tolerance) do not fail validation.
    print({ ok: true, problems: [], warnings: r.value.warnings.map((p) => ({ ...p, at: p.path.join('.') })) });
    return 0;
  }
  print({ ok: false, problems: r.errors.map((p) => ({ ...p, at: p.path.join('.') })) });
  return 1;
}

function run(file: string, flags: Record<string, string>): Exit {
  const known = new Set(['events', 'for', 'trace', 'rules', 'faults', 'seed']);
  const unknown = Object.keys(flags).filter((k) => !known.has(k));
  if (unknown.length > 0 || !flags.for) {
    process.stderr.write(`${unknown.length > 0 ? `unknown option --${unknown[0]}\n` : 'run needs --for <duration>\n'}${USAGE}\n`);
    return 2;
  }
  const duration = parseDuration(flags.for);
  if (duration === null || duration > CELL_LIMITS.durationMs * 30) {
    process.stderr.write(`--for "${flags.for}" is not a duration up to 30 days (e.g. 500ms, 30s, 2m)\n`);
    return 2;
  }
  const doc = readJson(file, 'cell');
  const events = flags.events ? readJson(flags.events, 'events') : { ok: true as const, value: [] };
  const rules = flags.rules ? readJson(flags.rules, 'rules') : { ok: true as const, value: [] };
  const faults = flags.faults ? readJson(flags.faults, 'faults') : { ok: true as const, value: [] };
  const fileProblems = [doc, events, rules, faults].flatMap((x) => (x.ok ? [] : [x.problem]));
  if (fileProblems.length > 0) {
    print({ ok: false, problems: fileProblems });
    return 2;
  }
  const parsedRules = rulesSchema.safeParse(rules.ok ? rules.value : []);
  if (!parsedRules.success) {
    print({ ok: false, problems: parsedRules.error.issues.map((i) => ({ path: ['rules', ...i.path.map(String)], code: i.code, message: i.message })) });
    return 1;
  }
  const seed = flags.seed === undefined ? undefined : Number(flags.seed);
  const traced = flags.trace ? flags.trace.split(',').map((s) => s.trim()).filter(Boolean) : [];
  for (const r of parsedRules.data) for (const s of ruleSignals(r)) if (!traced.includes(s)) traced.push(s);
  const faultList = faults.ok ? faults.value : [];
  if (!Array.isArray(faultList)) {
    print({ ok: false, problems: [{ path: ['faults'], code: 'invalid_type', message: 'the faults file holds an array of fault cards' }] });
    return 1;
  }
  const result = replay(doc.ok ? doc.value : null, events.ok ? events.value : [], { trace: traced, seed, faults: faultList, untilMs: duration });
  if (!result.ok) {
    print({ ok: false, problems: result.errors.map((p) => ({ ...p, at: p.path.join('.') })) });
    return 1;
  }
  const checked = checkRules(result.value.trace, parsedRules.data);
  if (!checked.ok) {
    print({ ok: false, problems: checked.errors });
    return 1;
  }
  const failed = checked.value.filter((r) => r.status === 'fail').length;
  print({
    ok: failed === 0,
    endMs: result.value.trace.endMs,
    hash: hashTrace(result.value.trace),
    rules: checked.value,
    trace: result.value.trace,
  });
  return failed === 0 ? 0 : 1;
}

function signals(file: string): Exit {
  const doc = readJson(file, 'cell');
  if (!doc.ok) {
    print({ ok: false, problems: [doc.problem] });
    return 2;
  }
  const names = signalNamesOf(doc.value);
  if (!names.ok) {
    print({ ok: false, problems: names.errors });
    return 1;
  }
  print({ ok: true, signals: names.value });
  return 0;
}

function schema(dir: string | undefined): Exit {
  const all = cellJsonSchemas();
  if (!dir) {
    print(all);
    return 0;
  }
  mkdirSync(dir, { recursive: true });
  for (const [name, s] of Object.entries(all)) writeFileSync(join(dir, `${name}.schema.json`), `${JSON.stringify(s, null, 2)}\n`);
  print({ ok: true, written: Object.keys(all).map((n) => join(dir, `${n}.schema.json`)) });
  return 0;
}

function main(argv: string[]): Exit {
  const [cmd, ...rest] = argv;
  // prove and diff parse their own arguments (simulator/prove/cli.ts, simulator/diff/cli.ts).
  const stdout = (t: string) => void process.stdout.write(t);
  const stderr = (t: string) => void process.stderr.write(t);
  if (cmd === 'prove') return proveCommand(rest, { readFile: (p) => readFileSync(p, 'utf8'), stdout, stderr });
  if (cmd === 'diff') return diffCommand(rest, { readText: (p) => readFileSync(p, 'utf8'), stdout, stderr });
  const parsed = options(rest);
  if (typeof parsed === 'string') {
    process.stderr.write(`${parsed}\n${USAGE}\n`);
    return 2;
  }
  const { positional, flags } = parsed;
  switch (cmd) {
    case 'validate':
      if (positional.length !== 1) break;
      return validate(positional[0]);
    case 'run':
      if (positional.length !== 1) break;
      return run(positional[0], flags);
    case 'signals':
      if (positional.length !== 1) break;
      return signals(positional[0]);
    case 'schema':
      return schema(positional[0]);
    default:
      break;
  }
  process.stderr.write(`${USAGE}\n`);
  return 2;
}

process.exitCode = main(process.argv.slice(2));
