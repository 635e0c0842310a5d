/**
 * Pure helpers between the logic sheet (engine document) and the canvas: which problems
 * belong to which block or wire, which connection a user may draw, and the sheet edits
 * the canvas makes. No React here, so each helper is unit-tested on plain data.
 *
 * The canvas only maps a block type to a component; what a block computes, which ports it
 * has and which port types mix all come from the engine's catalogue.
 */
import {
  blockCatalogue,
  blockPorts,
  isBlockType,
  portTypesCompatible,
  type BlockType,
  type LogicSheetInput,
  type PortSpec,
  type Problem,
} from '@/simulator';

/** A sheet as the document holds it (defaults may be omitted). */
export type Sheet = LogicSheetInput;
/** One block as the document holds it. */
export type Block = Sheet['blocks'][number];
/** One connection as the document holds it. */
export type Connection = Sheet['connections'][number];

/** Problems located on the canvas: per block id, per connection id, and the loops. */
export type SheetProblemIndex = {
  byBlock: Map<string, Problem[]>;
  byConnection: Map<string, Problem[]>;
  /** Block ids that are part of an algebraic loop. */
  loopBlocks: Set<string>;
  /** Connection ids whose both ends lie in the same algebraic loop. */
  loopConnections: Set<string>;
  /** Problems that concern the sheet as a whole (scan period, too many blocks). */
  sheet: Problem[];
};

function push<K>(map: Map<K, Problem[]>, key: K, p: Problem): void {
  const list = map.get(key);
  if (list) {
    if (!list.includes(p)) list.push(p);
  } else map.set(key, [p]);
}

/**
 * Places every problem of `compileSheet` / `validateSheet` where it belongs. Paths are
 * relative to the sheet (`['blocks', i, ...]`, `['connections', j, ...]`); `prefix` strips
 * a document prefix such as `['plc', 'sheet']` first. A connection problem is also shown on
 * the block at each end of the wire, and `related` ids (the members of a loop, the other
 * block of a duplicate) get the problem too, so nothing is only visible on a thin wire.
 */
export function indexSheetProblems(sheet: Sheet, problems: readonly Problem[], prefix: readonly (string | number)[] = []): SheetProblemIndex {
  const index: SheetProblemIndex = {
    byBlock: new Map(),
    byConnection: new Map(),
    loopBlocks: new Set(),
    loopConnections: new Set(),
    sheet: [],
  };
  const blockIds = new Set(sheet.blocks.map((b) => b.id));
  const connIds = new Set(sheet.connections.map((c) => c.id));
  for (const p of problems) {
    if (!prefix.every((seg, i) => p.path[i] === seg)) continue;
    const path = p.path.slice(prefix.length);
    let placed = false;
    if (path[0] === 'blocks' && typeof path[1] === 'number') {
      const b = sheet.blocks[path[1]];
      if (b) {
        push(index.byBlock, b.id, p);
        placed = true;
      }
    } else if (path[0] === 'connections' && typeof path[1] === 'number') {
      const c = sheet.connections[path[1]];
      if (c) {
        push(index.byConnection, c.id, p);
        if (blockIds.has(c.from.block)) push(index.byBlock, c.from.block, p);
        if (blockIds.has(c.to.block)) push(index.byBlock, c.to.block, p);
        placed = true;
      }
    }
    for (const id of p.related ?? []) {
      if (blockIds.has(id)) {
        push(index.byBlock, id, p);
        placed = true;
      } else if (connIds.has(id)) {
        push(index.byConnection, id, p);
        placed = true;
      }
    }
    if (p.code === 'algebraic_loop') {
      const members = new Set((p.related ?? []).filter((id) => blockIds.has(id)));
      for (const id of members) index.loopBlocks.add(id);
      for (const c of sheet.connections) {
        if (members.has(c.from.block) && members.has(c.to.block)) index.loopConnections.add(c.id);
      }
    }
    if (!placed) index.sheet.push(p);
  }
  return index;
}

/** The ports of a document block (variadic inputs from its params), or none for an unknown type. */
export function portsOf(block: Pick<Block, 'type' | 'params'>): { inputs: PortSpec[]; outputs: PortSpec[] } {
  if (!isBlockType(block.type)) return { inputs: [], outputs: [] };
  return blockPorts(block.type, (block.params ?? {}) as Record<string, unknown>);
}

/** A wire the user tries to draw, by block id and port name. */
export type ConnectionAttempt = { source: string; sourcePort: string; target: string; targetPort: string };

/**
 * Whether a wire may be drawn, with the reason in words when not. The port types come
 * from the engine's catalogue and the rule from its `portTypesCompatible`; an input with a
 * driver already is refused too (the engine would report `multiple_drivers`).
 */
export function checkConnection(sheet: Sheet, attempt: ConnectionAttempt): { ok: true } | { ok: false; message: string } {
  const from = sheet.blocks.find((b) => b.id === attempt.source);
  const to = sheet.blocks.find((b) => b.id === attempt.target);
  if (!from || !to) return { ok: false, message: 'Both ends of a wire must be blocks on this sheet.' };
  const out = portsOf(from).outputs.find((p) => p.name === attempt.sourcePort);
  const inp = portsOf(to).inputs.find((p) => p.name === attempt.targetPort);
  if (!out) return { ok: false, message: `${from.id} has no output ${attempt.sourcePort}.` };
  if (!inp) return { ok: false, message: `${to.id} has no input ${attempt.targetPort}.` };
  if (!portTypesCompatible(out.type, inp.type)) {
    return {
      ok: false,
      message: `Cannot wire ${out.type} output ${from.id}.${out.name} to ${inp.type} input ${to.id}.${inp.name}: BOOL wires only to BOOL.`,
    };
  }
  const driver = sheet.connections.find((c) => c.to.block === to.id && c.to.port === inp.name);
  if (driver) {
    return { ok: false, message: `Input ${to.id}.${inp.name} is already driven by ${driver.from.block}.${driver.from.port}; remove that wire first.` };
  }
  return { ok: true };
}

/** The first id `prefix + n` (n = 1, 2 …) not in `taken`. */
export function freshId(prefix: string, taken: ReadonlySet<string>): string {
  const base = prefix.replace(/[^A-Za-z0-9_.:-]/g, '_').slice(0, 56) || 'b';
  for (let n = 1; ; n++) {
    const id = `${base}${n}`;
    if (!taken.has(id)) return id;
  }
}

/** A readable id stem per block type, e.g. `ton`, `noContact`. */
function idStem(type: BlockType): string {
  const parts = type.toLowerCase().split('_');
  return parts[0] + parts.slice(1).map((s) => s.charAt(0).toUpperCase() + s.slice(1)).join('');
}

/** Adds a block of `type` at `position` with the catalogue's default parameters. */
export function addBlock(sheet: Sheet, type: BlockType, position: { x: number; y: number }): { sheet: Sheet; id: string } {
  const id = freshId(idStem(type), new Set(sheet.blocks.map((b) => b.id)));
  const params = structuredClone(blockCatalogue[type].defaultParams);
  const block = { id, type, position: { x: Math.round(position.x), y: Math.round(position.y) }, params } as Block;
  return { sheet: { ...sheet, blocks: [...sheet.blocks, block] }, id };
}

/** Removes blocks and connections by id, and every wire that touched a removed block. */
export function removeElements(sheet: Sheet, blockIds: readonly string[], connectionIds: readonly string[] = []): Sheet {
  const gone = new Set(blockIds);
  const goneConn = new Set(connectionIds);
  return {
    ...sheet,
    blocks: sheet.blocks.filter((b) => !gone.has(b.id)),
    connections: sheet.connections.filter((c) => !goneConn.has(c.id) && !gone.has(c.from.block) && !gone.has(c.to.block)),
  };
}

/** Moves blocks to new positions (rounded to whole units so documents stay tidy). */
export function moveBlocks(sheet: Sheet, moves: ReadonlyMap<string, { x: number; y: number }>): Sheet {
  if (moves.size === 0) return sheet;
  return {
    ...sheet,
    blocks: sheet.blocks.map((b) => {
      const to = moves.get(b.id);
      return to ? ({ ...b, position: { x: Math.round(to.x), y: Math.round(to.y) } } as Block) : b;
    }),
  };
}

/** Adds a wire (call {@link checkConnection} first). */
export function connect(sheet: Sheet, attempt: ConnectionAttempt): { sheet: Sheet; id: string } {
  const id = freshId('c', new Set(sheet.connections.map((c) => c.id)));
  const conn: Connection = { id, from: { block: attempt.source, port: attempt.sourcePort }, to: { block: attempt.target, port: attempt.targetPort } };
  return { sheet: { ...sheet, connections: [...sheet.connections, conn] }, id };
}

/**
 * Sets one parameter of a block. Changing a variadic block's input count also drops the
 * wires into inputs that no longer exist, so the sheet never names a missing port.
 */
export function setBlockParam(sheet: Sheet, blockId: string, name: string, value: unknown): Sheet {
  const block = sheet.blocks.find((b) => b.id === blockId);
  if (!block) return sheet;
  const params = { ...((block.params ?? {}) as Record<string, unknown>), [name]: value };
  // An optional parameter set to nothing is left out (the engine's default stands in).
  if (value === undefined) delete params[name];
  const next = { ...block, params } as Block;
  let connections = sheet.connections;
  if (isBlockType(block.type) && blockCatalogue[block.type].variadic?.param === name) {
    const names = new Set(portsOf(next).inputs.map((p) => p.name));
    connections = connections.filter((c) => c.to.block !== blockId || names.has(c.to.port));
  }
  return { ...sheet, blocks: sheet.blocks.map((b) => (b === block ? next : b)), connections };
}

/** Sets or clears a block's free-text label. */
export function setBlockLabel(sheet: Sheet, blockId: string, label: string): Sheet {
  return {
    ...sheet,
    blocks: sheet.blocks.map((b) => {
      if (b.id !== blockId) return b;
      const { label: _old, ...rest } = b;
      void _old;
      return (label.trim() ? { ...rest, label: label.trim() } : rest) as Block;
    }),
  };
}

/** How a live value reads on a wire label: BOOLs as TRUE/FALSE, numbers compactly. */
export function formatLiveValue(value: boolean | number | undefined): string {
  if (value === undefined) return '';
  if (typeof value === 'boolean') return value ? 'TRUE' : 'FALSE';
  if (!Number.isFinite(value)) return String(value);
  if (Number.isInteger(value)) return String(value);
  return Number(value.toPrecision(5)).toString();
}

/** Palette groups in the order they are offered, each with its block types from the catalogue. */
export function paletteGroups(): { group: string; types: BlockType[] }[] {
  const groups = new Map<string, BlockType[]>();
  for (const spec of Object.values(blockCatalogue)) {
    const list = groups.get(spec.group);
    if (list) list.push(spec.type);
    else groups.set(spec.group, [spec.type]);
  }
  return [...groups].map(([group, types]) => ({ group, types }));
}

/** The parameters a block type shows in its editor, by kind of input. */
export type ParamField =
  | { name: string; kind: 'address'; label: string }
  | { name: string; kind: 'number'; label: string; integer?: boolean; min?: number; max?: number; unit?: string; optional?: string }
  | { name: string; kind: 'boolean'; label: string };

/**
 * Editor fields for a block type, derived from the catalogue's default parameters: a
 * string is an address, a boolean a checkbox, a number a numeric input (PT in ms, PV and
 * the logic blocks' input count as integers).
 */
export function paramFields(type: BlockType): ParamField[] {
  const spec = blockCatalogue[type];
  // Optional numbers (a SPAN_MAP's raw span) first, empty meaning "what the engine says stands in".
  const optional = Object.entries(spec.optionalParams ?? {}).map(([name, standsIn]): ParamField => ({ name, kind: 'number', label: name, optional: standsIn }));
  return [...optional, ...Object.entries(spec.defaultParams).map(([name, dflt]): ParamField => {
    if (typeof dflt === 'string') return { name, kind: 'address', label: 'Address' };
    if (typeof dflt === 'boolean') return { name, kind: 'boolean', label: name };
    if (spec.variadic?.param === name) {
      return { name, kind: 'number', label: 'Inputs', integer: true, min: spec.variadic.min, max: spec.variadic.max };
    }
    if (name === 'PT') return { name, kind: 'number', label: 'PT', integer: true, min: 0, unit: 'ms' };
    if (name === 'PV') return { name, kind: 'number', label: 'PV', integer: true };
    return { name, kind: 'number', label: name };
  })];
}

function portSignature(ports: { inputs: PortSpec[]; outputs: PortSpec[] }): string {
  return [...ports.inputs.map((p) => `i${p.name}:${p.type}`), ...ports.outputs.map((p) => `o${p.name}:${p.type}`)].join(',');
}

/**
 * Types a block can switch to without touching its wires: the same catalogue group and
 * the same ports (NO ↔ NC contact, the coil kinds, the comparisons, the timers, the edges).
 */
export function swappableTypes(type: BlockType): BlockType[] {
  const spec = blockCatalogue[type];
  const sig = portSignature(blockPorts(type));
  return Object.values(blockCatalogue)
    .filter((s) => s.group === spec.group && portSignature(blockPorts(s.type)) === sig)
    .map((s) => s.type);
}

/** Switches a block to another type with the same ports, keeping the parameters both types share. */
export function setBlockType(sheet: Sheet, blockId: string, type: BlockType): Sheet {
  return {
    ...sheet,
    blocks: sheet.blocks.map((b) => {
      if (b.id !== blockId) return b;
      const old = (b.params ?? {}) as Record<string, unknown>;
      const params: Record<string, unknown> = structuredClone(blockCatalogue[type].defaultParams);
      for (const k of Object.keys(params)) if (k in old) params[k] = old[k];
      return { ...b, type, params } as Block;
    }),
  };
}
