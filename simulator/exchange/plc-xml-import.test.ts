/**
 * Importing XML that Cellwright did not write: a hand-written file with no Cellwright data
 * imports by its standard meaning, and broken, hostile or unsupported documents give
 * problems with paths (element name and localId). Element names follow IEC 61131-10 as
 * recalled from memory.
 */
import { describe, expect, it } from 'vitest';
import { createProcessImage, getBit, setBit } from '@/simulator/address/process-image';
import { compileSheet } from '@/simulator/plc/compile';
import { plcXmlToSheet, sheetToPlcXml } from './plc-xml';
import { sheetForType } from './test-sheets';

// From memory: the IEC 61131-10 Ed. 1 target namespace.
const NS = 'www.iec.ch/public/TC65SC65BWG7TF10';
const FBD = ['project', 'types', 'pous', 'pou', 'Main', 'body', 'FBD'];

/** A hand-written exchange document around an FBD body (invented plant names). */
function doc(fbd: string, vars = '', pou = 'pouType="program"', root = `xmlns="${NS}"`): string {
  return `<?xml version="1.0" encoding="utf-8"?>
<project ${root}>
  <fileHeader companyName="Northfield Works" productName="hand written" productVersion="1" creationDateTime="2026-01-01T00:00:00"/>
  <contentHeader name="Press line"/>
  <types><dataTypes/><pous>
    <pou name="Main" ${pou}>
      <interface><localVars>${vars}</localVars></interface>
      <body><FBD>${fbd}</FBD></body>
    </pou>
  </pous></types>
  <instances><configurations><configuration name="C"><resource name="R">
    <task name="Fast" interval="T#10ms" priority="1"><pouInstance name="MainRun" typeName="Main"/></task>
  </resource></configuration></configurations></instances>
</project>`;
}

const CONTACT = '<inVariable localId="1"><position x="10" y="20"/><connectionPointOut/><expression>%IX0.0</expression></inVariable>';
const tonBlock = (inPin = 'IN', ref = '1') => `<block localId="2" typeName="TON" instanceName="delay"><position x="100" y="20"/>
  <inputVariables>
    <variable formalParameter="${inPin}"><connectionPointIn><connection refLocalId="${ref}"/></connectionPointIn></variable>
    <variable formalParameter="PT"><connectionPointIn/></variable>
  </inputVariables><inOutVariables/>
  <outputVariables><variable formalParameter="Q"><connectionPointOut/></variable><variable formalParameter="ET"><connectionPointOut/></variable></outputVariables>
</block>`;
const COIL = (ref = '2') => `<outVariable localId="3"><position x="200" y="20"/><connectionPointIn><connection refLocalId="${ref}" formalParameter="Q"/></connectionPointIn><expression>%QX0.0</expression></outVariable>`;
const DELAY = (pt = 'T#50ms') => `<variable name="delay"><type><derived name="TON"/></type><initialValue><structValue><value member="PT"><simpleValue value="${pt}"/></value></structValue></initialValue></variable>`;

const problems = (r: ReturnType<typeof plcXmlToSheet>) => (r.ok ? [] : r.errors.map((e) => [e.code, e.path]));

describe('a file without Cellwright data imports by its standard meaning', () => {
  it('reads a contact, a TON instance with its preset and a coil, and runs them', () => {
    const r = plcXmlToSheet(doc(CONTACT + tonBlock() + COIL(), DELAY()));
    expect(r.ok ? r.value : r.errors).toEqual({
      scanPeriodMs: 10,
      blocks: [
        { id: 'in1', type: 'NO_CONTACT', position: { x: 10, y: 20 }, params: { address: '%IX0.0' } },
        { id: 'delay', type: 'TON', position: { x: 100, y: 20 }, params: { PT: 50 } },
        { id: 'out3', type: 'COIL', position: { x: 200, y: 20 }, params: { address: '%QX0.0' } },
      ],
      connections: [
        { id: 'w1', from: { block: 'in1', port: 'Q' }, to: { block: 'delay', port: 'IN' } },
        { id: 'w2', from: { block: 'delay', port: 'Q' }, to: { block: 'out3', port: 'IN' } },
      ],
    });
    if (!r.ok) return;
    // IEC 61131-3 TON: Q once ET >= PT; the engine's ET is 0 on the first scan with IN
    // (simulator/plc/api.ts), so with PT 50 ms and 10 ms scans Q rises on the sixth scan.
    const c = compileSheet(r.value);
    if (!c.ok) throw new Error('imported sheet does not compile');
    const state = c.value.createState();
    const image = createProcessImage();
    setBit(image, 'I', 0, 0, true);
    const q: boolean[] = [];
    for (let k = 0; k < 7; k++) {
      c.value.scan(state, image);
      q.push(getBit(image, 'Q', 0, 0));
    }
    expect(q).toEqual([false, false, false, false, false, true, true]);
  });

  it('reads literals as constants (a TIME literal in ms) and decodes character references', () => {
    const fbd = `<inVariable localId="5"><connectionPointOut/><expression>T#1s500ms</expression></inVariable>
      <inVariable localId="6"><connectionPointOut/><expression>16#FF</expression>
        <addData><data name="https://cellwright.example/xml/sheet"><cw:block xmlns:cw="https://cellwright.example/xml/sheet" id="k" type="CONST" label="a&#x26;b &lt;c&gt; &#233;"/></data></addData>
      </inVariable>`;
    const r = plcXmlToSheet(doc(fbd));
    expect(r.ok ? r.value.blocks.map((b) => [b.id, b.type, b.params, b.label]) : r.errors).toEqual([
      ['in5', 'CONST', { value: 1500 }, undefined],
      ['k', 'CONST', { value: 255 }, 'a&b <c> é'],
    ]);
  });
});

describe('problems, each with a path into the document', () => {
  it('malformed XML: the line and column of the fault', () => {
    const xml = doc('<block localId="1" typeName="AND">');
    const line = xml.split('\n').findIndex((l) => l.includes('</FBD>')) + 1;
    const r = plcXmlToSheet(xml);
    expect(problems(r).map(([code, path]) => [code, (path as unknown[]).slice(0, 3)])).toEqual([['malformed_xml', ['xml', 'line', line]]]);
  });

  it('no DOCTYPE, so no entity expansion (a "billion laughs" document is refused unread)', () => {
    const lol = `<?xml version="1.0"?><!DOCTYPE project [<!ENTITY a "aaaaaaaaaa"><!ENTITY b "&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;">]><project xmlns="${NS}">&b;</project>`;
    expect(problems(plcXmlToSheet(lol))).toEqual([['doctype_forbidden', ['xml']]]);
    expect(problems(plcXmlToSheet(doc(CONTACT.replace('%IX0.0', '&custom;'))))).toEqual([['unknown_entity', ['xml', 'project', 'types', 'pous', 'pou', 'body', 'FBD', 'inVariable', 'expression']]]);
  });

  it('caps size, tags, depth, elements and connections', () => {
    const xml = doc(CONTACT + tonBlock() + COIL(), DELAY());
    expect(problems(plcXmlToSheet(xml, { limits: { maxChars: 200 } }))).toEqual([['too_large', ['xml']]]);
    expect(problems(plcXmlToSheet(xml, { limits: { maxTags: 20 } }))).toEqual([['too_large', ['xml']]]);
    expect(problems(plcXmlToSheet(xml, { limits: { maxDepth: 5 } }))).toEqual([['too_large', ['xml']]]);
    expect(problems(plcXmlToSheet(xml, { limits: { maxElements: 2 } }))).toEqual([['too_large', FBD]]);
    expect(problems(plcXmlToSheet(xml, { limits: { maxConnections: 1 } }))).toEqual([['too_large', FBD]]);
    expect(problems(plcXmlToSheet(42 as unknown as string))).toEqual([['invalid_type', ['xml']]]);
  });

  it('refuses other documents: wrong namespace, no program, a body that is not FBD', () => {
    expect(problems(plcXmlToSheet(doc(CONTACT, '', 'pouType="program"', 'xmlns="urn:example:other"')))).toEqual([['not_an_exchange_document', ['project']]]);
    expect(problems(plcXmlToSheet(doc(CONTACT, '', 'pouType="functionBlock"')))).toEqual([['no_program', ['project', 'types', 'pous']]]);
    const st = doc('').replace('<body><FBD></FBD></body>', '<body><ST><xhtml:p xmlns:xhtml="http://www.w3.org/1999/xhtml">x := 1;</xhtml:p></ST></body>');
    expect(problems(plcXmlToSheet(st))).toEqual([['no_fbd_body', ['project', 'types', 'pous', 'pou', 'Main', 'body']]]);
  });

  it('a block type the catalogue lacks, by typeName or by Cellwright data', () => {
    const mixer = '<block localId="4" typeName="MIXER"><inputVariables/><outputVariables/></block>';
    expect(problems(plcXmlToSheet(doc(CONTACT + mixer)))).toEqual([['unknown_block_type', [...FBD, 'block', 4, 'typeName']]]);
    const exported = sheetToPlcXml(sheetForType('TON', true));
    if (!exported.ok) throw new Error('export failed');
    const localId = /<block localId="(\d+)" typeName="TON"/.exec(exported.value)?.[1];
    const r = plcXmlToSheet(exported.value.replace('type="TON"', 'type="BLINKER"'));
    expect(problems(r)).toEqual([['unknown_block_type', ['project', 'types', 'pous', 'pou', 'CellLogic', 'body', 'FBD', 'block', Number(localId), 'type']]]);
  });

  it('wiring faults: a dangling refLocalId, an unknown pin, a duplicate localId — all reported together', () => {
    const fbd = CONTACT + tonBlock('XYZ') + COIL('99') + '<inVariable localId="1"><expression>TRUE</expression></inVariable>';
    expect(problems(plcXmlToSheet(doc(fbd, DELAY())))).toEqual([
      ['duplicate_local_id', [...FBD, 'inVariable', 1]],
      ['unknown_port', [...FBD, 'block', 2, 'inputVariables', 'XYZ']],
      ['dangling_connection', [...FBD, 'outVariable', 3, 'connectionPointIn', 'connection']],
    ]);
    expect(problems(plcXmlToSheet(doc(CONTACT + tonBlock() + COIL('99'), DELAY())))).toEqual([['dangling_connection', [...FBD, 'outVariable', 3, 'connectionPointIn', 'connection']]]);
  });

  it('values: a bad preset literal in the interface, an address out of range', () => {
    expect(problems(plcXmlToSheet(doc(CONTACT + tonBlock() + COIL(), DELAY('T#fast'))))).toEqual([
      ['invalid_value', ['project', 'types', 'pous', 'pou', 'Main', 'interface', 'variable', 'delay', 'initialValue', 'PT']],
    ]);
    // %IX0.9: bit 9 does not exist (IEC 61131-3 direct addresses number bits 0..7 in a byte here).
    expect(problems(plcXmlToSheet(doc(CONTACT.replace('%IX0.0', '%IX0.9') + tonBlock() + COIL(), DELAY())))).toEqual([['address_range', [...FBD, 'inVariable', 1, 'params', 'address']]]);
  });

  it('graph faults found by the sheet validator point at the document: an algebraic loop', () => {
    const not = (id: number, from: number) =>
      `<block localId="${id}" typeName="NOT"><inputVariables><variable formalParameter="IN"><connectionPointIn><connection refLocalId="${from}" formalParameter="OUT"/></connectionPointIn></variable></inputVariables><outputVariables><variable formalParameter="OUT"><connectionPointOut/></variable></outputVariables></block>`;
    expect(problems(plcXmlToSheet(doc(not(1, 2) + not(2, 1))))).toEqual([['algebraic_loop', [...FBD, 'block', 1, 'inputVariables', 'IN', 'connection']]]);
  });

  it('unsupported elements, unbound prefixes, hostile names, shape mismatches and orphan parts', () => {
    expect(problems(plcXmlToSheet(doc(CONTACT + '<jump localId="9" label="x"/>')))).toEqual([['unsupported_element', [...FBD, 'jump', 9]]]);
    expect(problems(plcXmlToSheet(doc('<x:block localId="9" typeName="AND"/>')))[0]).toEqual(['unbound_prefix', ['xml', 'project', 'types', 'pous', 'pou', 'body', 'FBD', 'x:block']]);
    expect(problems(plcXmlToSheet(doc('<__proto__ localId="9"/>')))[0][0]).toBe('malformed_xml');
    const cw = (inner: string) => `<addData><data name="https://cellwright.example/xml/sheet"><cw:${inner} xmlns:cw="https://cellwright.example/xml/sheet"/></data></addData>`;
    const tonOnVariable = `<inVariable localId="1"><expression>%IX0.0</expression>${cw('block id="t" type="TON"')}</inVariable>`;
    expect(problems(plcXmlToSheet(doc(tonOnVariable)))).toEqual([['shape_mismatch', [...FBD, 'inVariable', 1]]]);
    const orphan = `<inVariable localId="1"><expression>%IX0.0</expression>${cw('part of="ghost" role="read"')}</inVariable>`;
    expect(problems(plcXmlToSheet(doc(orphan)))).toEqual([['orphan_part', [...FBD, 'inVariable', 1]]]);
  });
});
