/**
 * The logic sheet's part of a diff: blocks and connections, keyed by id so the canvas can
 * mark and jump to each one. A block's position on the canvas is a separate, low-importance
 * `moved` entry: dragging a block changes nothing the PLC does.
 */
import type { CellDocument } from '@/simulator/schema/cell-document';
import type { SheetBlock, SheetConnection } from '@/simulator/plc/sheet-schema';
import { collapseToTop, diffKeyed } from './delta';
import { keyedEntries, splitPositionMove } from './entries';
import { describeChanges, formatValue } from './format';
import type { DiffEntry } from './types';

/** `TP PT=100`, `NO_CONTACT address="%IX0.4"`: a block in one line. */
function blockText(b: SheetBlock): string {
  const params = Object.entries((b.params ?? {}) as Record<string, unknown>)
    .map(([k, v]) => `${k}=${formatValue(v)}`)
    .join(' ');
  return [b.type, params, b.label ? `"${b.label}"` : ''].filter(Boolean).join(' ');
}

function endText(e: SheetConnection['from'] | undefined): string {
  return e ? `${e.block}.${e.port}` : '—';
}

/** Block and connection entries (area `logic`): blocks first, each list sorted by id. */
export function diffLogic(base: CellDocument, proposed: CellDocument): DiffEntry[] {
  const blocks = keyedEntries(
    diffKeyed(base.plc.sheet.blocks, proposed.plc.sheet.blocks, (b) => b.id),
    {
      area: 'logic',
      target: 'block',
      noun: 'block',
      id: (b) => b.id,
      path: (i) => ['plc', 'sheet', 'blocks', i],
      text: blockText,
      changed: (pair, common) =>
        splitPositionMove(pair, common, 'block', 'on the sheet', (edits) => {
          const type = pair.base.item.type === pair.proposed.item.type ? ` (${pair.proposed.item.type})` : '';
          return `block ${common.id}${type}: ${describeChanges(edits)}`;
        }),
    },
  );
  const connections = keyedEntries(
    diffKeyed(base.plc.sheet.connections, proposed.plc.sheet.connections, (c) => c.id),
    {
      area: 'logic',
      target: 'connection',
      noun: 'connection',
      id: (c) => c.id,
      path: (i) => ['plc', 'sheet', 'connections', i],
      text: (c) => `${endText(c.from)} → ${endText(c.to)}`,
      changed: (pair, common) => {
        // An end is reported whole (`from a.Q → b.Q`), not as its block and port sub-fields.
        const changes = collapseToTop(pair.changes, pair.base.item, pair.proposed.item);
        const ends = changes.filter((ch) => ch.path === 'from' || ch.path === 'to');
        const words = changes.map((ch) =>
          ch.path === 'from' || ch.path === 'to'
            ? `${ch.path} ${endText(ch.from as SheetConnection['from'])} → ${endText(ch.to as SheetConnection['to'])}`
            : describeChanges([ch]),
        );
        return [{ ...common, kind: 'changed', changes, detail: `connection ${common.id}${ends.length > 0 ? ' re-pointed' : ''}: ${words.join('; ')}` }];
      },
    },
  );
  return [...blocks, ...connections];
}
