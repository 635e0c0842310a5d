/**
 * Whole-document validation: the zod schema first (every structural problem with its path),
 * then cross-references (ids, wiring, modules, point map, routine, logic sheet). Never throws:
 * any input, however malformed, yields a typed result listing every problem found.
 */
import type { z } from 'zod';
import type { Problem, Result } from '@/simulator/shared/result';
import { issuesToProblems } from '@/simulator/shared/zod-problems';
import type { CompiledSheet } from '@/simulator/plc';
import { compileSheetWith } from '@/simulator/plc/compile';
import type { AnalogSpanOf } from '@/simulator/plc/validate';
import { countRange } from '@/simulator/electrical';
import { cellDocumentSchema, type CellDocument, type ControllerConfig, type PointMapRow } from './cell-document';
import { CELL_LIMITS } from './limits';
import { plcModuleBytes, plcModuleFor } from './plc-io';
import { documentWarnings } from './warnings';
import { upgradeCellDocument } from './upgrade';
import { planRow, sinkKeys, wiringLookups, type RowPlan } from './wiring-plan';
import { INPUT_FAMILIES, parsePointRef, validatePointMap, type PointUse } from '@/simulator/controller/point-map';

/** A document that passed validation, with its compiled sheet, wiring plans and warnings (schema/warnings.ts). */
export type ValidatedCell = { document: CellDocument; sheet: CompiledSheet; plans: RowPlan[]; warnings: Problem[] };

/** Maps zod issues to problems with stable codes (the document's names for unions, sizes, negatives). */
export function zodProblems(issues: readonly z.core.$ZodIssue[], prefix: (string | number)[] = []): Problem[] {
  return issuesToProblems(issues, prefix, (issue, path) => {
    if (issue.code === 'invalid_union' && 'discriminator' in issue) return path.includes('blocks') ? 'unknown_block_type' : 'unknown_type';
    if (issue.code === 'too_big' && (issue.origin === 'array' || issue.origin === 'string')) return 'too_large';
    if (issue.code === 'too_small' && issue.origin === 'number' && Number(issue.minimum) === 0) return 'negative_value';
    return undefined;
  });
}

/**
 * Validates a cell document of unknown shape. A document of an older schema version is
 * upgraded first (`upgradeCellDocument`). On success returns the parsed document (at the
 * current version) with its compiled logic sheet and wiring plans; on failure every problem
 * with its path.
 */
export function validateCellDocument(input: unknown): Result<ValidatedCell, Problem> {
  try {
    return validateInner(upgradeCellDocument(input));
  } catch (e) {
    // Defensive: a validator must never crash its caller, whatever the input.
    return { ok: false, errors: [{ path: [], code: 'internal_error', message: `validation failed unexpectedly: ${e instanceof Error ? e.message : String(e)}` }] };
  }
}

function validateInner(input: unknown): Result<ValidatedCell, Problem> {
  const parsed = cellDocumentSchema.safeParse(input);
  if (!parsed.success) return { ok: false, errors: partialProblems(input, zodProblems(parsed.error.issues)) };
  const doc = parsed.data;
  const problems: Problem[] = [];
  checkDevices(doc.panel, doc.field, problems);
  uniq(problems, doc.wiring.map((r, i) => ({ id: r.id, path: ['wiring', i, 'id'] })), 'wiring row');
  checkPlcModules(doc.plc.modules, problems);
  checkController(doc.controller, problems);

  // Logic sheet: the PLC layer reports unknown blocks, dangling connections and loops.
  const compiled = compileSheetWith(doc.plc.sheet, { analogSpan: analogSpanOf(doc.plc.modules) });
  if (!compiled.ok) problems.push(...compiled.errors.map((p) => ({ ...p, path: ['plc', 'sheet', ...p.path] })));
  else if (!Number.isInteger(compiled.value.scanPeriodMs)) {
    problems.push({ path: ['plc', 'sheet', 'scanPeriodMs'], code: 'invalid_scan_period', message: 'the cell clock steps in whole milliseconds: the scan period must be an integer' });
  }

  // Wiring.
  const lk = wiringLookups(doc);
  const plans: RowPlan[] = [];
  const sinks = new Map<string, string>();
  doc.wiring.forEach((row, i) => {
    const plan = planRow(doc, lk, row, i, problems);
    if (!plan) return;
    plans.push(plan);
    for (const k of sinkKeys(plan)) {
      const other = sinks.get(k);
      if (other && other !== row.id) {
        problems.push({ path: ['wiring', i, 'to'], code: 'duplicate_destination', message: `rows "${other}" and "${row.id}" both drive the same input`, related: [other, row.id] });
        break;
      }
      sinks.set(k, row.id);
    }
  });

  // Initial state names real devices.
  for (const id of Object.keys(doc.initial.devices ?? {})) {
    if (!lk.devices.has(id)) problems.push({ path: ['initial', 'devices', id], code: 'unknown_device', message: `no device "${id}"` });
  }

  if (problems.length > 0 || !compiled.ok) return { ok: false, errors: problems };
  return { ok: true, value: { document: doc, sheet: compiled.value, plans, warnings: documentWarnings(doc) } };
}

/**
 * When the document as a whole does not parse, the sections that do parse on their own are
 * still checked, so one pass reports shape problems and cross-reference problems together.
 * Checks that need a section which failed are skipped (they would only report noise).
 */
function partialProblems(input: unknown, shape: Problem[]): Problem[] {
  const problems = [...shape];
  if (!input || typeof input !== 'object') return problems;
  const raw = input as Record<string, unknown>;
  const shapeOf = cellDocumentSchema.shape;
  const panel = shapeOf.panel.safeParse(raw.panel);
  const field = shapeOf.field.safeParse(raw.field);
  if (panel.success && field.success) checkDevices(panel.data, field.data, problems);
  const plc = (raw.plc ?? {}) as Record<string, unknown>;
  const modules = shapeOf.plc.shape.modules.safeParse(plc.modules);
  if (modules.success) checkPlcModules(modules.data, problems);
  const controller = shapeOf.controller.safeParse(raw.controller);
  if (controller.success) checkController(controller.data, problems);
  if (plc.sheet !== undefined && !shape.some((p) => p.path[0] === 'plc' && p.path[1] === 'sheet')) {
    const compiled = compileSheetWith(plc.sheet, { analogSpan: modules.success ? analogSpanOf(modules.data) : undefined });
    if (!compiled.ok) problems.push(...compiled.errors.map((p) => ({ ...p, path: ['plc', 'sheet', ...p.path] })));
  }
  const seen = new Set<string>();
  return problems.filter((p) => {
    const key = `${p.path.join('.')}|${p.code}|${p.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

/**
 * The raw span of the analog input module behind an address: 0 at the bottom of its nominal
 * span, the top of its count range (its declared format) at the top. A SPAN_MAP reading it
 * through a WORD_IN without a span of its own takes this one.
 */
function analogSpanOf(modules: CellDocument['plc']['modules']): AnalogSpanOf {
  return (address) => {
    const hit = plcModuleFor(modules, address);
    if (!hit || hit.module.kind !== 'analog-in') return null;
    return { lo: 0, hi: countRange({ bits: hit.module.resolutionBits, format: hit.module.format }).spanMax };
  };
}

function checkDevices(panel: CellDocument['panel'], field: CellDocument['field'], problems: Problem[]): void {
  uniq(problems, [...panel.map((d, i) => ({ id: d.id, path: ['panel', i, 'id'] })), ...field.map((d, i) => ({ id: d.id, path: ['field', i, 'id'] }))], 'device');
  panel.forEach((d, i) => {
    if (d.type === 'potentiometer' && !(d.max > d.min)) problems.push({ path: ['panel', i, 'max'], code: 'invalid_span', message: `potentiometer "${d.id}": max must be above min` });
  });
}

function checkPlcModules(modules: CellDocument['plc']['modules'], problems: Problem[]): void {
  uniq(problems, modules.map((m, i) => ({ id: m.id, path: ['plc', 'modules', i, 'id'] })), 'PLC module');
  // Modules may not overlap in their area.
  const spans = modules.map((m, i) => ({ m, i, area: m.kind === 'digital-out' ? 'Q' : 'I', span: plcModuleBytes(m) }));
  for (const a of spans) {
    for (const b of spans) {
      if (b.i <= a.i || a.area !== b.area) continue;
      if (a.span[0] <= b.span[1] && b.span[0] <= a.span[1]) {
        problems.push({ path: ['plc', 'modules', b.i, 'address'], code: 'module_overlap', message: `PLC modules "${a.m.id}" and "${b.m.id}" share addresses`, related: [a.m.id, b.m.id] });
      }
    }
  }
}

function checkController(c: ControllerConfig, problems: Problem[]): void {
  uniq(problems, c.modules.map((m, i) => ({ id: m.id, path: ['controller', 'modules', i, 'id'] })), 'controller module');
  uniq(problems, c.poses.map((p, i) => ({ id: p.id, path: ['controller', 'poses', i, 'id'] })), 'pose');
  uniq(problems, c.routine.flatMap((s, i) => (s.label ? [{ id: s.label, path: ['controller', 'routine', i, 'label'] }] : [])), 'step label');
  // One module per rack/slot; analog modules need their signal range.
  const slots = new Map<string, string>();
  c.modules.forEach((m, i) => {
    const k = `${m.rack}.${m.slot}`;
    const other = slots.get(k);
    if (other) problems.push({ path: ['controller', 'modules', i, 'slot'], code: 'slot_taken', message: `rack ${m.rack} slot ${m.slot} already holds "${other}"`, related: [other, m.id] });
    else slots.set(k, m.id);
    if ((m.type === 'analog-in' || m.type === 'analog-out') && !m.signal) {
      problems.push({ path: ['controller', 'modules', i, 'signal'], code: 'missing_signal', message: `analog module "${m.id}" needs a signal range` });
    }
  });
  const poseIds = new Set(c.poses.map((p) => p.id));
  if (!poseIds.has(c.homePose)) problems.push({ path: ['controller', 'homePose'], code: 'unknown_pose', message: `home pose "${c.homePose}" is not among the poses` });
  c.poses.forEach((p, i) => {
    if (p.coordinates.length !== c.axes) problems.push({ path: ['controller', 'poses', i, 'coordinates'], code: 'axes_mismatch', message: `pose "${p.id}" has ${p.coordinates.length} coordinates; the controller has ${c.axes} axes` });
  });
  const labels = new Set(c.routine.flatMap((s) => (s.label ? [s.label] : [])));
  const uses = pointUses(c, problems);
  c.routine.forEach((s, i) => {
    const path = ['controller', 'routine', i];
    if (s.kind === 'set-word' && !s.point.startsWith('WO')) problems.push({ path: [...path, 'point'], code: 'not_a_word', message: `set-word needs a WO point, not ${s.point}` });
    if (s.kind === 'move' && !poseIds.has(s.pose)) problems.push({ path: [...path, 'pose'], code: 'unknown_pose', message: `no pose "${s.pose}"` });
    if (s.kind === 'jump' || s.kind === 'branch') {
      const ok = typeof s.to === 'number' ? s.to < c.routine.length : labels.has(s.to);
      if (!ok) problems.push({ path: [...path, 'to'], code: 'unknown_step', message: `no step ${typeof s.to === 'number' ? s.to : `labelled "${s.to}"`}` });
    }
  });
  problems.push(...validatePointMap(c.pointMap, c.modules, uses, ['controller', 'pointMap']));
  if (c.staged) problems.push(...validatePointMap(c.staged, c.modules, uses, ['controller', 'staged']));
}

/**
 * Every logical point the routine and the handshake use, with the path of each use (a
 * staged map must keep them mapped too). With `problems`, also reports a routine or
 * handshake output on an input point and a handshake input on an output point.
 */
export function pointUses(c: ControllerConfig, problems?: Problem[]): PointUse[] {
  const uses: PointUse[] = [];
  const output = (ref: string, path: (string | number)[]) => {
    uses.push({ ref, path });
    const p = parsePointRef(ref);
    if (problems && p && INPUT_FAMILIES.has(p.family)) problems.push({ path, code: 'writes_input', message: `${ref} is an input point; only outputs can be driven` });
  };
  c.routine.forEach((s, i) => {
    const path = ['controller', 'routine', i];
    if (s.kind === 'wait' || s.kind === 'branch') uses.push({ ref: s.condition.point, path: [...path, 'condition', 'point'] });
    else if (s.kind === 'set' || s.kind === 'pulse' || s.kind === 'set-word') output(s.point, [...path, 'point']);
  });
  for (const [role, ref] of Object.entries(c.handshake.inputs)) {
    if (!ref) continue;
    const p = parsePointRef(ref);
    if (problems && p && !INPUT_FAMILIES.has(p.family)) problems.push({ path: ['controller', 'handshake', 'inputs', role], code: 'not_an_input', message: `${role} needs an input point, not ${ref}` });
    uses.push({ ref, path: ['controller', 'handshake', 'inputs', role] });
  }
  for (const [role, ref] of Object.entries(c.handshake.outputs)) if (ref) output(ref, ['controller', 'handshake', 'outputs', role]);
  return uses;
}

function uniq(problems: Problem[], items: { id: string; path: (string | number)[] }[], what: string): void {
  const seen = new Set<string>();
  for (const it of items) {
    if (seen.has(it.id)) problems.push({ path: it.path, code: 'duplicate_id', message: `${what} id "${it.id}" is used more than once`, related: [it.id] });
    seen.add(it.id);
  }
}

/**
 * Validates a staged point-map edit against a valid document's modules and point uses
 * (an edit that would leave a used point unmapped is refused now, not at the restart).
 */
export function validateStagedRows(doc: CellDocument, rows: unknown): Result<PointMapRow[], Problem> {
  const wrapped = cellDocumentSchema.shape.controller.shape.pointMap.safeParse(rows);
  if (!wrapped.success) return { ok: false, errors: zodProblems(wrapped.error.issues, ['rows']) };
  const problems = validatePointMap(wrapped.data, doc.controller.modules, pointUses(doc.controller), ['rows']);
  return problems.length > 0 ? { ok: false, errors: problems } : { ok: true, value: wrapped.data };
}

/** Rough size of a parsed JSON value in characters, without serialising it (limits walk depth). */
export function documentTooLarge(text: string): Problem | null {
  return text.length > CELL_LIMITS.documentChars
    ? { path: [], code: 'too_large', message: `the document has ${text.length} characters; the limit is ${CELL_LIMITS.documentChars}` }
    : null;
}
