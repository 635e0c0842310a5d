/**
 * Writes an {@link FbdProgram} as an IEC 61131-10 exchange document with xmlbuilder2.
 *
 * Document layout (from memory of IEC 61131-10; verify against the published schema):
 * project → fileHeader, contentHeader, types → pous → pou (pouType="program") → interface
 * (localVars) and body → FBD; then instances → configurations → configuration → resource →
 * task (interval = the sheet's scan period) → pouInstance. Cellwright's own data sits in
 * `addData/data[@name = CELLWRIGHT_NS]`, which the format reserves for tool-specific data.
 */
import { create } from 'xmlbuilder2';
import { formatMember, presetMembers, SPAN_FB, WORD_OUT_FUNCTIONS } from './block-codecs';
import { CELLWRIGHT_FORMAT_VERSION, CELLWRIGHT_NS, IEC_61131_10_NS, type ElementMeta, type FbdElement, type FbdInput, type FbdProgram, type InterfaceVariable, type WireMeta } from './fbd-model';
import { isAttributeSafe, plainDecimal } from './iec-text';

const XHTML_NS = 'http://www.w3.org/1999/xhtml';

/** xmlbuilder2's node builder (its own type lives under a lib/ path the engine's lint rule forbids). */
type XMLBuilder = ReturnType<typeof create>;

/** Header facts of the document. */
export type WriteOptions = {
  /** contentHeader name. */
  projectName: string;
  /** fileHeader creationDateTime (ISO 8601). */
  createdAt: string;
};

/** Cellwright vendor data under an element (`addData/data/cw:…`). */
function vendorData(parent: XMLBuilder, name: string, attrs: Record<string, string>): void {
  parent.ele('addData').ele('data', { name: CELLWRIGHT_NS, handleUnknown: 'preserve' }).ele(CELLWRIGHT_NS, `cw:${name}`, attrs);
}

function metaAttrs(meta: ElementMeta): [string, Record<string, string>] {
  if (meta.kind === 'part') return ['part', { of: meta.of, role: meta.role }];
  const attrs: Record<string, string> = { id: meta.id, type: meta.type };
  // Tabs, line breaks and control characters would not survive attribute normalisation.
  if (meta.label !== undefined) attrs[isAttributeSafe(meta.label) ? 'label' : 'labelJson'] = isAttributeSafe(meta.label) ? meta.label : JSON.stringify(meta.label);
  return ['block', attrs];
}

function wireAttrs(w: WireMeta): Record<string, string> {
  const attrs: Record<string, string> = { id: w.id };
  if (w.seq !== undefined) attrs.seq = String(w.seq);
  if (w.fromBlock !== undefined) attrs.fromBlock = w.fromBlock;
  if (w.fromPort !== undefined) attrs.fromPort = w.fromPort;
  return attrs;
}

function connectionPointIn(parent: XMLBuilder, input: FbdInput): void {
  const point = parent.ele('connectionPointIn');
  const c = input.connection;
  if (!c) return;
  const conn = point.ele('connection', c.pin === null ? { refLocalId: String(c.ref) } : { refLocalId: String(c.ref), formalParameter: c.pin });
  if (c.wire) vendorData(conn, 'wire', wireAttrs(c.wire));
}

function elementAttrs(el: FbdElement, extra: Record<string, string>): Record<string, string> {
  const attrs: Record<string, string> = { localId: String(el.localId), ...extra };
  if (el.executionOrderId !== undefined) attrs.executionOrderId = String(el.executionOrderId);
  if (el.kind !== 'block' && el.negated) attrs.negated = 'true';
  return attrs;
}

function writeElement(fbd: XMLBuilder, el: FbdElement): void {
  const position = { x: plainDecimal(el.position.x), y: plainDecimal(el.position.y) };
  let node: XMLBuilder;
  if (el.kind === 'block') {
    node = fbd.ele('block', elementAttrs(el, el.instanceName === undefined ? { typeName: el.typeName } : { typeName: el.typeName, instanceName: el.instanceName }));
    node.ele('position', position);
    const inputs = node.ele('inputVariables');
    for (const p of el.inputs) {
      const v = inputs.ele('variable', p.negated ? { formalParameter: p.pin ?? '', negated: 'true' } : { formalParameter: p.pin ?? '' });
      connectionPointIn(v, p);
    }
    node.ele('inOutVariables');
    const outputs = node.ele('outputVariables');
    for (const name of el.outputs) outputs.ele('variable', { formalParameter: name }).ele('connectionPointOut');
  } else if (el.kind === 'inVariable') {
    node = fbd.ele('inVariable', elementAttrs(el, {}));
    node.ele('position', position);
    node.ele('connectionPointOut');
    node.ele('expression').txt(el.expression);
  } else {
    node = fbd.ele('outVariable', elementAttrs(el, {}));
    node.ele('position', position);
    connectionPointIn(node, el.input);
    node.ele('expression').txt(el.expression);
  }
  if (el.meta) {
    const [name, attrs] = metaAttrs(el.meta);
    vendorData(node, name, attrs);
  }
}

function writeVariable(section: XMLBuilder, v: InterfaceVariable): void {
  const node = section.ele('variable', { name: v.name });
  const type = node.ele('type');
  if (v.derived) type.ele('derived', { name: v.type });
  else type.ele(v.type);
  if (!v.initial) return;
  const init = node.ele('initialValue');
  if ('simple' in v.initial) {
    init.ele('simpleValue', { value: v.initial.simple });
    return;
  }
  const struct = init.ele('structValue');
  for (const [member, value] of Object.entries(v.initial.members)) struct.ele('value', { member }).ele('simpleValue', { value });
}

/** ST body text of a POU, inside the xhtml wrapper the format uses for text (from memory). */
function stBody(pou: XMLBuilder, text: string): void {
  pou.ele('body').ele('ST').ele(XHTML_NS, 'xhtml:p').txt(text);
}

/** Declares CW_SPAN_MAP: Cellwright's SPAN_MAP block as a function block, with the engine's formula. */
function writeSpanFb(pous: XMLBuilder): void {
  const pou = pous.ele('pou', { name: SPAN_FB, pouType: 'functionBlock' });
  const iface = pou.ele('interface');
  const inputs = iface.ele('inputVars');
  writeVariable(inputs, { name: 'IN', type: 'LREAL', derived: false });
  for (const m of presetMembers('SPAN_MAP')) {
    writeVariable(inputs, { name: m.member, type: m.kind === 'bool' ? 'BOOL' : 'LREAL', derived: false, initial: { simple: formatMember(m.kind, m.dflt) } });
  }
  writeVariable(iface.ele('outputVars'), { name: 'OUT', type: 'LREAL', derived: false });
  stBody(
    pou,
    [
      '(* Cellwright SPAN_MAP: maps the raw span IN_MIN..IN_MAX linearly onto OUT_MIN..OUT_MAX; CLAMP keeps OUT inside that range. *)',
      'OUT := OUT_MIN + (IN - IN_MIN) * (OUT_MAX - OUT_MIN) / (IN_MAX - IN_MIN);',
      'IF CLAMP THEN',
      '    OUT := LIMIT(MN := MIN(OUT_MIN, OUT_MAX), IN := OUT, MX := MAX(OUT_MIN, OUT_MAX));',
      'END_IF;',
    ].join('\n'),
  );
}

/** Declares CW_TO_BYTE / CW_TO_WORD / CW_TO_DWORD: Cellwright's WORD_OUT conversion. */
function writeWordOutFunction(pous: XMLBuilder, name: string): void {
  const bitString = name.slice('CW_TO_'.length);
  const pou = pous.ele('pou', { name, pouType: 'function' });
  const iface = pou.ele('interface');
  iface.ele('returnType').ele(bitString);
  writeVariable(iface.ele('inputVars'), { name: 'IN', type: 'LREAL', derived: false });
  stBody(
    pou,
    [
      '(* Cellwright WORD_OUT: rounds IN to the nearest whole number (halves upward), writes 0 for a',
      '   non-finite IN, and keeps the low bits two\'s-complement. LREAL_TO_LINT may round halves',
      '   differently on your PLC. *)',
      `${name} := LINT_TO_${bitString}(LREAL_TO_LINT(IN));`,
    ].join('\n'),
  );
}

/** The exchange document of one program, as indented XML text. */
export function writePlcXml(program: FbdProgram, options: WriteOptions): string {
  const root = create({ version: '1.0', encoding: 'utf-8' }).ele(IEC_61131_10_NS, 'project', { 'xmlns:cw': CELLWRIGHT_NS });
  root.ele('fileHeader', { companyName: 'Cellwright', productName: 'Cellwright', productVersion: String(CELLWRIGHT_FORMAT_VERSION), creationDateTime: options.createdAt });
  const coordinates = root.ele('contentHeader', { name: options.projectName }).ele('coordinateInfo');
  for (const language of ['fbd', 'ld', 'sfc']) coordinates.ele(language).ele('scaling', { x: '1', y: '1' });

  const types = root.ele('types');
  types.ele('dataTypes');
  const pous = types.ele('pous');
  const pou = pous.ele('pou', { name: program.name, pouType: 'program' });
  const localVars = pou.ele('interface').ele('localVars');
  for (const v of program.variables) writeVariable(localVars, v);
  const fbd = pou.ele('body').ele('FBD');
  for (const el of program.elements) writeElement(fbd, el);
  vendorData(pou, 'sheet', { formatVersion: String(CELLWRIGHT_FORMAT_VERSION) });

  // Declare the Cellwright blocks the program calls, so the document stands on its own.
  const used = new Set(program.elements.flatMap((el) => (el.kind === 'block' ? [el.typeName] : [])));
  if (used.has(SPAN_FB)) writeSpanFb(pous);
  for (const name of Object.values(WORD_OUT_FUNCTIONS)) if (used.has(name)) writeWordOutFunction(pous, name);

  if (program.taskInterval !== undefined) {
    root
      .ele('instances')
      .ele('configurations')
      .ele('configuration', { name: 'CellConfiguration' })
      .ele('resource', { name: 'CellPlc' })
      .ele('task', { name: 'CellScan', interval: program.taskInterval, priority: '1' })
      .ele('pouInstance', { name: `${program.name}_run`, typeName: program.name });
  }
  return root.end({ prettyPrint: true });
}
