/** Template names and labels, apart from the documents so the browser bundle stays small. */
export const CELL_TEMPLATES = ['pick-and-place', 'panel-starter', 'blank'] as const;
export type CellTemplate = (typeof CELL_TEMPLATES)[number];

export const TEMPLATE_LABELS: Record<CellTemplate, { label: string; description: string }> = {
  'pick-and-place': {
    label: 'Pick-and-place demo',
    description: 'A complete 2-axis pick-and-place cell: panel, guard, part sensor, gripper, PLC interlocks, controller routine.',
  },
  'panel-starter': {
    label: 'Panel starter',
    description: 'A first exercise: start/stop with seal-in, a running lamp, and a 4–20 mA speed setpoint on a display; no robot.',
  },
  blank: { label: 'Blank cell', description: 'Nothing placed: an empty panel, an empty logic sheet and a controller with only a home pose.' },
};
