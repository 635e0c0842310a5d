/**
 * Reads the program of an IEC 61131-10 exchange document (as a namespaced tree from
 * ./xml-dom.ts) into an {@link FbdProgram}. Structure as recalled from memory of the
 * standard (see ./xml-write.ts); every problem carries a path of element names with the
 * FBD element's localId, e.g. `['project', 'types', 'pous', 'pou', 'Main', 'body', 'FBD',
 * 'block', 12, 'inputVariables', 'IN1']`.
 */
import type { Problem, Result } from '@/simulator/shared/result';
import { CELLWRIGHT_NS, IEC_61131_10_NS, type ElementMeta, type FbdConnection, type FbdElement, type FbdInput, type FbdProgram, type InitialValue, type InterfaceVariable, type WireMeta } from './fbd-model';
import { child, childrenNamed, type XmlNode } from './xml-dom';

/** Element and connection counts an import accepts. */
export type ProgramLimits = { maxElements: number; maxConnections: number };

/**
 * The program, the document path of each FBD element by localId, and the problems of
 * single elements (which do not stop the import, so every problem can be reported):
 * `skipped` holds the localIds of elements that exist but could not be read.
 */
export type ReadProgram = { program: FbdProgram; paths: Map<number, (string | number)[]>; problems: Problem[]; skipped: Set<number> };

type Path = (string | number)[];

const isTrue = (v: string | undefined) => v === 'true' || v === '1';

/** Finds the program POU (the first, or the one named) and reads it; fails only when there is no program to read. */
export function readProgram(root: XmlNode, limits: ProgramLimits, programName?: string): Result<ReadProgram, Problem> {
  const problems: Problem[] = [];
  const report = (path: Path, code: string, message: string) => problems.push({ path, code, message });
  const failed = (): Result<ReadProgram, Problem> => ({ ok: false, errors: problems });
  if (root.name !== 'project' || root.ns !== IEC_61131_10_NS) {
    report(['project'], 'not_an_exchange_document', `expected <project> in namespace "${IEC_61131_10_NS}", found <${root.name}> in "${root.ns}"`);
    return failed();
  }
  const programs = childrenNamed(child(child(root, 'types'), 'pous') ?? root, 'pou').filter((p) => p.attrs.pouType === 'program');
  const pou = programName === undefined ? programs[0] : programs.find((p) => p.attrs.name?.toUpperCase() === programName.toUpperCase());
  if (!pou) {
    report(['project', 'types', 'pous'], 'no_program', programName === undefined ? 'the document has no pou with pouType="program"' : `the document has no program "${programName}"`);
    return failed();
  }
  const name = pou.attrs.name ?? '';
  const base: Path = ['project', 'types', 'pous', 'pou', name];
  const variables = readInterface(child(pou, 'interface'), [...base, 'interface'], report);
  const body = child(pou, 'body');
  const fbd = child(body, 'FBD');
  if (!fbd) {
    const found = body?.children[0]?.name;
    report([...base, 'body'], 'no_fbd_body', found ? `the program's body is ${found}; only FBD bodies are imported` : 'the program has no FBD body');
    return failed();
  }
  const fbdPath: Path = [...base, 'body', 'FBD'];
  const nodes = fbd.children.filter((c) => !(c.name === 'comment' && c.ns === fbd.ns));
  if (nodes.length > limits.maxElements) {
    report(fbdPath, 'too_large', `the FBD body has ${nodes.length} elements; at most ${limits.maxElements} are accepted`);
    return failed();
  }
  const elements: FbdElement[] = [];
  const paths = new Map<number, Path>();
  const skipped = new Set<number>();
  let connections = 0;
  nodes.forEach((node, index) => {
    const idText = node.attrs.localId;
    const localId = idText !== undefined && /^\d{1,15}$/.test(idText) ? Number(idText) : undefined;
    const path: Path = [...fbdPath, node.name, localId ?? index];
    if (node.ns !== fbd.ns || !['block', 'inVariable', 'outVariable'].includes(node.name)) {
      report(path, 'unsupported_element', `<${node.name}> is not imported; a Cellwright sheet holds blocks, inVariables and outVariables`);
      if (localId !== undefined) skipped.add(localId);
      return;
    }
    if (localId === undefined) {
      report(path, 'invalid_local_id', `localId "${idText ?? ''}" is not a whole number`);
      return;
    }
    if (paths.has(localId)) {
      report(path, 'duplicate_local_id', `localId ${localId} is used more than once`);
      return;
    }
    paths.set(localId, path);
    const el = readElement(node, localId, path, report);
    if (!el) {
      skipped.add(localId);
      return;
    }
    if (el.kind !== 'inVariable') connections += (el.kind === 'block' ? el.inputs : [el.input]).filter((p) => p.connection).length;
    elements.push(el);
  });
  if (connections > limits.maxConnections) {
    report(fbdPath, 'too_large', `the FBD body has ${connections} connections; at most ${limits.maxConnections} are accepted`);
    return failed();
  }
  const program: FbdProgram = { name, variables, elements };
  const interval = taskInterval(root, name);
  if (interval !== undefined) program.taskInterval = interval;
  return { ok: true, value: { program, paths, problems, skipped } };
}

function readInterface(node: XmlNode | undefined, path: Path, report: (p: Path, c: string, m: string) => void): InterfaceVariable[] {
  const out: InterfaceVariable[] = [];
  for (const section of node?.children ?? []) {
    for (const v of childrenNamed(section, 'variable')) {
      const name = v.attrs.name;
      const type = child(v, 'type')?.children[0];
      if (!name || !type) {
        report([...path, section.name, name ?? ''], 'invalid_variable', 'a variable needs a name and a type');
        continue;
      }
      const derived = type.name === 'derived';
      const variable: InterfaceVariable = { name, type: derived ? (type.attrs.name ?? '') : type.name, derived };
      const initial = readInitial(child(v, 'initialValue'));
      if (initial) variable.initial = initial;
      out.push(variable);
    }
  }
  return out;
}

function readInitial(node: XmlNode | undefined): InitialValue | undefined {
  const simple = child(node, 'simpleValue');
  if (simple) return { simple: simple.attrs.value ?? '' };
  const struct = child(node, 'structValue');
  if (!struct) return undefined;
  const members: Record<string, string> = {};
  for (const v of childrenNamed(struct, 'value')) {
    const value = child(v, 'simpleValue')?.attrs.value;
    if (v.attrs.member !== undefined && value !== undefined) members[v.attrs.member] = value;
  }
  return { members };
}

/** Cellwright's element under `addData/data[@name = ours]`, if any. */
function vendorElement(node: XmlNode): XmlNode | undefined {
  for (const addData of childrenNamed(node, 'addData')) {
    for (const data of childrenNamed(addData, 'data')) {
      if (data.attrs.name !== CELLWRIGHT_NS) continue;
      const el = data.children.find((c) => c.ns === CELLWRIGHT_NS);
      if (el) return el;
    }
  }
  return undefined;
}

function readMeta(node: XmlNode, path: Path, report: (p: Path, c: string, m: string) => void): ElementMeta | undefined {
  const v = vendorElement(node);
  if (!v) return undefined;
  const at: Path = [...path, 'addData', v.name];
  if (v.name === 'part') {
    if (v.attrs.of === undefined || v.attrs.role === undefined) report(at, 'invalid_vendor_data', 'a Cellwright part needs "of" and "role"');
    return { kind: 'part', of: v.attrs.of ?? '', role: v.attrs.role ?? '' };
  }
  if (v.name !== 'block') return undefined;
  const { id, type, label, labelJson } = v.attrs;
  if (id === undefined || type === undefined) report(at, 'invalid_vendor_data', 'a Cellwright block needs "id" and "type"');
  const meta: ElementMeta = { kind: 'block', id: id ?? '', type: type ?? '' };
  if (label !== undefined) meta.label = label;
  else if (labelJson !== undefined) {
    let parsed: unknown;
    try {
      parsed = JSON.parse(labelJson);
    } catch {
      parsed = undefined;
    }
    if (typeof parsed === 'string') meta.label = parsed;
    else report([...at, 'labelJson'], 'invalid_vendor_data', 'labelJson must be a JSON string');
  }
  return meta;
}

function readConnectionPoint(point: XmlNode | undefined, path: Path, report: (p: Path, c: string, m: string) => void): FbdConnection | undefined {
  const conns = point ? childrenNamed(point, 'connection') : [];
  if (conns.length > 1) report(path, 'multiple_drivers', `an input takes one connection, not ${conns.length}`);
  const c = conns[0];
  if (!c) return undefined;
  const refText = c.attrs.refLocalId;
  if (refText === undefined || !/^\d{1,15}$/.test(refText)) {
    report([...path, 'connection'], 'invalid_local_id', `refLocalId "${refText ?? ''}" is not a whole number`);
    return undefined;
  }
  const conn: FbdConnection = { ref: Number(refText), pin: c.attrs.formalParameter ?? null };
  const w = vendorElement(c);
  if (w?.name === 'wire' && w.attrs.id !== undefined) {
    const wire: WireMeta = { id: w.attrs.id };
    if (w.attrs.seq !== undefined && /^\d{1,9}$/.test(w.attrs.seq)) wire.seq = Number(w.attrs.seq);
    if (w.attrs.fromBlock !== undefined && w.attrs.fromPort !== undefined) {
      wire.fromBlock = w.attrs.fromBlock;
      wire.fromPort = w.attrs.fromPort;
    }
    conn.wire = wire;
  }
  return conn;
}

function readPosition(node: XmlNode, path: Path, report: (p: Path, c: string, m: string) => void): { x: number; y: number } {
  const p = child(node, 'position');
  if (!p) return { x: 0, y: 0 };
  const num = (axis: 'x' | 'y') => {
    const text = p.attrs[axis] ?? '0';
    const value = /^\s*[+-]?(\d+\.?\d*|\.\d+)\s*$/.test(text) ? Number(text) : NaN;
    if (!Number.isFinite(value)) report([...path, 'position', axis], 'invalid_value', `position ${axis}="${text}" is not a decimal number`);
    return Number.isFinite(value) ? value : 0;
  };
  return { x: num('x'), y: num('y') };
}

function readElement(node: XmlNode, localId: number, path: Path, report: (p: Path, c: string, m: string) => void): FbdElement | undefined {
  const position = readPosition(node, path, report);
  const meta = readMeta(node, path, report);
  const common = meta ? { localId, position, meta } : { localId, position };
  if (node.name === 'block') {
    const typeName = node.attrs.typeName;
    if (!typeName) {
      report([...path, 'typeName'], 'missing_attribute', 'a block needs a typeName');
      return undefined;
    }
    const inputs: FbdInput[] = childrenNamed(child(node, 'inputVariables') ?? node, 'variable').map((v) => {
      const pin = v.attrs.formalParameter ?? '';
      const connection = readConnectionPoint(child(v, 'connectionPointIn'), [...path, 'inputVariables', pin], report);
      return connection ? { pin, negated: isTrue(v.attrs.negated), connection } : { pin, negated: isTrue(v.attrs.negated) };
    });
    const outputs = childrenNamed(child(node, 'outputVariables') ?? node, 'variable').map((v) => v.attrs.formalParameter ?? '');
    const el: FbdElement = { kind: 'block', ...common, typeName, inputs, outputs };
    if (node.attrs.instanceName !== undefined) el.instanceName = node.attrs.instanceName;
    return el;
  }
  const expressionNode = child(node, 'expression');
  if (!expressionNode) {
    report([...path, 'expression'], 'missing_element', `an ${node.name} needs an expression`);
    return undefined;
  }
  const expression = expressionNode.text;
  const negated = isTrue(node.attrs.negated);
  if (node.name === 'inVariable') return { kind: 'inVariable', ...common, expression, negated };
  const connection = readConnectionPoint(child(node, 'connectionPointIn'), [...path, 'connectionPointIn'], report);
  return { kind: 'outVariable', ...common, expression, negated, input: connection ? { pin: null, negated: false, connection } : { pin: null, negated: false } };
}

/** The interval of the task that runs the program, if the document configures one. */
function taskInterval(root: XmlNode, program: string): string | undefined {
  for (const configuration of childrenNamed(child(child(root, 'instances'), 'configurations') ?? root, 'configuration')) {
    for (const resource of childrenNamed(configuration, 'resource')) {
      for (const task of childrenNamed(resource, 'task')) {
        if (childrenNamed(task, 'pouInstance').some((p) => p.attrs.typeName?.toUpperCase() === program.toUpperCase())) return task.attrs.interval;
      }
    }
  }
  return undefined;
}
