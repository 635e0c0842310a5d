import { describe, expect, it } from 'vitest';
import { relatedToSelection } from './selection';
import { demoDocument } from './test-helpers';

describe('relatedToSelection', () => {
  const wiring = demoDocument().wiring;
  it('a device selects its rows and the addresses and channels they land on', () => {
    // Demo wiring (simulator/demo/pick-and-place.ts): the e-stop has two channels, w-estop1 to %IX0.2 and w-estop2 to R1.S2.C4.
    const r = relatedToSelection({ kind: 'device', id: 'estop' }, wiring);
    expect([...r.wires].sort()).toEqual(['w-estop1', 'w-estop2']);
    expect([...r.addresses]).toEqual(['%IX0.2']);
    expect([...r.channels]).toEqual(['R1.S2.C4']);
  });
  it('an address selects the rows on it and their devices', () => {
    const r = relatedToSelection({ kind: 'address', id: '%IX0.0' }, wiring);
    expect([...r.wires]).toEqual(['w-start']);
    expect(r.devices.has('start')).toBe(true);
  });
  it('nothing is related to no selection', () => {
    const r = relatedToSelection(null, wiring);
    expect(r.wires.size + r.devices.size + r.addresses.size).toBe(0);
  });
});
