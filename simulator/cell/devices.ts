/**
 * The device catalogue: per device type, what it exposes.
 */
import type { FieldDevice, PanelDevice } from '@/simulator/schema/cell-document';

/**
 * The properties a device's signals (`dev.<id>.<property>`) and snapshot carry, by type:
 * buttons pressed/latched, selector position, dial and display value, sensors active (and
 * their LED), lamps as `lamp<i>`, actuators command, travel and their feedback contacts.
 */
export function deviceSignalProperties(d: PanelDevice | FieldDevice): string[] {
  switch (d.type) {
    case 'push-button':
    case 'e-stop':
      return ['pressed', 'latched'];
    case 'illuminated-button':
      return ['pressed', 'latched', 'lamp0'];
    case 'selector-switch':
      return ['position'];
    case 'pilot-light':
      return ['lamp0'];
    case 'stack-light':
      return d.tiers.map((_, i) => `lamp${i}`);
    case 'potentiometer':
    case 'numeric-display':
      return ['value'];
    case 'proximity-sensor':
    case 'photo-eye':
    case 'part-sensor':
      return ['active', 'led'];
    case 'guard-switch':
      return ['active'];
    case 'gripper':
      return ['command', 'travel', 'closed', 'open'];
    case 'vacuum-cup':
      return ['command', 'travel', 'switch'];
    case 'conveyor':
      return ['command', 'travel', 'running'];
  }
}
