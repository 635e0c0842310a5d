import { describe, expect, it } from 'vitest';
import { emptyFacts, faultPlaces, foldEvents } from './fold';

describe('foldEvents', () => {
  it('tracks forces, e-stops and cleared faults across batches and lists notable events', () => {
    const estops = new Set(['es1']);
    const a = foldEvents(emptyFacts(), [
      { t: 10, event: { type: 'press', device: 'start' } },
      { t: 20, event: { type: 'press', device: 'es1' } },
      { t: 30, event: { type: 'force', target: '%IX0.1', value: 1 } },
    ], estops);
    expect(a.facts.estopPressed).toEqual(['es1']);
    expect(a.facts.forces).toEqual({ '%IX0.1': 1 });
    expect(a.notable.map((n) => n.text)).toEqual(['e-stop es1 pressed', 'force %IX0.1 = 1']);
    const b = foldEvents(a.facts, [
      { t: 40, event: { type: 'release', device: 'es1' } },
      { t: 50, event: { type: 'unforce', target: '%IX0.1' } },
      { t: 60, event: { type: 'clear-fault', id: 'f1' } },
    ], estops);
    expect(b.facts).toEqual({ forces: {}, estopPressed: [], cleared: ['f1'], lastEvent: 'fault f1 cleared' });
    expect(a.facts.forces).toEqual({ '%IX0.1': 1 });
  });

  it('names a fault card by its rows or device', () => {
    expect(faultPlaces({ id: 'x', kind: 'open-wire', row: 'W-Stop' })).toEqual(['w-stop']);
    expect(faultPlaces({ id: 'y', kind: 'swapped-wires', rows: ['a', 'b'] })).toEqual(['a', 'b']);
  });
});
