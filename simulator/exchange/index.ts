/**
 * Logic exchange: a logic sheet leaves Cellwright as IEC 61131-3 Structured Text or as an
 * IEC 61131-10 XML exchange document (FBD body), and comes back from that XML. Pure
 * TypeScript; strings in, strings out. Format notes: docs/engine.md, "Logic exchange".
 */
export { sheetToStructuredText, type StructuredTextOptions } from './structured-text';
export { sheetToPlcXml, plcXmlToSheet, PLC_XML_LIMITS, type PlcXmlExportOptions, type PlcXmlImportOptions, type PlcXmlLimits } from './plc-xml';
export { IEC_61131_10_NS, CELLWRIGHT_NS } from './fbd-model';
