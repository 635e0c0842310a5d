/**
 * The controller's part of a diff: point-map rows (live and staged) and handshake roles.
 *
 * Live and staged: `live` entries compare the two live maps. `staged` entries exist only when
 * either side has a staged edit, and compare what each side will run after its next
 * controller restart (its staged rows, or its live rows when nothing is staged) — so a lead
 * sees exactly what a restart of the proposed cell would change relative to base.
 */
import type { CellDocument, PointMapRow } from '@/simulator/schema/cell-document';
import { resolvePointMap } from '@/simulator/controller/point-map';
import { diffFields, diffKeyed } from './delta';
import { keyedEntries } from './entries';
import { describeChanges, formatChannel, formatEndpoint } from './format';
import type { DiffEntry, RoleBinding } from './types';

/** `DI1–DI6` or `WI1`: the logical points of a row. */
export function rowRange(row: Pick<PointMapRow, 'family' | 'first' | 'count'>): string {
  return row.count === 1 ? `${row.family}${row.first}` : `${row.family}${row.first}–${row.family}${row.first + row.count - 1}`;
}

/**
 * What is compared of a row: its location and, per logical point (`DI4`), label and invert.
 * Keying points by their logical name reports "DI4 label" rather than "points[3].label", and
 * an absent label or invert reads as the empty label / not inverted the engine uses.
 */
function rowView(row: PointMapRow) {
  const points: Record<string, { label: string; invert: boolean }> = {};
  for (let i = 0; i < row.count; i++) {
    const p = row.points?.[i];
    points[`${row.family}${row.first + i}`] = { label: p?.label ?? '', invert: p?.invert ?? false };
  }
  const view: Record<string, unknown> = { family: row.family, first: row.first, count: row.count, rack: row.rack, slot: row.slot, firstChannel: row.firstChannel };
  if (row.bits !== undefined) view.bits = row.bits;
  if (row.encoding !== undefined) view.encoding = row.encoding;
  view.points = points;
  return view;
}

function rowEntries(base: readonly PointMapRow[], proposed: readonly PointMapRow[], map: 'live' | 'staged'): DiffEntry[] {
  const where = map === 'live' ? 'pointMap' : 'staged';
  return keyedEntries(diffKeyed(base, proposed, (r) => r.id, rowView), {
    area: 'pointMap',
    target: 'point-map-row',
    noun: map === 'live' ? 'point-map row' : 'staged point-map row',
    id: (r) => r.id,
    path: (i) => ['controller', where, i],
    text: (r) => `${rowRange(r)} on ${formatChannel({ rack: r.rack, slot: r.slot, channel: r.firstChannel })}`,
    changed: (pair, common) => [
      {
        ...common,
        kind: 'changed',
        changes: pair.changes,
        detail: `${map === 'live' ? 'point-map row' : 'staged point-map row'} ${common.id} (${rowRange(pair.proposed.item)}): ${describeChanges(pair.changes)}`,
      },
    ],
    extra: { map },
  });
}

/** Point-map entries: the live map's rows, then (when anything is staged) the staged rows. */
export function diffPointMap(base: CellDocument, proposed: CellDocument): DiffEntry[] {
  const a = base.controller;
  const b = proposed.controller;
  const out = rowEntries(a.pointMap, b.pointMap, 'live');
  if (a.staged === null && b.staged === null) return out;
  if ((a.staged === null) !== (b.staged === null)) {
    const added = b.staged !== null;
    out.push({
      area: 'pointMap',
      kind: added ? 'added' : 'removed',
      target: 'staged-map',
      id: 'staged',
      importance: 'high',
      path: ['controller', 'staged'],
      changes: [],
      map: 'staged',
      detail: added
        ? 'a point-map edit is staged: it takes effect at the next controller restart'
        : 'no point-map edit is staged any more (made live by a restart, or discarded)',
    });
  }
  out.push(...rowEntries(a.staged ?? a.pointMap, b.staged ?? b.pointMap, 'staged'));
  return out;
}

/** Where a point lives in a document's live map and what its channel is wired to. */
export function bindingOf(doc: CellDocument, point: string, resolved = resolvePointMap(doc.controller.pointMap)): RoleBinding {
  const p = resolved.byRef.get(point);
  if (!p) return { point };
  const wiredTo: string[] = [];
  for (const row of doc.wiring) {
    for (const [here, there] of [
      [row.from, row.to],
      [row.to, row.from],
    ] as const) {
      if (!('controller' in here)) continue;
      const c = here.controller;
      if (c.rack === p.rack && c.slot === p.slot && c.channel >= p.channel && c.channel < p.channel + p.bits) wiredTo.push(formatEndpoint(there));
    }
  }
  return {
    point,
    ...(p.label ? { label: p.label } : {}),
    location: { rack: p.rack, slot: p.slot, channel: p.channel },
    ...(wiredTo.length > 0 ? { wiredTo: [...new Set(wiredTo)].sort() } : {}),
  };
}

function bindingText(b: RoleBinding | undefined): string {
  if (!b) return 'unassigned';
  const label = b.label ? ` "${b.label}"` : '';
  const where = b.location ? ` (${formatChannel(b.location)}${b.wiredTo ? `, wired to ${b.wiredTo.join(', ')}` : ''})` : ' (not in the live point map)';
  return `${b.point}${label}${where}`;
}

/** Handshake entries: one per role whose point was assigned, unassigned or re-pointed. */
export function diffHandshake(base: CellDocument, proposed: CellDocument): DiffEntry[] {
  const changes = diffFields(base.controller.handshake, proposed.controller.handshake);
  if (changes.length === 0) return [];
  const ra = resolvePointMap(base.controller.pointMap);
  const rb = resolvePointMap(proposed.controller.pointMap);
  return changes.map((c) => {
    const [side, role] = c.path.split('.');
    const was = typeof c.from === 'string' ? bindingOf(base, c.from, ra) : undefined;
    const now = typeof c.to === 'string' ? bindingOf(proposed, c.to, rb) : undefined;
    const kind = was === undefined ? 'added' : now === undefined ? 'removed' : 'changed';
    const direction = side === 'inputs' ? 'input' : 'output';
    return {
      area: 'handshake',
      kind,
      target: 'role',
      id: c.path,
      importance: 'high',
      path: ['controller', 'handshake', side, role],
      changes: [c],
      ...(was ? { was } : {}),
      ...(now ? { now } : {}),
      detail: `${direction} role ${role}: ${bindingText(was)} → ${bindingText(now)}`,
    };
  });
}
