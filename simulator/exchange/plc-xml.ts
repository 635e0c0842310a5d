/**
 * Logic sheet ⇄ IEC 61131-10 XML exchange document (FBD body).
 *
 * Export: the sheet is validated, each block becomes its FBD elements (./block-codecs.ts),
 * each wire a `connection` on the input it drives, and the scan period the interval of the
 * task that runs the program. Elements appear in the sheet's block order (so the engine's
 * evaluation order, which breaks ties by that order, survives) and carry `executionOrderId`
 * in the order the engine evaluates them.
 *
 * Import: the document is parsed under guards (./xml-dom.ts), the program read
 * (./xml-read.ts), elements grouped by block and decoded, wires rebuilt, and the sheet
 * validated like any other; every problem carries a document path with the element's
 * localId. Elements without Cellwright data (from another tool) are read by their standard
 * meaning where that is unambiguous (see `inferBlockType`).
 */
import { isBlockType, type BlockType } from '@/simulator/plc/catalogue';
import { MAX_BLOCKS, MAX_CONNECTIONS, type LogicSheet, type LogicSheetInput, type SheetBlock } from '@/simulator/plc/sheet-schema';
import { analyseSheet, validateSheet } from '@/simulator/plc/validate';
import type { Problem, Result } from '@/simulator/shared/result';
import { codecFor, inferBlockType, needsName, type DecodeContext, type EncodeContext, type EncodedBlock, type PinRef } from './block-codecs';
import { elementInputs, pinKey, type FbdElement, type FbdProgram, type InterfaceVariable, type WireMeta } from './fbd-model';
import { createNamer, formatTime, parseTime } from './iec-text';
import { parseXml } from './xml-dom';
import { readProgram } from './xml-read';
import { writePlcXml } from './xml-write';

/** Options of {@link sheetToPlcXml}. */
export type PlcXmlExportOptions = {
  /** Name of the program POU (made into an IEC identifier); default `CellLogic`. */
  programName?: string;
  /** The contentHeader name; default the program name. */
  projectName?: string;
  /**
   * The fileHeader's creationDateTime (ISO 8601). The engine has no clock of its own, so the
   * caller passes the export time; the default (the Unix epoch) keeps the output deterministic.
   */
  createdAt?: string;
};

/** Limits of {@link plcXmlToSheet}; each exceeded limit is a `too_large` problem. */
export type PlcXmlLimits = {
  maxChars: number;
  maxTags: number;
  maxDepth: number;
  maxElements: number;
  maxConnections: number;
};

/**
 * Default import limits, sized for the largest sheet the schema allows: a block is at most
 * four FBD elements (SET_COIL with an unwired IN) with at most three wires of its own.
 * Measured exports of full-size sheets: 20,000 blocks and 80,000 wires, 51 M characters and
 * 1.1 M tags; 20,000 SET_COILs with 200-character labels, 56 M characters and 1.2 M tags.
 * Cost on a shared 2-core machine: about 27 s to export and 20 s to import the first, so
 * big sheets belong in a worker; a 200-block sheet takes a fraction of a second.
 */
export const PLC_XML_LIMITS: Readonly<PlcXmlLimits> = Object.freeze({
  maxChars: 64 * 1024 * 1024,
  maxTags: 4 * 1024 * 1024,
  maxDepth: 64,
  maxElements: 4 * MAX_BLOCKS,
  maxConnections: MAX_CONNECTIONS + 3 * MAX_BLOCKS,
});

/** Options of {@link plcXmlToSheet}. */
export type PlcXmlImportOptions = {
  /** Which program POU to read (case-insensitive); default the first. */
  programName?: string;
  /** Scan period when no task runs the program; default 10 ms. */
  defaultScanPeriodMs?: number;
  /** Tighter (or, for trusted files, looser) limits than {@link PLC_XML_LIMITS}. */
  limits?: Partial<PlcXmlLimits>;
};

const DEFAULT_PROGRAM = 'CellLogic';

/**
 * Exports a logic sheet as an IEC 61131-10 XML exchange document with an FBD body.
 * Fails with the sheet's own problems when it does not validate.
 */
export function sheetToPlcXml(sheet: LogicSheetInput, options: PlcXmlExportOptions = {}): Result<string, Problem> {
  const analysed = analyseSheet(sheet);
  if (!analysed.ok) return analysed;
  const a = analysed.value;
  const blocks = a.sheet.blocks;
  const programName = createNamer().name(options.programName ?? DEFAULT_PROGRAM);
  const namer = createNamer([programName]);
  const index = new Map(blocks.map((b, i) => [b.id, i]));
  const names = new Map<string, string>();
  for (const b of blocks) if (needsName(b.type)) names.set(b.id, namer.name(b.id));

  let nextId = 1;
  const variables: InterfaceVariable[] = [];
  const ctx: EncodeContext = {
    nextId: () => nextId++,
    nameOf: (b) => names.get(b.id) as string,
    declare: (v) => variables.push(v),
    connected: (b, port) => a.drivers[index.get(b.id) as number].has(port),
  };
  const encoded: EncodedBlock[] = blocks.map((b) => codecFor(b.type).encode(b, ctx));
  const elements = encoded.flatMap((e) => e.elements);
  const byLocalId = new Map(elements.map((el) => [el.localId, el]));

  // Execution order: the engine's block order; previous-scan writes after everything else.
  let order = 0;
  const remember: FbdElement[] = [];
  for (const i of a.order) {
    for (const el of encoded[i].elements) {
      if (el.meta?.kind === 'part' && el.meta.role === 'remember') remember.push(el);
      else el.executionOrderId = order++;
    }
  }
  for (const el of remember) el.executionOrderId = order++;

  /** The element pin a sheet output really comes from: a coil's Q is its IN's source. */
  const sourceOf = (blockIndex: number, port: string): { ref: PinRef; through: boolean } => {
    let i = blockIndex;
    let p = port;
    let through = false;
    for (;;) {
      const out = encoded[i].outputs[p];
      if (!('passThrough' in out)) return { ref: out, through };
      through = true;
      const driver = a.drivers[i].get(out.passThrough);
      if (!driver) return { ref: encoded[i].defaults[out.passThrough], through };
      i = driver.block;
      p = driver.port;
    }
  };
  a.sheet.connections.forEach((c, seq) => {
    const to = encoded[index.get(c.to.block) as number].inputs[c.to.port];
    const { ref, through } = sourceOf(index.get(c.from.block) as number, c.from.port);
    const wire: WireMeta = through ? { id: c.id, seq, fromBlock: c.from.block, fromPort: c.from.port } : { id: c.id, seq };
    const input = elementInputs(byLocalId.get(to.localId) as FbdElement).find((p) => p.pin === to.pin);
    if (input) input.connection = { ref: ref.localId, pin: ref.pin, wire };
  });

  const program: FbdProgram = { name: programName, variables, elements, taskInterval: formatTime(a.sheet.scanPeriodMs) };
  return { ok: true, value: writePlcXml(program, { projectName: options.projectName ?? programName, createdAt: options.createdAt ?? '1970-01-01T00:00:00Z' }) };
}

type Path = (string | number)[];
type Endpoint = { block: string; port: string };

/**
 * Imports a logic sheet from an IEC 61131-10 XML exchange document: the program's FBD body
 * becomes blocks and connections, validated like any sheet. Returns the sheet (defaults
 * applied) or every problem found, each with a path into the document.
 */
export function plcXmlToSheet(xml: string, options: PlcXmlImportOptions = {}): Result<LogicSheet, Problem> {
  const limits = { ...PLC_XML_LIMITS, ...options.limits };
  const dom = parseXml(xml, limits);
  if (!dom.ok) return dom;
  const read = readProgram(dom.value, limits, options.programName);
  if (!read.ok) return read;
  const { program, paths } = read.value;
  const problems: Problem[] = [...read.value.problems];
  // Elements that could not be read or decoded: their wires are not reported again.
  const failed = new Set(read.value.skipped);
  const report = (path: Path, code: string, message: string) => problems.push({ path, code, message });
  const pathOf = (el: FbdElement): Path => paths.get(el.localId) ?? [];
  const fbdPath = ['project', 'types', 'pous', 'pou', program.name, 'body', 'FBD'];

  // Group helper elements under the block they belong to.
  const owners: FbdElement[] = [];
  const parts = new Map<string, Map<string, FbdElement>>();
  const defaults = new Set<number>();
  for (const el of program.elements) {
    if (el.meta?.kind !== 'part') {
      owners.push(el);
      continue;
    }
    const roles = parts.get(el.meta.of) ?? new Map<string, FbdElement>();
    if (roles.has(el.meta.role)) report(pathOf(el), 'duplicate_part', `block "${el.meta.of}" has two "${el.meta.role}" parts`);
    roles.set(el.meta.role, el);
    parts.set(el.meta.of, roles);
    if (el.meta.role === 'default') defaults.add(el.localId);
  }
  if (owners.length > MAX_BLOCKS) {
    report(fbdPath, 'too_large', `the program has ${owners.length} blocks; a sheet holds at most ${MAX_BLOCKS}`);
    return { ok: false, errors: problems };
  }

  const variables = new Map(program.variables.map((v) => [v.name.toUpperCase(), v]));
  const ctx: DecodeContext = {
    variable: (name) => variables.get(name.trim().toUpperCase()),
    report,
    pathOf,
    pathOfVariable: (v) => ['project', 'types', 'pous', 'pou', program.name, 'interface', 'variable', v.name],
  };
  const ids = uniqueIds(owners.flatMap((el) => (el.meta?.kind === 'block' ? [el.meta.id] : [])));
  const blocks: SheetBlock[] = [];
  const blockPaths: Path[] = [];
  const inputs = new Map<string, Endpoint>();
  const outputs = new Map<string, Endpoint>();
  const internal = new Set<string>();
  const owned = new Set<string>();
  for (const el of owners) {
    const meta = el.meta?.kind === 'block' ? el.meta : undefined;
    // Our own older exports name SPAN_MAP by its former name.
    const metaType = meta?.type === 'SCALE' ? 'SPAN_MAP' : meta?.type;
    const type: BlockType | undefined = meta ? (metaType !== undefined && isBlockType(metaType) ? metaType : undefined) : inferBlockType(el);
    if (!type) {
      failed.add(el.localId);
      const what = meta ? `block type "${meta.type}"` : el.kind === 'block' ? `block type "${el.typeName}"` : `${el.kind} "${el.expression}"`;
      report([...pathOf(el), meta ? 'type' : el.kind === 'block' ? 'typeName' : 'expression'], 'unknown_block_type', `${what} has no Cellwright block (the catalogue lacks it)`);
      continue;
    }
    const id = meta ? meta.id : ids.fresh(el.kind === 'block' && el.instanceName ? el.instanceName : `${el.kind === 'block' ? 'block' : el.kind === 'inVariable' ? 'in' : 'out'}${el.localId}`);
    owned.add(id);
    const d = codecFor(type).decode(el, parts.get(id) ?? new Map(), ctx, type);
    if (!d) {
      failed.add(el.localId);
      for (const part of parts.get(id)?.values() ?? []) failed.add(part.localId);
      continue;
    }
    const block = { id, type, position: el.position, params: d.params } as SheetBlock;
    if (meta?.label !== undefined) block.label = meta.label;
    blocks.push(block);
    blockPaths.push(pathOf(el));
    for (const [key, port] of d.inputs) inputs.set(key, { block: id, port });
    for (const [key, port] of d.outputs) outputs.set(key, { block: id, port });
    for (const key of d.internal) internal.add(key);
  }
  for (const [of, roles] of parts) {
    if (!owned.has(of)) for (const el of roles.values()) report(pathOf(el), 'orphan_part', `this element belongs to block "${of}", which the document does not hold`);
  }

  // Wires: every connection into a block's input pin that is not inside the block itself.
  const known = new Set(program.elements.map((el) => el.localId));
  const wireIds = uniqueIds(program.elements.flatMap((el) => elementInputs(el).flatMap((p) => (p.connection?.wire ? [p.connection.wire.id] : []))));
  const wires: { id: string; from: Endpoint; to: Endpoint; seq: number; path: Path }[] = [];
  for (const el of program.elements) {
    for (const input of elementInputs(el)) {
      const c = input.connection;
      const key = pinKey(el.localId, input.pin);
      if (!c || internal.has(key) || failed.has(el.localId) || failed.has(c.ref)) continue;
      const path: Path = [...pathOf(el), ...(el.kind === 'block' ? ['inputVariables', input.pin ?? ''] : ['connectionPointIn']), 'connection'];
      const to = inputs.get(key);
      if (!to) {
        report(path, 'unknown_port', `nothing on the sheet takes the input ${input.pin ?? ''} of element ${el.localId}`);
        continue;
      }
      // A default part stands for an unwired input; a wire with its own source names it.
      if (defaults.has(c.ref) && !c.wire?.fromBlock) continue;
      const from = c.wire?.fromBlock !== undefined ? { block: c.wire.fromBlock, port: c.wire.fromPort as string } : outputs.get(pinKey(c.ref, c.pin));
      if (!from) {
        const why = known.has(c.ref) ? `element ${c.ref} has no output ${c.pin ?? ''} a sheet wire can start at` : `refLocalId ${c.ref} names no element`;
        report(path, known.has(c.ref) ? 'unknown_port' : 'dangling_connection', why);
        continue;
      }
      wires.push({ id: c.wire ? c.wire.id : wireIds.fresh(`w${wires.length + 1}`), from, to, seq: c.wire?.seq ?? Number.MAX_SAFE_INTEGER, path });
    }
  }
  // The sheet's own wire order, where the document records it (a stable sort keeps the rest in document order).
  wires.sort((x, y) => x.seq - y.seq);

  let scanPeriodMs = options.defaultScanPeriodMs ?? 10;
  const intervalPath = ['project', 'instances', 'configurations', 'configuration', 'resource', 'task', 'interval'];
  if (program.taskInterval !== undefined) {
    const ms = parseTime(program.taskInterval);
    if (ms === undefined) report(intervalPath, 'invalid_value', `task interval "${program.taskInterval}" is not a TIME literal`);
    else scanPeriodMs = ms;
  }
  if (problems.length > 0) return { ok: false, errors: problems };

  const sheet = { scanPeriodMs, blocks, connections: wires.map(({ id, from, to }) => ({ id, from, to })) };
  const validated = validateSheet(sheet);
  if (validated.ok) return validated;
  // Point each problem at the document: blocks and wires by their element's path.
  const locate = (p: Path): Path => {
    const [head, i, ...rest] = p;
    if (head === 'blocks' && typeof i === 'number' && blockPaths[i]) return [...blockPaths[i], ...rest];
    if (head === 'connections' && typeof i === 'number' && wires[i]) return [...wires[i].path, ...rest];
    if (head === 'scanPeriodMs') return intervalPath;
    return p;
  };
  return { ok: false, errors: validated.errors.map((e) => ({ ...e, path: locate(e.path) })) };
}

/** Hands out ids that do not collide with the ones the document names itself. */
function uniqueIds(taken: string[]): { fresh(base: string): string } {
  const used = new Set(taken);
  return {
    fresh(base: string) {
      const stem = base.replace(/[^A-Za-z0-9_.:-]/g, '_').slice(0, 56) || 'b';
      let id = stem;
      for (let k = 2; used.has(id); k++) id = `${stem}_${k}`;
      used.add(id);
      return id;
    },
  };
}
