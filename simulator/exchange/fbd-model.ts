/**
 * The in-memory shape of one IEC 61131-10 FBD program, between a logic sheet and its XML.
 * The exporter turns a sheet into this model and writes it; the importer reads XML into
 * it and turns it back into a sheet, so the XML layer and the block mapping stay apart.
 *
 * Element names and attributes mirror the exchange format's FBD objects as recalled from
 * memory (block, inVariable, outVariable, connectionPointIn / connection refLocalId +
 * formalParameter, addData); check them against the published IEC 61131-10 schema before
 * claiming conformance.
 */

/**
 * Namespace of the exchange document's own elements — from memory of IEC 61131-10; not
 * checked against the published schema, which is also recalled as using some capitalised
 * element names (`Project`, `FbdObject`) where this layout uses the older lower-case ones.
 */
export const IEC_61131_10_NS = 'www.iec.ch/public/TC65SC65BWG7TF10';
/** Namespace of Cellwright's vendor data inside `addData/data` (our own name). */
export const CELLWRIGHT_NS = 'https://cellwright.example/xml/sheet';
/** Version of Cellwright's addData content, for future readers. */
export const CELLWRIGHT_FORMAT_VERSION = 1;

/** A point on the canvas (the sheet's own units). */
export type FbdPosition = { x: number; y: number };

/** Cellwright's data kept on a connection: the sheet wire's id and place, and its true source when the standard one differs. */
export type WireMeta = {
  id: string;
  /** Index of the wire in the sheet's `connections`, so their order survives. */
  seq?: number;
  /** The wire's source when the referenced element stands in for it (a coil's pass-through Q). */
  fromBlock?: string;
  fromPort?: string;
};

/** A connection into an input: the source element and, for a block, its output pin. */
export type FbdConnection = { ref: number; pin: string | null; wire?: WireMeta };

/** One input pin (`pin` null for a variable's single connection point). */
export type FbdInput = { pin: string | null; negated: boolean; connection?: FbdConnection };

/**
 * Cellwright's data on an element: either the sheet block it stands for (`block`), or a
 * helper element belonging to one (`part`, with its role, e.g. `read` for the address an
 * AND reads for a contact with power flow in).
 */
export type ElementMeta = { kind: 'block'; id: string; type: string; label?: string } | { kind: 'part'; of: string; role: string };

type Common = { localId: number; position: FbdPosition; meta?: ElementMeta; executionOrderId?: number };

/** A function or function block call. */
export type FbdBlock = Common & {
  kind: 'block';
  typeName: string;
  instanceName?: string;
  inputs: FbdInput[];
  outputs: string[];
};
/** A value read into the network: a direct address, a literal or a variable. */
export type FbdInVariable = Common & { kind: 'inVariable'; expression: string; negated: boolean };
/** A value written from the network to a direct address or variable. */
export type FbdOutVariable = Common & { kind: 'outVariable'; expression: string; negated: boolean; input: FbdInput };
/** Any FBD element this exchange uses. */
export type FbdElement = FbdBlock | FbdInVariable | FbdOutVariable;

/** Initial value: one literal, or members of a function block instance by name. */
export type InitialValue = { simple: string } | { members: Record<string, string> };

/** A declared variable of the program: an FB instance (`derived` type) or an elementary variable. */
export type InterfaceVariable = { name: string; type: string; derived: boolean; initial?: InitialValue };

/** One program POU with an FBD body, and the task that runs it. */
export type FbdProgram = {
  name: string;
  variables: InterfaceVariable[];
  elements: FbdElement[];
  /** The cyclic task's interval as a TIME literal, when present. */
  taskInterval?: string;
};

/** The inputs of an element, with the variable's single point as pin `null`. */
export function elementInputs(el: FbdElement): FbdInput[] {
  if (el.kind === 'block') return el.inputs;
  if (el.kind === 'outVariable') return [el.input];
  return [];
}

/** Key of one pin of one element, for lookups. */
export function pinKey(localId: number, pin: string | null): string {
  return `${localId}/${pin ?? ''}`;
}
