/**
 * The shape of a changeover diff: what changed between a *base* cell document (what runs
 * today) and a *proposed* one, grouped by area. Everything here is plain JSON so a diff can be
 * stored beside a changeover record, signed, sent to the browser and printed by the CLI.
 */
import type { ChannelRef, Endpoint } from '@/simulator/schema/cell-document';

/** Version of the diff format; bumped when a stored or signed diff would read differently. */
export const DIFF_FORMAT_VERSION = 1 as const;

/** Areas of a diff, in the order a reviewer reads them (and the order of `CellDiff.areas`). */
export const DIFF_AREAS = ['cell', 'devices', 'modules', 'wiring', 'pointMap', 'logic', 'routine', 'handshake'] as const;
/** One area of a diff. */
export type DiffArea = (typeof DIFF_AREAS)[number];

/**
 * What happened to a thing: `added`, `removed`, `changed` (fields differ), `moved` (only its
 * place on the canvas or front plate changed: low importance), `reordered` (a routine step
 * now runs at another place in the sequence).
 */
export const DIFF_KINDS = ['added', 'removed', 'changed', 'moved', 'reordered'] as const;
/** One kind of change. */
export type DiffKind = (typeof DIFF_KINDS)[number];

/** What an entry is about, so the UI knows where to jump (canvas, wiring table, point map ...). */
export type DiffTarget =
  | 'cell-field'
  | 'panel-device'
  | 'field-device'
  | 'plc-module'
  | 'controller-module'
  | 'wire'
  | 'point-map-row'
  | 'staged-map'
  | 'block'
  | 'connection'
  | 'step'
  | 'pose'
  | 'role';

/**
 * One changed field of a thing. `path` is dotted from the thing itself (`params.PT`,
 * `slot`, `points.DI4.label`); `from` is absent when the field was added, `to` when removed.
 */
export type FieldChange = { path: string; from?: unknown; to?: unknown };

/** A terminal-strip row's end that now lands elsewhere. */
export type WireEndChange = { end: 'from' | 'to'; was: Endpoint; now: Endpoint };

/** Where a handshake role points on one side: the logical point and, when mapped, where it lives. */
export type RoleBinding = {
  point: string;
  label?: string;
  /** Physical channel of the point in that side's live point map (first channel of a word point). */
  location?: ChannelRef;
  /** Other ends of the terminal-strip rows on that channel (`%QX0.3`, `guard:contact`). */
  wiredTo?: string[];
};

/** One change, with enough to show it and to find the thing in the document. */
export type DiffEntry = {
  area: DiffArea;
  kind: DiffKind;
  target: DiffTarget;
  /**
   * The thing's id: device, module, wiring row, point-map row, block or connection id; a pose
   * id; a step's label or `#<n>` (1-based, proposed side unless removed); a handshake role
   * (`inputs.guardClosed`); a dotted document path for cell fields.
   */
  id: string;
  /** One line for a person, in English. */
  detail: string;
  /** `low` for canvas / front-plate position moves, `high` for everything else. */
  importance: 'high' | 'low';
  /** Path of the thing in the proposed document (in the base document when removed). */
  path: (string | number)[];
  /** Changed fields (empty for added and removed things, which carry `value` instead). */
  changes: FieldChange[];
  /** The whole thing as added or removed. */
  value?: unknown;
  /** Point-map rows: whether the change is to the live map or to a staged one (see diff-cell.ts). */
  map?: 'live' | 'staged';
  /** Wiring rows: the ends that now land on another terminal. */
  ends?: WireEndChange[];
  /** Routine steps: 0-based index in the base routine (absent when added). */
  baseIndex?: number;
  /** Routine steps: 0-based index in the proposed routine (absent when removed). */
  proposedIndex?: number;
  /** Handshake roles: the binding in base (absent when the role was unassigned). */
  was?: RoleBinding;
  /** Handshake roles: the binding in proposed (absent when the role is now unassigned). */
  now?: RoleBinding;
};

/** Counts of one area, by kind. */
export type AreaCounts = Record<DiffKind, number> & { total: number };

/** Counts per area with a fixed key order, for a changeover record and its signature. */
export type DiffSummary = {
  identical: boolean;
  total: number;
  areas: Record<DiffArea, AreaCounts>;
};

/** The structural diff of two cell documents. */
export type CellDiff = {
  version: typeof DIFF_FORMAT_VERSION;
  base: { id: string; name: string };
  proposed: { id: string; name: string };
  /** Entries per area; within an area ordered by thing kind, then id (routine steps by index). */
  areas: Record<DiffArea, DiffEntry[]>;
  summary: DiffSummary;
};

/** Counts the entries of each area; keys always in {@link DIFF_AREAS} / {@link DIFF_KINDS} order. */
export function summarise(areas: Record<DiffArea, DiffEntry[]>): DiffSummary {
  const out = {} as Record<DiffArea, AreaCounts>;
  let total = 0;
  for (const area of DIFF_AREAS) {
    const counts = { added: 0, removed: 0, changed: 0, moved: 0, reordered: 0, total: 0 };
    for (const e of areas[area]) counts[e.kind]++;
    counts.total = areas[area].length;
    total += counts.total;
    out[area] = counts;
  }
  return { identical: total === 0, total, areas: out };
}
