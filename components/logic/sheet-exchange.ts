/**
 * The engine's exchange calls as the Logic area uses them (docs/engine.md, "Logic exchange").
 * They run in ./sheet-exchange.worker.ts, started when an export or import button is used, so
 * the exporters and the XML reader stay out of the workspace's bundles and off the main thread.
 */
import { plcXmlToSheet, sheetToPlcXml, sheetToStructuredText } from '@/simulator';
import { exchangeProblemRows, exportFileName, exportMediaType, sheetCounts, type ExchangeProblemRow, type ExportKind, type SheetCounts } from './exchange-flow';
import type { Sheet } from './sheet-graph';

/** A file ready to download, or the sheet's problems that stop the export. */
export type ExportOutcome = { ok: true; fileName: string; mediaType: string; text: string } | { ok: false; problems: ExchangeProblemRow[] };

/** A sheet read from a file, with its counts for the confirmation, or every problem found. */
export type ImportOutcome = { ok: true; sheet: Sheet; counts: SheetCounts } | { ok: false; problems: ExchangeProblemRow[] };

/**
 * Exports `sheet` as Structured Text or as an IEC 61131-10 XML document named after the cell;
 * `now` is the export time written into the XML file header (the engine has no clock).
 */
export function exportSheet(sheet: Sheet, cellName: string, kind: ExportKind, now: Date): ExportOutcome {
  const result = kind === 'st' ? sheetToStructuredText(sheet, { title: cellName }) : sheetToPlcXml(sheet, { projectName: cellName, createdAt: now.toISOString() });
  if (!result.ok) return { ok: false, problems: exchangeProblemRows(result.errors, sheet) };
  return { ok: true, fileName: exportFileName(cellName, kind), mediaType: exportMediaType(kind), text: result.value };
}

/** Reads an exchange document's text into a validated sheet; the current sheet is not touched. */
export function importSheet(xml: string): ImportOutcome {
  const result = plcXmlToSheet(xml);
  if (!result.ok) return { ok: false, problems: exchangeProblemRows(result.errors) };
  return { ok: true, sheet: result.value, counts: sheetCounts(result.value) };
}

/** What the Logic area asks the worker. */
export type ExchangeRequest =
  | { op: 'export'; sheet: Sheet; cellName: string; kind: ExportKind; /** ISO 8601 export time. */ now: string }
  | { op: 'import'; xml: string };

/** The worker's answer to one request. */
export type ExchangeReply = { op: 'export'; outcome: ExportOutcome } | { op: 'import'; outcome: ImportOutcome };
