/**
 * The exported document has the structure of an IEC 61131-10 exchange file as far as we
 * know it. Every element and attribute name checked here is FROM MEMORY of IEC 61131-10
 * (and the XML exchange layout it grew from), not from the published schema; the document is
 * parsed independently of the importer, with fast-xml-parser.
 */
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { describe, expect, it } from 'vitest';
import { pickAndPlaceCell } from '@/simulator/demo';
import type { LogicSheetInput } from '@/simulator/plc/api';
import { sheetToPlcXml } from './plc-xml';
import { sheetForType } from './test-sheets';

// From memory: the IEC 61131-10 Ed. 1 target namespace.
const IEC_NS_FROM_MEMORY = 'www.iec.ch/public/TC65SC65BWG7TF10';
// Our own vendor namespace (Cellwright's name, not the standard's).
const OUR_NS = 'https://cellwright.example/xml/sheet';

type Node = Record<string, unknown> & { [k: string]: unknown };
const REPEATED = ['pou', 'variable', 'block', 'inVariable', 'outVariable', 'connection', 'value', 'data'];
const parser = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '@_', parseTagValue: false, isArray: (name) => REPEATED.includes(name) });

function exportOf(sheet: LogicSheetInput, programName?: string): { xml: string; doc: Node } {
  const r = sheetToPlcXml(sheet, programName === undefined ? {} : { programName });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return { xml: r.value, doc: parser.parse(r.value) as Node };
}
const at = (node: unknown, ...keys: (string | number)[]): Node => keys.reduce<unknown>((n, k) => (n as Node)?.[k], node) as Node;
const program = (doc: Node) => (at(doc, 'project', 'types', 'pous', 'pou') as unknown as Node[]).find((p) => p['@_pouType'] === 'program') as Node;
const fbd = (doc: Node) => at(program(doc), 'body', 'FBD');
const list = (node: Node, key: string) => ((node?.[key] as Node[] | undefined) ?? []);
const cwBlock = (el: Node) => at(list(at(el, 'addData'), 'data')[0], 'cw:block');
const byId = (doc: Node, kind: string, id: string) => list(fbd(doc), kind).find((el) => cwBlock(el)?.['@_id'] === id) as Node;

const demo = pickAndPlaceCell.plc.sheet as LogicSheetInput;

describe('IEC 61131-10 document structure (from memory)', () => {
  it('is well-formed XML with a project root in the standard namespace', () => {
    const { xml, doc } = exportOf(demo);
    expect(XMLValidator.validate(xml)).toBe(true);
    expect(xml.startsWith('<?xml version="1.0" encoding="utf-8"?>')).toBe(true);
    expect(at(doc, 'project', '@_xmlns')).toBe(IEC_NS_FROM_MEMORY);
    expect(at(doc, 'project', 'fileHeader', '@_creationDateTime')).toBe('1970-01-01T00:00:00Z');
    expect(at(doc, 'project', 'contentHeader', '@_name')).toBe('CellLogic');
  });

  it('holds one pou with pouType="program", named as asked (made an IEC identifier)', () => {
    const { doc } = exportOf(demo, 'Line 3 logic');
    const pous = at(doc, 'project', 'types', 'pous', 'pou') as unknown as Node[];
    // The demo's WORD_OUT adds the declaration of the function it calls.
    expect(pous.map((p) => [p['@_name'], p['@_pouType']])).toEqual([['Line_3_logic', 'program'], ['CW_TO_WORD', 'function']]);
    expect(at(program(doc), 'body', 'FBD')).toBeDefined();
  });

  it('writes standard blocks with typeName, and instances declared in the interface with derived types', () => {
    const { doc } = exportOf(demo);
    const blocks = list(fbd(doc), 'block');
    // The demo sheet's logic blocks: 3 AND, 3 OR, R_TRIG, TP, SEL, and the WORD_OUT conversion.
    expect(blocks.map((b) => b['@_typeName']).sort()).toEqual(['AND', 'AND', 'CW_TO_WORD', 'OR', 'OR', 'OR', 'R_TRIG', 'SEL', 'TP']);
    const declared = list(at(program(doc), 'interface', 'localVars'), 'variable');
    for (const b of blocks.filter((x) => x['@_instanceName'] !== undefined)) {
      const v = declared.find((d) => d['@_name'] === b['@_instanceName']);
      expect(at(v, 'type', 'derived', '@_name')).toBe(b['@_typeName']);
    }
    // Preset as an instance initial value: PT 100 ms is T#100ms (IEC 61131-3 duration literal, from memory).
    const pulse = declared.find((d) => d['@_name'] === 'startPulse');
    const member = list(at(pulse, 'initialValue', 'structValue'), 'value')[0];
    expect([member['@_member'], at(member, 'simpleValue', '@_value')]).toEqual(['PT', 'T#100ms']);
  });

  it('reads and writes direct addresses with inVariable / outVariable (negated for an NC contact)', () => {
    const { doc } = exportOf(demo);
    expect(at(byId(doc, 'inVariable', 'startPB'), 'expression')).toBe('%IX0.0');
    const stop = byId(doc, 'inVariable', 'stopPressed');
    expect([at(stop, 'expression'), stop['@_negated']]).toEqual(['%IX0.1', 'true']);
    expect(at(byId(doc, 'outVariable', 'robotStart'), 'expression')).toBe('%QX0.0');
  });

  it('wires by refLocalId, naming the output pin of a block with formalParameter', () => {
    const { doc } = exportOf(demo);
    const elements = ['block', 'inVariable', 'outVariable'].flatMap((k) => list(fbd(doc), k));
    const ids = new Set(elements.map((el) => el['@_localId']));
    expect(ids.size).toBe(elements.length);
    const connections = [
      ...list(fbd(doc), 'block').flatMap((b) => list(at(b, 'inputVariables'), 'variable').flatMap((v) => list(at(v, 'connectionPointIn'), 'connection'))),
      ...list(fbd(doc), 'outVariable').flatMap((o) => list(at(o, 'connectionPointIn'), 'connection')),
    ];
    // One connection per sheet wire, plus the WORD_OUT's link from its conversion to its address.
    expect(connections.length).toBe(demo.connections.length + 1);
    for (const c of connections) expect(ids.has(c['@_refLocalId'])).toBe(true);
    // robotStart (a coil) takes the TP instance's Q: refLocalId of that block plus formalParameter="Q".
    const pulse = list(fbd(doc), 'block').find((b) => b['@_typeName'] === 'TP') as Node;
    const into = list(at(byId(doc, 'outVariable', 'robotStart'), 'connectionPointIn'), 'connection')[0];
    expect([into['@_refLocalId'], into['@_formalParameter']]).toEqual([pulse['@_localId'], 'Q']);
  });

  it('orders execution as the engine solves the sheet (executionOrderId)', () => {
    const { doc } = exportOf(demo);
    const order = (id: string, kind = 'block') => Number(byId(doc, kind, id)['@_executionOrderId']);
    expect(order('startEdge')).toBeLessThan(order('startPermit'));
    expect(order('startPermit')).toBeLessThan(order('startPulse'));
    expect(order('startPulse')).toBeLessThan(order('robotStart', 'outVariable'));
  });

  it('runs the program from a task whose interval is the scan period', () => {
    const { doc } = exportOf(demo);
    const task = at(doc, 'project', 'instances', 'configurations', 'configuration', 'resource', 'task');
    expect([task['@_interval'], at(task, 'pouInstance', '@_typeName')]).toEqual(['T#10ms', 'CellLogic']);
  });

  it('keeps Cellwright data in addData/data under our own namespace', () => {
    const { doc } = exportOf(demo);
    expect(at(doc, 'project', '@_xmlns:cw')).toBe(OUR_NS);
    const data = list(at(byId(doc, 'block', 'startEdge'), 'addData'), 'data')[0];
    expect(data['@_name']).toBe(OUR_NS);
    expect(at(data, 'cw:block', '@_type')).toBe('R_TRIG');
  });

  it('declares the Cellwright blocks it calls (CW_SPAN_MAP, CW_TO_DWORD) with Structured Text bodies', () => {
    const scale = exportOf(sheetForType('SPAN_MAP', true)).doc;
    const word = exportOf(sheetForType('WORD_OUT', true)).doc;
    const pous = (doc: Node) => (at(doc, 'project', 'types', 'pous', 'pou') as unknown as Node[]).map((p) => [p['@_name'], p['@_pouType']]);
    // The test sheets' numeric outputs drive WORD_OUTs on %QW…, hence CW_TO_WORD beside CW_SPAN_MAP.
    expect(pous(scale)).toEqual([['CellLogic', 'program'], ['CW_SPAN_MAP', 'functionBlock'], ['CW_TO_WORD', 'function']]);
    // SAMPLE_PARAMS writes WORD_OUT to %QD8 (a double word), so CW_TO_DWORD.
    // WORD_OUT has no outputs, so its sheet has no word sinks of its own.
    expect(pous(word)).toEqual([['CellLogic', 'program'], ['CW_TO_DWORD', 'function']]);
    const body = at((at(scale, 'project', 'types', 'pous', 'pou') as unknown as Node[])[1], 'body', 'ST', 'xhtml:p');
    expect(String(at(body, '#text'))).toContain('OUT := OUT_MIN + (IN - IN_MIN) * (OUT_MAX - OUT_MIN) / (IN_MAX - IN_MIN);');
  });
});
