/**
 * The headless `diff` command: `npm run cell -- diff <base.json> <proposed.json> [--io-sheet]`.
 * The runner (scripts/cell-cli/cell.ts) hands it the arguments after `diff` and an `io` over the
 * file system and the process streams; this file itself touches neither, so it is tested in
 * memory and the engine stays pure.
 *
 * Exit codes follow the runner (docs/engine.md): 0 the diff was printed (whatever it holds),
 * 1 a document is not a cell document (every problem, with `document` and path), 2 usage
 * error or an unreadable / non-JSON / oversized file.
 */
import type { Problem } from '@/simulator/shared/result';
import { cellDocumentSchema, type CellDocument } from '@/simulator/schema/cell-document';
import { documentTooLarge, zodProblems } from '@/simulator/schema/validate';
import { upgradeCellDocument } from '@/simulator/schema/upgrade';
import { diffCells } from './diff-cell';
import { ioChangeSheet } from './io-sheet';

/** What `diffCommand` needs from its host: reading files and writing the two streams. */
export type DiffCliIo = {
  /** The file's text (UTF-8); throws when it cannot be read. */
  readText(path: string): string;
  stdout(text: string): void;
  stderr(text: string): void;
};

/** Usage line of the `diff` command. */
export const DIFF_USAGE = `usage:
  npm run cell -- diff <base.cell.json> <proposed.cell.json> [--io-sheet]
prints { ok, diff } as JSON (exit 0); with --io-sheet the I/O-list change sheet as CSV instead`;

type Loaded = { ok: true; doc: CellDocument } | { ok: false; exit: 1 | 2; problems: (Problem & { document: string; at: string })[] };

function load(path: string, document: 'base' | 'proposed', io: DiffCliIo): Loaded {
  const fileProblem = (code: string, message: string): Loaded => ({ ok: false, exit: 2, problems: [{ document, path: [], at: '', code, message }] });
  let text: string;
  try {
    text = io.readText(path);
  } catch (e) {
    return fileProblem('unreadable_file', `cannot read ${document} ${path}: ${(e as Error).message}`);
  }
  const big = documentTooLarge(text);
  if (big) return fileProblem(big.code, `${document}: ${big.message}`);
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    return fileProblem('invalid_json', `${document} ${path} is not JSON: ${(e as Error).message}`);
  }
  // Only the shape is required: a proposed version still being edited (say, a connection to a
  // block not placed yet) can be compared; `validate` reports its cross-reference problems.
  const parsed = cellDocumentSchema.safeParse(upgradeCellDocument(json));
  if (!parsed.success) {
    return { ok: false, exit: 1, problems: zodProblems(parsed.error.issues).map((p) => ({ ...p, document, at: p.path.join('.') })) };
  }
  return { ok: true, doc: parsed.data };
}

/**
 * Runs `diff` with the arguments after the subcommand (`[base, proposed, --io-sheet?]`) and
 * returns the exit code. Prints `{ ok: true, diff }` (a `CellDiff`) as JSON, or with
 * `--io-sheet` the change sheet CSV; on bad documents `{ ok: false, problems }`.
 *
 * @example
 *   // in scripts/cell-cli/cell.ts
 *   case 'diff': return diffCommand(rest, { readText: (p) => readFileSync(p, 'utf8'),
 *     stdout: (t) => process.stdout.write(t), stderr: (t) => process.stderr.write(t) });
 */
export function diffCommand(argv: readonly string[], io: DiffCliIo): 0 | 1 | 2 {
  const flags = argv.filter((a) => a.startsWith('--'));
  const files = argv.filter((a) => !a.startsWith('--'));
  const unknown = flags.filter((f) => f !== '--io-sheet');
  if (files.length !== 2 || unknown.length > 0) {
    io.stderr(`${unknown.length > 0 ? `unknown option ${unknown[0]}\n` : ''}${DIFF_USAGE}\n`);
    return 2;
  }
  const base = load(files[0], 'base', io);
  const proposed = load(files[1], 'proposed', io);
  if (!base.ok || !proposed.ok) {
    const failed = [base, proposed].filter((x): x is Extract<Loaded, { ok: false }> => !x.ok);
    io.stdout(`${JSON.stringify({ ok: false, problems: failed.flatMap((f) => f.problems) }, null, 2)}\n`);
    return Math.max(...failed.map((f) => f.exit)) as 1 | 2;
  }
  const diff = diffCells(base.doc, proposed.doc);
  if (flags.includes('--io-sheet')) {
    io.stdout(ioChangeSheet(diff, base.doc, proposed.doc).csv);
    return 0;
  }
  io.stdout(`${JSON.stringify({ ok: true, diff }, null, 2)}\n`);
  return 0;
}
