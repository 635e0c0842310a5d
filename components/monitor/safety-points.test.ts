import { describe, expect, it } from 'vitest';
import { demoDocument } from '@/components/workspace/test-helpers';
import { safetyCarriers } from './safety-points';

describe('safetyCarriers', () => {
  it('finds the demo cell e-stop chain and guard on both sides of the PLC', () => {
    // The demo pick-and-place cell (simulator/demo/pick-and-place.ts): the e-stop wired to %IX0.2 and
    // to R0.S1.C4 (DI5, the handshake's estopHealthy); the guard wired to %IX0.4, which the PLC passes
    // on through %QX0.3 to R0.S1.C3 (DI4, guardClosed).
    const carriers = safetyCarriers(demoDocument());
    expect(carriers.get('%IX0.2')).toBe('e-stop chain');
    expect(carriers.get('DI5')).toBe('e-stop chain');
    expect(carriers.get('%IX0.4')).toBe('guard');
    expect(carriers.get('DI4')).toBe('guard');
    expect(carriers.get('%QX0.3')).toBe('guard');
    // The start button and the recipe word carry neither.
    expect(carriers.has('%IX0.0')).toBe(false);
    expect(carriers.has('DI1')).toBe(false);
    expect(carriers.has('WI1')).toBe(false);
  });

  it('follows a guard rewired to another address', () => {
    const doc = demoDocument();
    const row = doc.wiring.find((w) => w.id === 'w-guard')!;
    row.to = { plc: '%ix0.6' };
    const carriers = safetyCarriers(doc);
    expect(carriers.get('%IX0.6')).toBe('guard');
    expect(carriers.has('%IX0.4')).toBe(false);
  });
});
