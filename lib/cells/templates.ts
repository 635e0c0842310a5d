/**
 * The starting documents a new cell can be created from. The pick-and-place cell and the
 * panel starter are the engine's demo documents; the blank cell is the smallest document of
 * our own that passes the engine's whole-document validation (tests/integration/cells.test.ts).
 * No `server-only`: the demo seed (run by tsx outside Next.js) uses them too.
 */
import { pickAndPlaceCell, starterCell } from '@/simulator';
import type { CellTemplate } from './template-names';

/** A cell document as written (defaults may be omitted), the type the demo cells have. */
type CellDocumentInput = typeof pickAndPlaceCell;

export { CELL_TEMPLATES, TEMPLATE_LABELS } from './template-names';
export type { CellTemplate } from './template-names';

/** A 2-axis controller with no modules and only a home pose: the smallest valid controller. */
function bareController(): CellDocumentInput['controller'] {
  return {
    axes: 2,
    bootMs: 1500,
    ioRefreshMs: 10,
    stopCategory: 1,
    homePose: 'home',
    positionTolerance: 0.001,
    cycleDonePulseMs: 500,
    modules: [],
    pointMap: [],
    staged: null,
    handshake: { inputs: {}, outputs: {} },
    routine: [],
    poses: [{ id: 'home', label: 'Home', coordinates: [0, 0.4], speed: 0.5, accel: 1 }],
  };
}

function blankCell(name: string): CellDocumentInput {
  return {
    schemaVersion: 2,
    id: 'blank-cell',
    name,
    seed: 1,
    panel: [],
    field: [],
    link: { kind: 'hardwired' },
    plc: { modules: [], sheet: { scanPeriodMs: 10, blocks: [], connections: [] } },
    wiring: [],
    controller: bareController(),
    initial: { controllerPowered: true },
  };
}

/** A fresh copy of a template's document, named `name` (the caller validates and stores it). */
export function templateDocument(template: CellTemplate, name: string): CellDocumentInput {
  switch (template) {
    case 'pick-and-place':
      return { ...structuredClone(pickAndPlaceCell), name } as CellDocumentInput;
    case 'panel-starter':
      return { ...structuredClone(starterCell), name } as CellDocumentInput;
    case 'blank':
      return blankCell(name);
  }
}
