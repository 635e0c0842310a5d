/**
 * The controller's point map: logical point ranges → rack / slot / first channel.
 * Physical channels count from 0, logical points from 1 (DESIGN.md). Staged edits take
 * effect only on a controller restart: {@link stagePointMap} records them and
 * {@link restartPointMap} makes them live. All functions are pure.
 */
import type { Problem } from '@/simulator/shared/result';
import type { ControllerModule, PointFamily, PointMapRow, WordEncoding } from '@/simulator/schema/cell-document';

/** The module type that can carry each point family. WI/WO are grouped bits on digital modules. */
export const FAMILY_MODULE_TYPE: Record<PointFamily, ControllerModule['type']> = {
  DI: 'digital-in',
  WI: 'digital-in',
  DO: 'digital-out',
  WO: 'digital-out',
  AI: 'analog-in',
  AO: 'analog-out',
  TI: 'tool-in',
  TO: 'tool-out',
};

/** Families that the controller reads (inputs) rather than drives. */
export const INPUT_FAMILIES: ReadonlySet<PointFamily> = new Set(['DI', 'WI', 'AI', 'TI']);

/** Where one logical point lives. Word points span `bits` channels from `channel`. */
export type ResolvedPoint = {
  ref: string;
  family: PointFamily;
  index: number;
  rack: number;
  slot: number;
  channel: number;
  bits: number;
  encoding: WordEncoding;
  invert: boolean;
  label: string;
  rowId: string;
};

/** A compiled map: logical → physical and physical → logical. */
export type ResolvedPointMap = {
  byRef: Map<string, ResolvedPoint>;
  /** Key `rack.slot.channel` → refs of points that use the channel. */
  byChannel: Map<string, string[]>;
};

/** Live and staged rows; `staged` is null when no edit is waiting. */
export type PointMapState = {
  live: PointMapRow[];
  staged: PointMapRow[] | null;
};

/**
 * Splits `DI3` into family and index, with `input` true for the families the controller
 * reads (DI, WI, AI, TI); null when it is not a point reference.
 */
export function parsePointRef(ref: string): { family: PointFamily; index: number; input: boolean } | null {
  const m = /^(DI|DO|AI|AO|WI|WO|TI|TO)([1-9]\d*)$/.exec(ref);
  if (!m) return null;
  const family = m[1] as PointFamily;
  return { family, index: Number(m[2]), input: INPUT_FAMILIES.has(family) };
}

/** Key of a physical channel. */
export function channelKey(rack: number, slot: number, channel: number): string {
  return `${rack}.${slot}.${channel}`;
}

function isWord(family: PointFamily): boolean {
  return family === 'WI' || family === 'WO';
}

/** Channels one point of a row occupies (1, or `bits` for word points, default 8). */
export function channelsPerPoint(row: PointMapRow): number {
  return isWord(row.family) ? (row.bits ?? 8) : 1;
}

/**
 * Resolves rows into a lookup. Rows are assumed valid ({@link validatePointMap}); where two
 * rows claim the same point the first row wins, so a bad map still resolves deterministically.
 */
export function resolvePointMap(rows: readonly PointMapRow[]): ResolvedPointMap {
  const byRef = new Map<string, ResolvedPoint>();
  const byChannel = new Map<string, string[]>();
  for (const row of rows) {
    const per = channelsPerPoint(row);
    for (let i = 0; i < row.count; i++) {
      const ref = `${row.family}${row.first + i}`;
      if (byRef.has(ref)) continue;
      const p: ResolvedPoint = {
        ref,
        family: row.family,
        index: row.first + i,
        rack: row.rack,
        slot: row.slot,
        channel: row.firstChannel + i * per,
        bits: per,
        encoding: row.encoding ?? 'binary',
        invert: row.points?.[i]?.invert ?? false,
        label: row.points?.[i]?.label ?? '',
        rowId: row.id,
      };
      byRef.set(ref, p);
      for (let b = 0; b < per; b++) {
        const key = channelKey(row.rack, row.slot, p.channel + b);
        const list = byChannel.get(key);
        if (list) list.push(ref);
        else byChannel.set(key, [ref]);
      }
    }
  }
  return { byRef, byChannel };
}

/** Physical → logical: the points that use a channel (empty when none). */
export function resolvePhysical(map: ResolvedPointMap, rack: number, slot: number, channel: number): string[] {
  return map.byChannel.get(channelKey(rack, slot, channel)) ?? [];
}

/** A point used somewhere else in the document (routine, handshake), with the path of the use. */
export type PointUse = { ref: string; path: (string | number)[] };

/**
 * Checks a map against the modules and the points in use. Reports every problem, naming the
 * rows involved (`related`): two rows claiming the same logical point or the same channel,
 * a row that runs beyond its module's channels, a family on the wrong module type, a row
 * on a rack/slot with no module, and a used point that no row maps.
 * `pathPrefix` locates the rows in the document (e.g. `['controller', 'pointMap']`).
 */
export function validatePointMap(
  rows: readonly PointMapRow[],
  modules: readonly ControllerModule[],
  uses: readonly PointUse[],
  pathPrefix: (string | number)[] = [],
): Problem[] {
  const problems: Problem[] = [];
  const moduleAt = new Map<string, ControllerModule>();
  for (const m of modules) moduleAt.set(`${m.rack}.${m.slot}`, m);

  const ids = new Map<string, number>();
  const pointOwner = new Map<string, number>();
  const channelOwner = new Map<string, number>();
  rows.forEach((row, r) => {
    const path = [...pathPrefix, r];
    const prev = ids.get(row.id);
    if (prev !== undefined) {
      problems.push({ path: [...path, 'id'], code: 'duplicate_id', message: `row id "${row.id}" is used twice`, related: [rows[prev].id] });
    } else ids.set(row.id, r);

    const per = channelsPerPoint(row);
    if (!isWord(row.family) && (row.bits !== undefined || row.encoding !== undefined)) {
      problems.push({ path: [...path, 'bits'], code: 'bits_not_word', message: `only WI/WO rows take bits and encoding (row "${row.id}" is ${row.family})` });
    }
    if (row.points && row.points.length > row.count) {
      problems.push({ path: [...path, 'points'], code: 'too_many_point_labels', message: `row "${row.id}" lists ${row.points.length} points but maps ${row.count}` });
    }
    const mod = moduleAt.get(`${row.rack}.${row.slot}`);
    if (!mod) {
      problems.push({ path: [...path, 'slot'], code: 'no_module', message: `row "${row.id}": no module in rack ${row.rack} slot ${row.slot}` });
    } else {
      const want = FAMILY_MODULE_TYPE[row.family];
      if (mod.type !== want) {
        problems.push({
          path: [...path, 'family'],
          code: 'family_module_mismatch',
          message: `row "${row.id}": ${row.family} points need a ${want} module, rack ${row.rack} slot ${row.slot} holds ${mod.type} "${mod.id}"`,
          related: [row.id, mod.id],
        });
      }
      const last = row.firstChannel + row.count * per - 1;
      if (last >= mod.channels) {
        problems.push({
          path: [...path, 'count'],
          code: 'beyond_capacity',
          message: `row "${row.id}" needs channels ${row.firstChannel}..${last} but module "${mod.id}" has channels 0..${mod.channels - 1}`,
          related: [row.id, mod.id],
        });
      }
    }
    for (let i = 0; i < row.count; i++) {
      const ref = `${row.family}${row.first + i}`;
      const owner = pointOwner.get(ref);
      if (owner !== undefined && owner !== r) {
        problems.push({
          path: [...path, 'first'],
          code: 'point_overlap',
          message: `rows "${rows[owner].id}" and "${row.id}" both map ${ref}`,
          related: [rows[owner].id, row.id],
        });
        break;
      }
      pointOwner.set(ref, r);
    }
    const overlapWith = new Set<number>();
    for (let c = 0; c < row.count * per; c++) {
      const key = channelKey(row.rack, row.slot, row.firstChannel + c);
      const owner = channelOwner.get(key);
      if (owner !== undefined && owner !== r) overlapWith.add(owner);
      else channelOwner.set(key, r);
    }
    for (const o of overlapWith) {
      problems.push({
        path: [...path, 'firstChannel'],
        code: 'channel_overlap',
        message: `rows "${rows[o].id}" and "${row.id}" share channels in rack ${row.rack} slot ${row.slot}`,
        related: [rows[o].id, row.id],
      });
    }
  });
  for (const use of uses) {
    if (!pointOwner.has(use.ref)) {
      problems.push({ path: use.path, code: 'unmapped_point', message: `${use.ref} is used but no point-map row maps it` });
    }
  }
  return problems;
}

/** Records an edit as staged; the live map is untouched until {@link restartPointMap}. */
export function stagePointMap(state: PointMapState, rows: PointMapRow[]): PointMapState {
  return { live: state.live, staged: rows };
}

/** A controller restart: the staged rows (if any) become live and nothing stays staged. */
export function restartPointMap(state: PointMapState): PointMapState {
  return state.staged ? { live: state.staged, staged: null } : state;
}
