/**
 * Cellwright's simulation engine: the one public entry. Nothing outside simulator/ imports past
 * this file (ESLint `no-restricted-imports` in eslint.config.mjs). Everything here is pure
 * TypeScript: no DOM, no wall clock, no unseeded randomness; a run is reproduced exactly from
 * its document, event log and seed.
 *
 * The entry is small on purpose: what the app, the server, the headless runner and the
 * benchmarks need, each with one line here and its full JSDoc where it is defined. Anything
 * else stays inside the engine. Below the core come three blocks kept as their modules
 * publish them: the changeover diff, the interlock prover and logic exchange.
 */

// ---- results
export type {
  /** One problem in an input, located by its path inside that input (`path`, `code`, `message`, `related?`). */
  Problem,
  /** Success with a value, or failure with every problem found: what the engine returns instead of throwing. */
  Result,
} from './shared/result';

// ---- the cell document
export type {
  /** A validated cell document: panel, field devices, link, PLC, wiring, controller, initial state. */
  CellDocument,
  /** One operator panel device (push button, e-stop, pilot light, potentiometer …). */
  PanelDevice,
  /** One field device (sensors, guard switch, gripper, vacuum cup, conveyor). */
  FieldDevice,
  /** One terminal-strip row: a wire from a device terminal, PLC address or controller channel to another. */
  WiringRow,
  /** One controller I/O module in a rack and slot. */
  ControllerModule,
  /** One point-map row: a range of logical points onto a rack / slot / first channel. */
  PointMapRow,
  /** One routine step of the controller (wait, set, pulse, set-word, move, pause, branch, jump, alarm). */
  RoutineStep,
} from './schema/cell-document';
export {
  /** The zod schema of a whole cell document (shape and ranges; `validateCellDocument` adds cross-references). */
  cellDocumentSchema,
} from './schema/cell-document';
export {
  /** Size limits of a cell document (devices, rows, modules, ids, texts, durations, characters per file). */
  CELL_LIMITS,
} from './schema/limits';
export {
  /** Checks a document of unknown shape: every problem with its path, or the document, compiled sheet and wiring plans. */
  validateCellDocument,
} from './schema/validate';
export {
  /** A document written under an older schema version, brought up to the current one (anything else unchanged). */
  upgradeCellDocument,
} from './schema/upgrade';
export {
  /** The terminals of a device by its type: name, direction (in/out) and what flows (contact, sensor, analog, load, word). */
  deviceTerminals,
} from './schema/terminals';

// ---- running a cell
export type {
  /** A running cell: `advance`, `apply`, `snapshot`, `subscribe`, signal reads, incremental trace and log reads, `dispose`. */
  Cell,
} from './cell/cell';
export {
  /** Creates a cell from a document (plus hidden fault cards, trace signals, a seed), or every problem. */
  createCell,
} from './cell/cell';
export type {
  /** An event a cell accepts (press, release, set-field, force, download, inject-fault …). */
  CellEvent,
  /** The `download` event: edited logic, wiring or routine swapped into a running cell. */
  DownloadEvent,
  /** One entry of an event log: an event and the cell time (ms) it applied at. */
  LoggedEvent,
} from './cell/events';
export {
  /** The zod schema of one event. */
  cellEventSchema,
  /** The zod schema of an event log (`{ t, event }[]`). */
  eventLogSchema,
} from './cell/events';
export type {
  /** The plain, JSON-safe picture of a cell at one instant (devices, wires, PLC, link, controller, arm, faults, forces). */
  CellSnapshot,
} from './cell/snapshot';
export {
  /** The next instant a subsystem with the given period is due after a time (the "step one scan" arithmetic). */
  nextScanMs,
} from './cell/clock';
export {
  /** Every signal name a cell made from a document exposes, without building the cell. */
  signalNamesOf,
} from './cell/signal-names';
export {
  /** Applies a log to a cell at its events' times and runs on to a time; an optional `stop` check ends it early (budgets). */
  applyLog,
  /** A whole replay in one call: a fresh cell, its log, a time → trace, hash, snapshot, log. */
  replay,
} from './trace/replay';

// ---- fault cards
export type {
  /** An injectable fault: kind, target, and when it fires (`at`, `when` or at once). */
  FaultCard,
  /** A fault card's kind (stuck-on, open-wire, dead-module, …). */
  FaultKind,
  /** A condition over named signals (`{ signal, op, value }`, `all`, `any`, `not`), for triggers and rules. */
  SignalPredicate,
} from './faults/fault-card';
export {
  /** The device types each device fault applies to, by kind (from the engine's device catalogue). */
  FAULT_DEVICE_TYPES,
} from './cell/devices';
export {
  /** The zod schema of a fault card. */
  faultCardSchema,
  /** Every fault kind, in catalogue order. */
  FAULT_KINDS,
  /** What a technician sees for each fault kind. */
  FAULT_SYMPTOMS,
} from './faults/fault-card';

// ---- traces and rules
export type {
  /** A compact, change-only trace: signal names, `[timeMs, signalIndex, value]` samples, end time. */
  Trace,
} from './trace/trace';
export {
  /** The stable hash of a trace (FNV-1a 64 of its canonical JSON). */
  hashTrace,
} from './trace/trace';
export {
  /** Compiles a signal predicate against the names a cell knows: a reader-driven test, or every unknown name as a problem. */
  compilePredicate,
} from './trace/predicate';
export type {
  /** A rule over a trace: never P, always P, after E within T ms P, within T ms eventually P. */
  Rule,
} from './trace/rules';
export {
  /** The zod schema of one rule. */
  ruleSchema,
  /** The zod schema of a list of rules. */
  rulesSchema,
  /** The signals a rule reads (they must be in the trace). */
  ruleSignals,
  /** Checks rules over a trace: pass, fail (with the first violation) or inconclusive, per rule. */
  checkRules,
} from './trace/rules';

// ---- the PLC's logic sheet
export type {
  /** A logic sheet as written in a document (defaults may be omitted). */
  LogicSheetInput,
  /** A block type name (TON, CTU, NO_CONTACT, …). */
  BlockType,
  /** One typed input or output port of a block. */
  PortSpec,
} from './plc/api';
export {
  /** Every block type's ports, default parameters, group and one-line summary. */
  blockCatalogue,
  /** The ports of a configured block (variadic logic blocks get IN1..INn from their parameters). */
  blockPorts,
  /** True when a string names a block type. */
  isBlockType,
  /** Whether an output of one port type may drive an input of another. */
  portTypesCompatible,
} from './plc/catalogue';
export {
  /** Checks a logic sheet on its own (shape, addresses, wiring, port types, loops): every problem with its path. */
  validateSheet,
} from './plc/validate';
export {
  /** Compiles a logic sheet to straight-line JavaScript that scans a process image. */
  compileSheet,
} from './plc/compile';
export {
  /** Parses an IEC 61131-3 direct address (`%IX0.4`, `%QW2`, `%MX5.0`). */
  parseAddress,
  /** Writes an address in its canonical text. */
  formatAddress,
} from './address/address';

// ---- the controller's point map
export {
  /** The module type that can carry each point family (WI/WO are grouped bits on digital modules). */
  FAMILY_MODULE_TYPE,
  /** Splits a point reference (`DI3`) into family, index and whether the controller reads it. */
  parsePointRef,
  /** Channels one point of a row occupies (1, or `bits` for word points). */
  channelsPerPoint,
  /** Resolves point-map rows into logical → physical (`byRef`) and physical → logical lookups. */
  resolvePointMap,
  /** Checks point-map rows against the modules and the points in use: every problem with the rows involved. */
  validatePointMap,
} from './controller/point-map';

// ---- demo cells
export {
  /** The pick-and-place demo cell (an invented scenario). */
  pickAndPlaceCell,
  /** The starter cell new documents begin from. */
  starterCell,
  /** The model debounce fix of the pick-and-place part input: a logic sheet to download. */
  pickAndPlaceDebouncedSheet,
} from './demo';

// ---- diff (changeover: base vs proposed cell document)
/**
 * Structural diff of two cell documents and the I/O-list change sheet (simulator/diff/).
 * `diffCells(base, proposed)` → `CellDiff`: entries per area (`DIFF_AREAS`: cell, devices,
 * modules, wiring, pointMap, logic, routine, handshake), each `DiffEntry` with its kind
 * (added / removed / changed / moved / reordered), target, id, document path, detail line and
 * field changes, plus a `summary` of counts per area for a signed record.
 * `ioChangeSheet(diff, base, proposed)` → `{ rows, csv }`: what electricians re-terminate,
 * CSV cells neutralised against formula injection.
 * The headless `diff` command is `diffCommand` (simulator/diff/cli.ts; the runner in scripts/cell-cli
 * passes it the file system and the streams).
 */
export type {
  CellDiff,
  DiffArea,
  DiffKind,
  DiffTarget,
  DiffEntry,
  DiffSummary,
  RoleBinding,
  IoChangeSheet,
} from './diff';
export { diffCells, ioChangeSheet, DIFF_AREAS } from './diff';
export { diffCommand } from './diff/cli';
// ---- end diff

// ---- proofs (interlock prover: simulator/prove/)
/**
 * Interlock rules over PLC bits (%IX/%QX/%MX) and their proofs. A rule is data a form builds:
 * `never` (never X while Y), `only-if` (X only if Y and Z …), `within` (after X, Y within N
 * scans); conditions are a bit with a wanted value combined with all / any / not
 * (`interlockRuleSchema`, `describeRule` for plain English, `signalLabels` for a cell's
 * device labels). `proveRules(document or sheet, rules, { maxDepth, budget })` → one
 * `Verdict` per rule: `proved` (k-induction or exhaustive), `violated` with the shortest
 * counterexample (one input vector per scan; replayed on the compiled sheet before it is
 * reported), or `undecided` with the bound reached; each names how counters, timers and
 * word blocks were encoded (exact, or abstracted as free). Pure and deterministic; the
 * caller limits wall time. `counterexampleEvents(cex, document)` turns a counterexample into
 * logged `force` events that replay it on a cell. The headless `prove` command is
 * `proveCommand` (simulator/prove/cli.ts; the runner in scripts/cell-cli passes it the file
 * system and the streams).
 */
export type { RuleCondition, InterlockRule, InterlockRuleInput, SignalLabels, Counterexample, Verdict } from './prove';
export { interlockRuleSchema, describeRule, ruleAddresses, signalLabels, proveRules, counterexampleEvents, counterexampleFailsAtMs } from './prove';
export { proveCommand } from './prove/cli';
// ---- end proofs

// ---- logic exchange (a logic sheet leaves and re-enters Cellwright: simulator/exchange/)
/**
 * Export and import of a logic sheet in open IEC formats (docs/engine.md, "Logic exchange").
 *
 * - `sheetToStructuredText(sheet, { programName?, title? })` → `Result<string>`: an IEC 61131-3
 *   Structured Text PROGRAM (located variables for %I/%Q/%M, FB instances with presets,
 *   statements in the engine's evaluation order; SCALE, WORD_OUT, set/reset coils and PREV
 *   blocks as commented expressions). Offer it as a `.st` download.
 * - `sheetToPlcXml(sheet, { programName?, projectName?, createdAt? })` → `Result<string>`: an
 *   IEC 61131-10 XML exchange document with an FBD body (`.xml`); pass `createdAt` (ISO 8601)
 *   as the export time, the engine has no clock. Element structure from memory of the standard.
 * - `plcXmlToSheet(xml, { programName?, defaultScanPeriodMs?, limits? })` → `Result<LogicSheet>`:
 *   the sheet back, validated, or every problem with a path into the document
 *   (`['project', 'types', 'pous', 'pou', <name>, 'body', 'FBD', 'block', <localId>, …]`).
 *   Guarded: size, tag, depth, element and connection caps (simulator/exchange), no DOCTYPE,
 *   no entity expansion. Our own exports round-trip exactly (every block, parameter, label,
 *   position and wire).
 * Both exporters fail with the sheet's own problems when the sheet does not validate.
 */
export { sheetToStructuredText, sheetToPlcXml, plcXmlToSheet, IEC_61131_10_NS } from './exchange';
// ---- end logic exchange
