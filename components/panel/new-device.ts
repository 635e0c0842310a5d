import type { PanelDevice } from '@/simulator';
import { freshId } from '@/components/workspace/fresh-id';

/** Device kinds the palette offers, with a starting configuration for each. */
export const PANEL_KINDS: { kind: string; label: string }[] = [
  { kind: 'push-button', label: 'Push button' },
  { kind: 'illuminated-button', label: 'Illuminated button' },
  { kind: 'selector-switch', label: 'Selector switch' },
  { kind: 'e-stop', label: 'E-stop' },
  { kind: 'pilot-light', label: 'Pilot light' },
  { kind: 'stack-light', label: 'Stack light' },
  { kind: 'potentiometer', label: 'Potentiometer' },
  { kind: 'numeric-display', label: 'Numeric display' },
];


const PREFIX: Record<string, string> = {
  'push-button': 'pb',
  'illuminated-button': 'ib',
  'selector-switch': 'sel',
  'e-stop': 'es',
  'pilot-light': 'pl',
  'stack-light': 'stack',
  potentiometer: 'pot',
  'numeric-display': 'disp',
};

/** A new panel device of `kind` at `position`, with defaults matching IEC 60204-1 colour use. */
export function newPanelDevice(kind: string, taken: Iterable<string>, position: { x: number; y: number }): PanelDevice {
  const id = freshId(PREFIX[kind] ?? 'dev', taken);
  const base = { id, label: PANEL_KINDS.find((k) => k.kind === kind)?.label ?? kind, position };
  switch (kind) {
    case 'illuminated-button':
      return { ...base, type: 'illuminated-button', colour: 'green', contact: 'NO', action: 'momentary' };
    case 'selector-switch':
      return { ...base, type: 'selector-switch', colour: 'black', positions: ['Off', 'On'] };
    case 'e-stop':
      return { ...base, type: 'e-stop', colour: 'red' };
    case 'pilot-light':
      return { ...base, type: 'pilot-light', colour: 'white' };
    case 'stack-light':
      return { ...base, type: 'stack-light', colour: 'grey', tiers: ['red', 'yellow', 'green'] };
    case 'potentiometer':
      return { ...base, type: 'potentiometer', colour: 'black', signal: '0-10V', min: 0, max: 100, unit: '%' };
    case 'numeric-display':
      return { ...base, type: 'numeric-display', colour: 'black', digits: 4, encoding: 'binary' };
    default:
      return { ...base, type: 'push-button', colour: 'white', contact: 'NO', action: 'momentary' };
  }
}
