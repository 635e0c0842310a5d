/**
 * Cellwright's simulation engine: the one public entry. The app, the server and the headless
 * runner import from here only. Everything exported is pure TypeScript: no DOM, no wall clock,
 * no unseeded randomness; a run is reproduced exactly from its document, event log and seed.
 *
 * Layers, bottom up: shared results → addresses and process image → electrical layer →
 * PLC (logic sheet, compiler) → controller (point map, motion, routine, machine) → cell
 * (composition on one clock) → fault cards → trace, rules, replay → demo cells.
 * Re-exported symbols carry their JSDoc from the module that defines them.
 */

// ---- results
/** Typed results and problems with paths (see simulator/shared/result.ts). */
export type { Problem, Result } from './shared/result';
export { ok, fail, problem, prefixProblems } from './shared/result';

// ---- addresses and process image (IEC 61131-3 direct addressing)
export type { Address, Area, Size, ProcessImage } from './address';
export {
  parseAddress,
  formatAddress,
  addressBitSpan,
  addressesOverlap,
  createProcessImage,
  cloneProcessImage,
  readAddress,
  writeAddress,
  toSigned,
  AREA_BYTES,
} from './address';

// ---- electrical layer
export type { InputType, InputReading, ContactKind, WireCondition, SensorOutput, InputModuleKind, SignalRange, AnalogModuleSpec, Ne43Status } from './electrical';
export {
  IEC_61131_2_BANDS,
  classifyDigitalInput,
  contactClosed,
  contactInputVolts,
  sensorInputVoltage,
  applyInvert,
  SIGNAL_SPANS,
  scaleLinear,
  currentToEngineering,
  voltageToEngineering,
  engineeringToSignal,
  signalToCounts,
  countsToSignal,
  ne43Status,
  ne43Valid,
  encodeWord,
  decodeWord,
} from './electrical';

// ---- PLC: logic sheet, catalogue, compiler
export type {
  PlcState,
  SerializedPlcState,
  BlockOutputs,
  OutputSlot,
  CompiledSheet,
  InterpretedSheet,
  LogicSheet,
  LogicSheetInput,
  SheetBlock,
  SheetConnection,
  BlockType,
  BlockSpec,
  PortSpec,
  PortType,
  BlockGroup,
} from './plc';
export {
  BLOCK_TYPES,
  blockCatalogue,
  blockPorts,
  isBlockType,
  portTypesCompatible,
  logicSheetSchema,
  MAX_BLOCKS,
  MAX_CONNECTIONS,
  validateSheet,
  compileSheet,
  interpretSheet,
  clonePlcState,
  serializePlcState,
  deserializePlcState,
} from './plc';

// ---- cell document
export type {
  CellDocument,
  PanelDevice,
  FieldDevice,
  Endpoint,
  WiringRow,
  PlcModule,
  ControllerModule,
  PointMapRow,
  PointFamily,
  RoutineStep,
  Condition,
  Pose,
  Handshake,
  ControllerConfig,
  LinkConfig,
  WordEncoding,
  ChannelRef,
} from './schema/cell-document';
export {
  CELL_SCHEMA_VERSION,
  cellDocumentSchema,
  panelDeviceSchema,
  fieldDeviceSchema,
  wiringRowSchema,
  pointMapRowSchema,
  routineStepSchema,
  poseSchema,
  deviceColourSchema,
} from './schema/cell-document';
export { CELL_LIMITS } from './schema/limits';
export type { TerminalSpec, TerminalKind } from './schema/terminals';
export { deviceTerminals } from './schema/terminals';
export type { ValidatedCell } from './schema/validate';
export { validateCellDocument, validateStagedRows, documentTooLarge } from './schema/validate';
export { cellJsonSchemas } from './schema/json-schema';

// ---- controller
export type { Coordinates } from './controller/motion';
export { moveTime, isTriangular, peakSpeed, positionAtTime, speedAtTime, brakingDistance, pathLength } from './controller/motion';
export type { PointMapState, ResolvedPoint, ResolvedPointMap, PointUse } from './controller/point-map';
export {
  FAMILY_MODULE_TYPE,
  parsePointRef,
  resolvePointMap,
  resolveLogical,
  resolvePhysical,
  validatePointMap,
  stagePointMap,
  discardStagedPointMap,
  restartPointMap,
} from './controller/point-map';
export type { Alarm, Motion, ControllerContext } from './controller/routine';
export type { ControllerEvent, ControllerInput, ControllerStateName } from './controller/controller.machine';
export { controllerMachine } from './controller/controller.machine';

// ---- cell
export type { Cell, CellOptions } from './cell/cell';
export { createCell } from './cell/cell';
export type { CellEvent, DownloadEvent, LoggedEvent } from './cell/events';
export { cellEventSchema, eventLogSchema } from './cell/events';
export type { CellSnapshot, DeviceSnapshot, WireSnapshot, PointValue, ControllerPointSnapshot } from './cell/snapshot';

// ---- fault cards
export type { FaultCard, FaultKind, SignalPredicate } from './faults/fault-card';
export { faultCardSchema, signalPredicateSchema, FAULT_KINDS, FAULT_SYMPTOMS } from './faults/fault-card';

// ---- trace, rules, replay
export type { Trace, TraceRecorder } from './trace/trace';
export { hashTrace, valuesAt, createTraceRecorder } from './trace/trace';
export { fnv1a64 } from './trace/hash';
export type { SignalValue, CompiledPredicate } from './trace/predicate';
export { compilePredicate, predicateSignals } from './trace/predicate';
export type { Rule, RuleResult } from './trace/rules';
export { ruleSchema, rulesSchema, checkRules, ruleSignals } from './trace/rules';
export type { ReplayResult } from './trace/replay';
export { replay } from './trace/replay';

// ---- demo cells
export type { CellDocumentInput } from './demo';
export { pickAndPlaceCell, starterCell, demoCells } from './demo';
/** The model debounce fix of the pick-and-place part input (a logic sheet to download) and its presets. */
export { pickAndPlaceDebouncedSheet, PART_DEBOUNCE_MS } from './demo';

// ---- diff (changeover: base vs proposed cell document)
/**
 * Structural diff of two cell documents and the I/O-list change sheet (simulator/diff/).
 * `diffCells(base, proposed)` → `CellDiff`: entries per area (`DIFF_AREAS`: cell, devices,
 * modules, wiring, pointMap, logic, routine, handshake), each `DiffEntry` with its kind
 * (added / removed / changed / moved / reordered), target, id, document path, detail line and
 * field changes, plus a `summary` of counts per area for a signed record.
 * `ioChangeSheet(diff, base, proposed)` → `{ rows, csv }`: what electricians re-terminate,
 * CSV cells neutralised against formula injection (`neutraliseCsvCell`).
 * The headless `diff` command is `diffCommand` in simulator/diff/cli.ts.
 */
export type {
  CellDiff,
  DiffArea,
  DiffKind,
  DiffTarget,
  DiffEntry,
  DiffSummary,
  AreaCounts,
  FieldChange,
  WireEndChange,
  RoleBinding,
  IoChangeAction,
  IoChangeRow,
  IoChangeSheet,
} from './diff';
export { diffCells, ioChangeSheet, ioChangeCsv, neutraliseCsvCell, IO_CHANGE_COLUMNS, DIFF_AREAS, DIFF_KINDS, DIFF_FORMAT_VERSION } from './diff';
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
 * `proveCommand` in simulator/prove/cli.ts.
 */
export type { RuleCondition, InterlockRule, InterlockRuleInput, SignalLabels, EncodingNote, ProveOptions, Counterexample, Verdict } from './prove';
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
  proveRules,
  PROVE_DEFAULTS,
  counterexampleEvents,
  counterexampleFailsAtMs,
} from './prove';
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
 *   Guarded: size, tag, depth, element and connection caps (`PLC_XML_LIMITS`), no DOCTYPE,
 *   no entity expansion. Our own exports round-trip exactly (every block, parameter, label,
 *   position and wire).
 * Both exporters fail with the sheet's own problems when the sheet does not validate.
 */
export type { StructuredTextOptions, PlcXmlExportOptions, PlcXmlImportOptions, PlcXmlLimits } from './exchange';
export { sheetToStructuredText, sheetToPlcXml, plcXmlToSheet, PLC_XML_LIMITS, IEC_61131_10_NS, CELLWRIGHT_NS } from './exchange';
// ---- end logic exchange
