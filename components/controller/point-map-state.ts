/**
 * The point map's view model, as the rack view's slot cards show it: every range (point-map row)
 * with its state and an explanation in words. Pure, so the wording and the states are unit-tested.
 *
 * - in-force: the range runs now and no edit of it waits.
 * - waiting: the range differs from the running map (added, changed or removed) and waits for the
 *   controller's reboot (DESIGN.md: point-map changes take effect only after a restart).
 * - clash: the range, as it would run after the reboot, clashes with another range or with the
 *   modules; the engine refuses to stage such a map, so the reboot stays blocked.
 */
import { validatePointMap, channelsPerPoint, FAMILY_MODULE_TYPE } from '@/simulator';
import type { ControllerModule, PointMapRow } from '@/simulator';

export type RowState = 'in-force' | 'waiting' | 'clash';
export type RowChange = 'added' | 'changed' | 'removed' | null;

/** A range's state in our words. */
export const STATE_WORDS: Record<RowState, string> = { 'in-force': 'in force', waiting: 'waits for reboot', clash: 'clash' };

export type PointFamily = PointMapRow['family'];

/** Point families in words (DESIGN.md: shown in words, the short code only where space is tight). */
export const FAMILY_WORDS: Record<PointFamily, string> = {
  DI: 'digital in',
  DO: 'digital out',
  AI: 'analog in',
  AO: 'analog out',
  WI: 'word in',
  WO: 'word out',
  TI: 'tool in',
  TO: 'tool out',
};
export const FAMILIES = Object.keys(FAMILY_WORDS) as PointFamily[];

/** The families a module of this type can carry (a digital module carries bits and grouped words). */
export function familiesFor(type: ControllerModule['type']): PointFamily[] {
  return FAMILIES.filter((f) => FAMILY_MODULE_TYPE[f] === type);
}

export type PointMapRowView = {
  row: PointMapRow;
  state: RowState;
  change: RowChange;
  /** Sentences explaining the state, first the most important. */
  explanation: string[];
};

/** "4–7" or "4" for a channel range. */
export function channelRange(first: number, last: number): string {
  return first === last ? `${first}` : `${first}–${last}`;
}

/** Physical channels a row occupies: `[first, last]` inclusive. */
export function rowChannels(row: PointMapRow): [number, number] {
  return [row.firstChannel, row.firstChannel + row.count * channelsPerPoint(row) - 1];
}

/** The logical points of a range: "DI1–DI6" or "WI1". */
export function rowPoints(row: PointMapRow): string {
  const last = row.first + row.count - 1;
  return last === row.first ? `${row.family}${row.first}` : `${row.family}${row.first}–${row.family}${last}`;
}

const FIELD_WORDS: Record<string, string> = {
  family: 'family',
  first: 'first point',
  count: 'count',
  rack: 'rack',
  slot: 'slot',
  firstChannel: 'first channel',
  bits: 'bits',
  encoding: 'encoding',
};

/** What changed between a running row and its edited version, in words. */
export function describeChange(before: PointMapRow, after: PointMapRow): string[] {
  const out: string[] = [];
  for (const [key, word] of Object.entries(FIELD_WORDS)) {
    const a = (before as Record<string, unknown>)[key];
    const b = (after as Record<string, unknown>)[key];
    if (a !== b) out.push(`${word} ${a ?? '—'} → ${b ?? '—'}`);
  }
  if (JSON.stringify(before.points ?? []) !== JSON.stringify(after.points ?? [])) out.push('point labels or inversion');
  return out;
}

function sameRow(a: PointMapRow, b: PointMapRow): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/**
 * Conflicts of each row in `rows` (index → sentences): shared channels and shared logical
 * points phrased with the other row's number and the exact overlap, plus the engine's own
 * checks (no module, wrong module type, beyond the module's channels, duplicate id).
 */
export function rowConflicts(rows: readonly PointMapRow[], modules: readonly ControllerModule[]): Map<number, string[]> {
  const out = new Map<number, string[]>();
  const add = (i: number, s: string) => {
    const list = out.get(i);
    if (list) list.push(s);
    else out.set(i, [s]);
  };
  for (let i = 0; i < rows.length; i++) {
    for (let j = 0; j < rows.length; j++) {
      if (i === j) continue;
      const a = rows[i];
      const b = rows[j];
      if (a.rack === b.rack && a.slot === b.slot) {
        const [a0, a1] = rowChannels(a);
        const [b0, b1] = rowChannels(b);
        const lo = Math.max(a0, b0);
        const hi = Math.min(a1, b1);
        if (lo <= hi) add(i, `shares channels ${channelRange(lo, hi)} of rack ${a.rack} slot ${a.slot} with ${rowPoints(b)}`);
      }
      if (a.family === b.family) {
        const lo = Math.max(a.first, b.first);
        const hi = Math.min(a.first + a.count - 1, b.first + b.count - 1);
        if (lo <= hi) {
          const pts = lo === hi ? `${a.family}${lo}` : `${a.family}${lo}–${a.family}${hi}`;
          add(i, `${pts} also mapped by the range ${rowPoints(b)} on rack ${b.rack} slot ${b.slot}`);
        }
      }
    }
  }
  const own = validatePointMap(rows, modules, [], []);
  for (const p of own) {
    if (p.code === 'channel_overlap' || p.code === 'point_overlap') continue;
    const i = p.path[0];
    if (typeof i !== 'number') continue;
    const row = rows[i];
    switch (p.code) {
      case 'no_module':
        add(i, `no module in rack ${row.rack} slot ${row.slot}`);
        break;
      case 'family_module_mismatch': {
        const mod = modules.find((m) => m.rack === row.rack && m.slot === row.slot);
        add(i, `${FAMILY_WORDS[row.family]} points need a ${FAMILY_MODULE_TYPE[row.family]} module; rack ${row.rack} slot ${row.slot} holds ${mod?.type ?? 'another type'}`);
        break;
      }
      case 'beyond_capacity': {
        const mod = modules.find((m) => m.rack === row.rack && m.slot === row.slot);
        const [c0, c1] = rowChannels(row);
        add(i, `needs channels ${channelRange(c0, c1)} but the module has channels ${channelRange(0, (mod?.channels ?? 1) - 1)}`);
        break;
      }
      default:
        add(i, p.message);
    }
  }
  return out;
}

/**
 * Builds the view: the ranges as they will run after the next reboot (staged, or live when
 * nothing is staged), then the ranges the staged edit removes. `live` is what runs now.
 */
export function pointMapView(live: readonly PointMapRow[], staged: readonly PointMapRow[] | null, modules: readonly ControllerModule[]): PointMapRowView[] {
  const next = staged ?? live;
  const liveById = new Map(live.map((r) => [r.id, r]));
  const conflicts = rowConflicts(next, modules);
  const views: PointMapRowView[] = next.map((row, i) => {
    const clash = conflicts.get(i);
    const before = liveById.get(row.id);
    let change: RowChange = null;
    if (staged) {
      if (!before) change = 'added';
      else if (!sameRow(before, row)) change = 'changed';
    }
    const changeWords =
      change === 'added' ? ['new range'] : change === 'changed' && before ? [`changed: ${describeChange(before, row).join(', ')}`] : [];
    if (clash) {
      return { row, state: 'clash', change, explanation: [...clash, ...changeWords, 'the reboot waits until this is fixed'] };
    }
    if (change) {
      return { row, state: 'waiting', change, explanation: [...changeWords, 'in force once the controller reboots'] };
    }
    const [c0, c1] = rowChannels(row);
    return {
      row,
      state: 'in-force',
      change: null,
      explanation: [`${rowPoints(row)} on rack ${row.rack} slot ${row.slot} channels ${channelRange(c0, c1)}, in force now`],
    };
  });
  if (staged) {
    const kept = new Set(staged.map((r) => r.id));
    for (const row of live) {
      if (kept.has(row.id)) continue;
      views.push({
        row,
        state: 'waiting',
        change: 'removed',
        explanation: ['removed: stays mapped until the controller reboots'],
      });
    }
  }
  return views;
}

/** True when the staged ranges can go in force: something is staged and no range clashes. */
export function canApplyStaged(views: readonly PointMapRowView[], staged: readonly PointMapRow[] | null): boolean {
  return staged !== null && views.every((v) => v.state !== 'clash');
}

/** The next free first point of a family and the first channel of a slot no range uses, for a new range there. */
export function newRangeAt(rows: readonly PointMapRow[], module: ControllerModule, family: PointFamily, id: string): PointMapRow {
  const first = 1 + Math.max(0, ...rows.filter((r) => r.family === family).map((r) => r.first + r.count - 1));
  const used = rows.filter((r) => r.rack === module.rack && r.slot === module.slot).map(rowChannels);
  let firstChannel = 0;
  while (used.some(([a, b]) => firstChannel >= a && firstChannel <= b)) firstChannel++;
  const row: PointMapRow = { id, family, first, count: 1, rack: module.rack, slot: module.slot, firstChannel };
  if (family === 'WI' || family === 'WO') Object.assign(row, { bits: 8, encoding: 'binary' });
  return row;
}
