import { describe, expect, it } from 'vitest';
import { createCell } from './cell';
import { pickAndPlaceCell } from '@/simulator/demo/pick-and-place';

describe('terminal-strip readings in snapshots', () => {
  it('a healthy 24 V input reads on and a 0 V input reads off (not undefined)', () => {
    const r = createCell(pickAndPlaceCell);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const cell = r.value;
    cell.advance(500);
    cell.apply({ type: 'press', device: 'start' });
    cell.advance(50);
    const wires = new Map(cell.snapshot().wires.map((w) => [w.id, w]));
    // IEC 61131-2, type 1 24 V DC input: 15–30 V is ON, −3..+5 V is OFF (from memory).
    expect(wires.get('w-start')).toMatchObject({ level: 24, reading: 'on' });
    // The NC stop contact is closed at rest, so its input sees 24 V (common practice: NC stop circuits).
    expect(wires.get('w-stop')).toMatchObject({ level: 24, reading: 'on' });
    cell.apply({ type: 'release', device: 'start' });
    cell.advance(50);
    const after = new Map(cell.snapshot().wires.map((w) => [w.id, w]));
    expect(after.get('w-start')).toMatchObject({ level: 0, reading: 'off' });
    cell.dispose();
  });
});
