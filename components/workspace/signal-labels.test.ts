import { describe, expect, it } from 'vitest';
import type { CellDocument } from '@/simulator';
import { signalLabels } from './signal-labels';
import { demoDocument } from './test-helpers';

// Expected texts are read off the demo cell's own data (simulator/demo/pick-and-place.ts:
// panel/field labels, the terminal strip rows w-* / l-* / t-*, point-map rows pm-*), so each
// check traces to one line of that file.
describe('signalLabels on the pick-and-place demo', () => {
  const labels = signalLabels(demoDocument());

  it('names an input address by the panel device wired to it', () => {
    // w-start: start:contact → %IX0.0; panel device "start" is labelled "Cycle start".
    expect(labels['%IX0.0']).toBe('Cycle start (start:contact)');
    // w-guard: guard:contact → %IX0.4; field device "guard" is "Front guard".
    expect(labels['%IX0.4']).toBe('Front guard (guard:contact)');
    // w-part: part:out → %IX0.5; "Part at pick station".
    expect(labels['%IX0.5']).toBe('Part at pick station (part:out)');
  });

  it('names a stack-light tier by its colour and a selector position by its legend', () => {
    // w-green: %QX1.2 → stack:tier2; tiers are ['red', 'yellow', 'green'].
    expect(labels['%QX1.2']).toBe('Cell status green tier (stack:tier2)');
    expect(labels['%QX1.0']).toBe('Cell status red tier (stack:tier0)');
    // w-recipe2: recipe:pos1 → %IX0.6; positions are ['Recipe 1', 'Recipe 2'].
    expect(labels['%IX0.6']).toBe('Recipe: Recipe 2 (recipe:pos1)');
    // w-readylamp: %QX1.3 → readyLamp:lamp; a pilot light has one terminal, so no terminal word.
    expect(labels['%QX1.3']).toBe('Robot ready (readyLamp:lamp)');
  });

  it('names a link address by the controller point on its channel', () => {
    // l-start: %QX0.0 → R1.S2.C0; pm-di puts DI1 "Start" on rack 1 slot 2 channel 0.
    expect(labels['%QX0.0']).toBe('DI1 Start (R1.S2.C0)');
    // l-ready: R1.S3.C0 → %IX1.0; pm-do puts DO1 "Ready" on rack 1 slot 3 channel 0.
    expect(labels['%IX1.0']).toBe('DO1 Ready (R1.S3.C0)');
    // l-recipe: %QW2 → R1.S2.C8 over 4 bits; pm-wi puts WI1 "Recipe number" on channels 8..11.
    expect(labels['%QW2']).toBe('WI1 Recipe number (R1.S2.C8)');
  });

  it('names every controller point by its point-map label', () => {
    expect(labels.DO1).toBe('Ready');
    expect(labels.DI5).toBe('E-stop chain healthy');
    expect(labels.WI1).toBe('Recipe number');
    expect(labels.TO1).toBe('Gripper close');
    expect(labels.TI2).toBe('Gripper open');
    // pm-di maps 6 DI points, pm-do 7 DO, pm-wi 1 WI, pm-to 1 TO, pm-ti 2 TI: 17 points.
    expect(Object.keys(labels).filter((k) => /^[A-Z]{2}\d+$/.test(k))).toHaveLength(17);
  });

  it('gives unwired addresses no entry', () => {
    // The demo wires nothing to %QX0.4 (l-guard is %QX0.3, l-part %QX0.5).
    expect(labels['%QX0.4']).toBeUndefined();
  });
});

describe('signalLabels fallbacks', () => {
  /** The demo cell with one change applied, so each case isolates the rule it checks. */
  const edited = (change: (d: CellDocument) => void) => {
    const d = demoDocument();
    change(d);
    return signalLabels(d);
  };

  it('names an unlabelled point by what is wired to its channel, and marks an inverted one', () => {
    const labels = edited((d) => {
      const ti = d.controller.pointMap.find((r) => r.id === 'pm-ti')!;
      ti.points = [{ invert: true }, { label: 'Gripper open' }];
    });
    // t-closed: gripper:closed → R1.S5.C0, which pm-ti maps to TI1; the gripper has three terminals.
    expect(labels.TI1).toBe('Parallel gripper closed (gripper:closed) (inverted)');
  });

  it('joins several wires on one address and keys lower-case addresses canonically', () => {
    const labels = edited((d) => {
      d.wiring.push({ id: 'w-extra', from: { plc: '%qx1.2' }, to: { device: 'readyLamp', terminal: 'lamp' } });
    });
    expect(labels['%QX1.2']).toBe('Cell status green tier (stack:tier2), Robot ready (readyLamp:lamp)');
  });

  it('uses the wire label when a link channel has no mapped point', () => {
    const labels = edited((d) => {
      d.wiring.push({ id: 'l-spare', from: { plc: '%QX0.6' }, to: { controller: { rack: 1, slot: 2, channel: 7 } }, label: 'Spare request' });
      d.wiring.push({ id: 'l-spare2', from: { plc: '%QX0.7' }, to: { controller: { rack: 1, slot: 2, channel: 12 } } });
    });
    // Channel 7 of rack 1 slot 2 lies between pm-di (0..5) and pm-wi (8..11): no point there.
    expect(labels['%QX0.6']).toBe('Spare request (R1.S2.C7)');
    expect(labels['%QX0.7']).toBe('R1.S2.C12');
  });

  it('falls back to the terminal text for a device it does not know', () => {
    const labels = edited((d) => {
      d.wiring[0] = { ...d.wiring[0], from: { device: 'ghost', terminal: 'contact' } };
    });
    expect(labels['%IX0.0']).toBe('ghost:contact');
  });
});
