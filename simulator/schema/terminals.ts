/**
 * Terminals of each device type and what flows through them. `out` terminals source a
 * signal into the wiring (a contact, a sensor output, an analog signal); `in` terminals
 * take one (a lamp, a coil, a display word).
 */
import type { FieldDevice, PanelDevice } from './cell-document';

/** What a terminal carries. */
export type TerminalKind = 'contact' | 'sensor' | 'analog' | 'load' | 'word';

/** One terminal of a device. */
export type TerminalSpec = { name: string; direction: 'in' | 'out'; kind: TerminalKind };

/** The terminals of a device, by its type (selector switches and stack lights depend on their size). */
export function deviceTerminals(device: PanelDevice | FieldDevice): TerminalSpec[] {
  switch (device.type) {
    case 'push-button':
      return [{ name: 'contact', direction: 'out', kind: 'contact' }];
    case 'illuminated-button':
      return [
        { name: 'contact', direction: 'out', kind: 'contact' },
        { name: 'lamp', direction: 'in', kind: 'load' },
      ];
    case 'selector-switch':
      return device.positions.map((_, i) => ({ name: `pos${i}`, direction: 'out' as const, kind: 'contact' as const }));
    case 'e-stop':
      return [{ name: 'contact', direction: 'out', kind: 'contact' }];
    case 'pilot-light':
      return [{ name: 'lamp', direction: 'in', kind: 'load' }];
    case 'stack-light':
      return device.tiers.map((_, i) => ({ name: `tier${i}`, direction: 'in' as const, kind: 'load' as const }));
    case 'potentiometer':
      return [{ name: 'signal', direction: 'out', kind: 'analog' }];
    case 'numeric-display':
      return [{ name: 'value', direction: 'in', kind: 'word' }];
    case 'proximity-sensor':
    case 'photo-eye':
    case 'part-sensor':
      return [{ name: 'out', direction: 'out', kind: 'sensor' }];
    case 'guard-switch':
      return [{ name: 'contact', direction: 'out', kind: 'contact' }];
    case 'gripper':
      return [
        { name: 'close', direction: 'in', kind: 'load' },
        { name: 'closed', direction: 'out', kind: 'contact' },
        { name: 'open', direction: 'out', kind: 'contact' },
      ];
    case 'vacuum-cup':
      return [
        { name: 'valve', direction: 'in', kind: 'load' },
        { name: 'switch', direction: 'out', kind: 'contact' },
      ];
    case 'conveyor':
      return [
        { name: 'run', direction: 'in', kind: 'load' },
        { name: 'running', direction: 'out', kind: 'contact' },
      ];
  }
}
